import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { deleteTeam, renameTeam } from '../../../lib/server/teams';
import { deleteTeamSchema, renameTeamSchema } from '../../../lib/schemas/platform';

export const GET: APIRoute = route(({ locals }) => {
  const ctx = guard(locals, 'team:read');
  return json({ ...ctx.team, role: ctx.role });
});

export const PATCH: APIRoute = route(async ({ request, locals }) => {
  const ctx = guard(locals, 'team:update');
  const { name } = validate(renameTeamSchema, await readJson(request));
  return json(await renameTeam(ctx, name));
});

export const DELETE: APIRoute = route(async ({ request, locals }) => {
  const ctx = guard(locals, 'team:delete');
  const { confirmName } = validate(deleteTeamSchema, await readJson(request));
  await deleteTeam(ctx, confirmName);
  return json({ deleted: ctx.team.id });
});
