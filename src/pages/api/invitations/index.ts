import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { inviteMember } from '../../../lib/server/teams';
import { inviteSchema } from '../../../lib/schemas/platform';

export const POST: APIRoute = route(async ({ request, locals }) => {
  const ctx = guard(locals, 'member:invite');
  const { email, role } = validate(inviteSchema, await readJson(request));
  return json(await inviteMember(ctx, email, role), 201);
});
