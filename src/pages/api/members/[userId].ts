import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { changeRole, removeMember } from '../../../lib/server/teams';
import { changeRoleSchema } from '../../../lib/schemas/platform';

export const PATCH: APIRoute = route(async ({ request, locals, params }) => {
  const ctx = guard(locals, 'member:update');
  const { role } = validate(changeRoleSchema, await readJson(request));
  return json(await changeRole(ctx, params.userId!, role));
});

export const DELETE: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'member:remove');
  await removeMember(ctx, params.userId!);
  return json({ removed: params.userId });
});
