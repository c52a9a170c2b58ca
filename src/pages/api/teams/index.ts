import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { requireUser } from '../../../lib/server/guard';
import { createTeam } from '../../../lib/server/teams';
import { createTeamSchema } from '../../../lib/schemas/platform';
import { setActiveTeam } from '../../../lib/server/middleware/locals';

/** Any signed-in user may start a team and becomes its owner; it becomes the active team. */
export const POST: APIRoute = route(async ({ request, locals, cookies }) => {
  const user = requireUser(locals);
  const { name } = validate(createTeamSchema, await readJson(request));
  const created = await createTeam(user.id, name);
  setActiveTeam(cookies, created.id);
  return json(created, 201);
});
