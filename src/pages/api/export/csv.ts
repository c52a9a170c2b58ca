import type { APIRoute } from 'astro';
import { route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { exportCsv } from '../../../lib/server/field/csv-export';

/** ?table=sites|machines|devices|ports|links|profiles plus that list's own filters and sort. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'transfer:export');
  const { filename, csv } = await exportCsv(ctx, url);
  return new Response(csv, {
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${filename}"`, 'cache-control': 'no-store' },
  });
});
