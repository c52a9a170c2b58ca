import type { APIRoute } from 'astro';
import { z } from 'zod';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { parseList } from '../../../lib/server/vault/records';
import { listRevisions } from '../../../lib/server/vault/revisions';
import { ENTITY_TYPES } from '../../../lib/schemas/vault';
import { idFilter } from '../../../lib/server/vault/params';

/** The team's history, newest first; `?entityType=&entityId=` for one record. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'revision:read');
  const opts = parseList(url, ['createdAt'], 'createdAt', { entityType: z.enum(ENTITY_TYPES).optional(), entityId: idFilter });
  return json(await listRevisions(ctx, { ...opts, dir: url.searchParams.has('dir') ? opts.dir : 'desc' }));
});
