import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { createShare, listShares } from '../../../lib/server/field/shares';
import { shareCreateSchema } from '../../../lib/schemas/field';

export const GET: APIRoute = route(async ({ locals }) => {
  const ctx = guard(locals, 'share:read');
  return json({ items: await listShares(ctx) });
});

/** Answers the link's URL once; only a hash of its token is stored. */
export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'share:create');
  return json(await createShare(ctx, validate(shareCreateSchema, await readJson(request))), 201);
});
