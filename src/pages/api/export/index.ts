import type { APIRoute } from 'astro';
import { route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { exportDocument } from '../../../lib/server/field/export';
import { exportQuerySchema } from '../../../lib/schemas/field';

/** The team (or one site with ?siteId=) as a versioned JSON document, offered as a download. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'transfer:export');
  const { siteId } = validate(exportQuerySchema, Object.fromEntries(url.searchParams));
  const doc = await exportDocument(ctx, { siteId });
  const name = `baudbook-${siteId ? 'site' : 'team'}-${doc.exportedAt.slice(0, 10)}.json`;
  return new Response(JSON.stringify(doc, null, 2), {
    headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${name}"`, 'cache-control': 'no-store' },
  });
});
