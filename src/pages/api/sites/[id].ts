import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { moveToTrash } from '../../../lib/server/vault/trash';
import { versionParam } from '../../../lib/server/vault/params';
import { getSite, updateSite } from '../../../lib/server/vault/sites';
import { siteUpdateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'site:read');
  return json(await getSite(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'site:update');
  return json(await updateSite(ctx, params.id!, validate(siteUpdateSchema, await readJson(request))));
});

export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'site:delete');
  return json(await moveToTrash(ctx, 'site', params.id!, versionParam(url)));
});
