import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { createPort, listPorts } from '../../../lib/server/vault/ports';
import { portCreateSchema } from '../../../lib/schemas/vault';

const query = z.strictObject({ deviceId: z.string({ error: 'Say which device: ?deviceId=' }).min(1).max(64) });

/** Ports of one device (a device has at most 16, so this list is not paged). */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'port:read');
  const { deviceId } = validate(query, Object.fromEntries(url.searchParams));
  return json({ items: await listPorts(ctx, deviceId) });
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'port:create');
  return json(await createPort(ctx, validate(portCreateSchema, await readJson(request))), 201);
});
