import type { APIRoute } from 'astro';
import { json, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { listProposals } from '../../../lib/server/field/proposals';
import { proposalListSchema } from '../../../lib/schemas/field';

/** The team's proposals from the field log, newest first: pending ones by default; `?deviceId=` for one device, `?status=` to choose. */
export const GET: APIRoute = route(async ({ locals, url }) => {
  const ctx = guard(locals, 'proposal:read');
  return json({ items: await listProposals(ctx, validate(proposalListSchema, Object.fromEntries(url.searchParams))) });
});
