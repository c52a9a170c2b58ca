import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json, route, validate } from '../../lib/server/http';
import { guard } from '../../lib/server/guard';
import { searchDevices, searchRecords } from '../../lib/server/vault/search';

const query = z.strictObject({
  q: z.string({ error: 'Type something to search for: ?q=' }).trim().min(1, 'Type something to search for.').max(100),
  limit: z.coerce.number().int().min(1).max(50, 'At most 50 of each kind.').default(10),
});

/**
 * The team's vault search: devices (tag, name, role, maker, model, serial numbers, site, machine), commands (name,
 * purpose, notes, command text) and ports by their notes; best matches of each kind first.
 */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'device:read');
  const { q, limit } = validate(query, Object.fromEntries(url.searchParams));
  const devices = await searchDevices(ctx, q, 1, limit);
  const records = await searchRecords(ctx, q, limit);
  return json({ q, devices: { items: devices.items, total: devices.total, totalCapped: devices.totalCapped }, records });
});
