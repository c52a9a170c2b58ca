import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { linkListParams } from '../../../lib/server/vault/list-params';
import { createLink, listLinks } from '../../../lib/server/vault/links';
import { linkCreateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'link:read');
  return json(await listLinks(ctx, linkListParams(url)));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'link:create');
  return json(await createLink(ctx, validate(linkCreateSchema, await readJson(request))), 201);
});
