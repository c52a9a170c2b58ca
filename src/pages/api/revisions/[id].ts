import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { getRevision } from '../../../lib/server/vault/revisions';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'revision:read');
  return json(await getRevision(ctx, params.id!));
});
