import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { moveToTrash } from '../../../lib/server/vault/trash';
import { versionParam } from '../../../lib/server/vault/params';
import { getMachine, updateMachine } from '../../../lib/server/vault/machines';
import { machineUpdateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'machine:read');
  return json(await getMachine(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'machine:update');
  return json(await updateMachine(ctx, params.id!, validate(machineUpdateSchema, await readJson(request))));
});

export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'machine:delete');
  return json(await moveToTrash(ctx, 'machine', params.id!, versionParam(url)));
});
