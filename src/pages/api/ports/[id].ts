import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { moveToTrash } from '../../../lib/server/vault/trash';
import { versionParam } from '../../../lib/server/vault/params';
import { getPort, updatePort } from '../../../lib/server/vault/ports';
import { portUpdateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'port:read');
  return json(await getPort(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'port:update');
  return json(await updatePort(ctx, params.id!, validate(portUpdateSchema, await readJson(request))));
});

export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'port:delete');
  return json(await moveToTrash(ctx, 'port', params.id!, versionParam(url)));
});
