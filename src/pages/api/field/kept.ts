import type { APIRoute } from 'astro';
import { json, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { keptCards } from '../../../lib/server/field/kept';
import { keptQuerySchema } from '../../../lib/schemas/field';

/** What a phone fetches to keep these machines' and sites' field cards offline (docs/field-work.md, offline cards). */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'device:read');
  const query = validate(keptQuerySchema, { machine: url.searchParams.getAll('machine'), site: url.searchParams.getAll('site'), ...rest(url) });
  return json(await keptCards(ctx, query));
});

/** Any other parameter, so the strict schema names it rather than ignoring it. */
function rest(url: URL): Record<string, string> {
  return Object.fromEntries([...url.searchParams].filter(([k]) => k !== 'machine' && k !== 'site'));
}
