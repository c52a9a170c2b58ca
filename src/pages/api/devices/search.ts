import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { searchDevices } from '../../../lib/server/vault/search';

const query = z.strictObject({
  q: z.string({ error: 'Type something to search for: ?q=' }).trim().min(1, 'Type something to search for.').max(100),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200, 'At most 200 rows per page.').default(20),
});

/** Devices of the team by tag, name, maker, model, serial number, site or machine; best matches first. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'device:read');
  const { q, page, pageSize } = validate(query, Object.fromEntries(url.searchParams));
  return json(await searchDevices(ctx, q, page, pageSize));
});
