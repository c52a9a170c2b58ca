import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { requireUser } from '../../../lib/server/guard';
import { acceptInvitation } from '../../../lib/server/teams';
import { acceptInvitationSchema } from '../../../lib/schemas/platform';
import { setActiveTeam } from '../../../lib/server/middleware/locals';

/** The signed-in user whose e-mail the invitation names joins the team with the invited role. */
export const POST: APIRoute = route(async ({ request, locals, cookies }) => {
  const user = requireUser(locals);
  const { token } = validate(acceptInvitationSchema, await readJson(request));
  const joined = await acceptInvitation(user, token);
  setActiveTeam(cookies, joined.teamId);
  return json(joined);
});
