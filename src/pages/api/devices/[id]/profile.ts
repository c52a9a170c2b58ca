import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { profileFromDevice } from '../../../../lib/server/vault/profiles';
import { profileFromDeviceSchema } from '../../../../lib/schemas/vault';

/** Save this device (role, maker, model, ports without addresses) as a new team profile. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'profile:create');
  const { name } = validate(profileFromDeviceSchema, await readJson(request));
  return json(await profileFromDevice(ctx, params.id!, name), 201);
});
