import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { moveToTrash } from '../../../lib/server/vault/trash';
import { versionParam } from '../../../lib/server/vault/params';
import { getProfile, updateProfile } from '../../../lib/server/vault/profiles';
import { profileUpdateSchema } from '../../../lib/schemas/vault';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'profile:read');
  return json(await getProfile(ctx, params.id!));
});

export const PATCH: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'profile:update');
  return json(await updateProfile(ctx, params.id!, validate(profileUpdateSchema, await readJson(request))));
});

export const DELETE: APIRoute = route(async ({ locals, params, url }) => {
  const ctx = guard(locals, 'profile:delete');
  return json(await moveToTrash(ctx, 'profile', params.id!, versionParam(url)));
});
