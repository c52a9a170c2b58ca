import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { createSite, listSites, SITE_SORTS } from '../../../lib/server/vault/sites';
import { siteCreateSchema } from '../../../lib/schemas/vault';
import { z } from 'zod';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'site:read');
  return json(await listSites(ctx, parseList(url, SITE_SORTS, 'name', { q: z.string().max(100).optional() })));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'site:create');
  return json(await createSite(ctx, validate(siteCreateSchema, await readJson(request))), 201);
});
