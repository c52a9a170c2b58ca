import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { listTrash } from '../../../lib/server/vault/trash';
import { ENTITY_TYPES } from '../../../lib/schemas/vault';

/** What the team deleted, newest first (each entry with what was moved along with it). */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'trash:read');
  return json(await listTrash(ctx, parseList(url, ['deletedAt'], 'deletedAt', { type: z.enum(ENTITY_TYPES).optional() })));
});
