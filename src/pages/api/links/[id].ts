import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { moveToTrash } from '../../../lib/server/vault/trash';
import { versionParam } from '../../../lib/server/vault/params';
import { getLink, updateLink } from '../../../lib/server/vault/links';
import { linkUpdateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'link:read');
  return json(await getLink(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'link:update');
  return json(await updateLink(ctx, params.id!, validate(linkUpdateSchema, await readJson(request))));
});

export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'link:delete');
  return json(await moveToTrash(ctx, 'link', params.id!, versionParam(url)));
});
