import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { profileListParams } from '../../../lib/server/vault/list-params';
import { createProfile, listProfiles } from '../../../lib/server/vault/profiles';
import { profileCreateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'profile:read');
  return json(await listProfiles(ctx, profileListParams(url)));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'profile:create');
  return json(await createProfile(ctx, validate(profileCreateSchema, await readJson(request))), 201);
});
