import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { trashListParams } from '../../../lib/server/vault/list-params';
import { listTrash } from '../../../lib/server/vault/trash';

/** What the team deleted, newest first (each entry with what was moved along with it). */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'trash:read');
  return json(await listTrash(ctx, trashListParams(url)));
});
