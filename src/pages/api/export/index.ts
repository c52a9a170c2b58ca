import type { APIRoute } from 'astro';
import { route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { exportStream } from '../../../lib/server/field/export';
import { exportQuerySchema } from '../../../lib/schemas/field';

/** The team (or one site with ?siteId=) as a versioned JSON document, offered as a download. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'transfer:export');
  const { siteId } = validate(exportQuerySchema, Object.fromEntries(url.searchParams));
  const doc = await exportStream(ctx, { siteId });
  const name = `baudbook-${siteId ? 'site' : 'team'}-${doc.exportedAt.slice(0, 10)}.json`;
  // Sent as it is written (a chunk per pull), so a large team's document is never held whole in memory.
  const chunks = doc.chunks();
  const encoder = new TextEncoder();
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      const next = await chunks.next();
      if (next.done) controller.close();
      else controller.enqueue(encoder.encode(next.value));
    },
    async cancel() {
      await chunks.return(undefined);
    },
  });
  return new Response(body, {
    headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${name}"`, 'cache-control': 'no-store' },
  });
});
