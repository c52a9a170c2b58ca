import type { APIRoute } from 'astro';
import { json, route } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { getProposal } from '../../../lib/server/field/proposals';

export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'proposal:read');
  return json(await getProposal(ctx, params.id!));
});
