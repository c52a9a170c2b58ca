import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { createProfile, listProfiles, PROFILE_SORTS } from '../../../lib/server/vault/profiles';
import { profileCreateSchema, DEVICE_ROLES } from '../../../lib/schemas/vault';
import { z } from 'zod';

export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'profile:read');
  return json(await listProfiles(ctx, parseList(url, PROFILE_SORTS, 'name', { q: z.string().max(100).optional(), role: z.enum(DEVICE_ROLES).optional() })));
});

export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'profile:create');
  return json(await createProfile(ctx, validate(profileCreateSchema, await readJson(request))), 201);
});
