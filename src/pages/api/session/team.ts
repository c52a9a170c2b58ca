import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { requireUser } from '../../../lib/server/guard';
import { switchTeamSchema } from '../../../lib/schemas/platform';
import { setActiveTeam } from '../../../lib/server/middleware/locals';
import { NotFound } from '../../../lib/server/errors';

/** Team switcher: makes one of the user's teams the active one. */
export const POST: APIRoute = route(async ({ request, locals, cookies }) => {
  requireUser(locals);
  const { teamId } = validate(switchTeamSchema, await readJson(request));
  const target = locals.teams.find((t) => t.id === teamId);
  if (!target) throw new NotFound('You are not a member of that team.');
  setActiveTeam(cookies, target.id);
  return json(target);
});
