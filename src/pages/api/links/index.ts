import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { createLink, listLinks, LINK_SORTS } from '../../../lib/server/vault/links';
import { linkCreateSchema } from '../../../lib/schemas/vault';
import { idFilter } from '../../../lib/server/vault/params';
import { z } from 'zod';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'link:read');
  return json(await listLinks(ctx, parseList(url, LINK_SORTS, 'name', { machineId: idFilter, q: z.string().max(100).optional() })));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'link:create');
  return json(await createLink(ctx, validate(linkCreateSchema, await readJson(request))), 201);
});
