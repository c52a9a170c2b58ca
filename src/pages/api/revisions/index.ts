import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { revisionListParams } from '../../../lib/server/vault/list-params';
import { listRevisions } from '../../../lib/server/vault/revisions';

/** The team's history, newest first; `?entityType=&entityId=` for one record. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'revision:read');
  const opts = revisionListParams(url);
  return json(await listRevisions(ctx, { ...opts, dir: url.searchParams.has('dir') ? opts.dir : 'desc' }));
});
