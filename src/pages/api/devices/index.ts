import type { APIRoute } from 'astro';
import { json, jsonText, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { deviceListParams } from '../../../lib/server/vault/list-params';
import { createDevice, listDevicesJson } from '../../../lib/server/vault/devices';
import { deviceCreateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'device:read');
  return jsonText(await listDevicesJson(ctx, deviceListParams(url)));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'device:create');
  return json(await createDevice(ctx, validate(deviceCreateSchema, await readJson(request))), 201);
});
