import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { createDevice, listDevices, DEVICE_SORTS } from '../../../lib/server/vault/devices';
import { deviceCreateSchema, DEVICE_ROLES } from '../../../lib/schemas/vault';
import { idFilter } from '../../../lib/server/vault/params';
import { z } from 'zod';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'device:read');
  return json(await listDevices(ctx, parseList(url, DEVICE_SORTS, 'tag', { machineId: idFilter, siteId: idFilter, role: z.enum(DEVICE_ROLES).optional(), q: z.string().max(100).optional() })));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'device:create');
  return json(await createDevice(ctx, validate(deviceCreateSchema, await readJson(request))), 201);
});
