import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { siteListParams } from '../../../lib/server/vault/list-params';
import { createSite, listSites } from '../../../lib/server/vault/sites';
import { siteCreateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'site:read');
  return json(await listSites(ctx, siteListParams(url)));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'site:create');
  return json(await createSite(ctx, validate(siteCreateSchema, await readJson(request))), 201);
});
