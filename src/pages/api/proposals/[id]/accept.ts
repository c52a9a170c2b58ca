import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { acceptProposal } from '../../../../lib/server/field/proposals';
import { proposalAcceptSchema } from '../../../../lib/schemas/field';

/** Applies the proposal to the record (new device and port revisions citing the entry); a stale version answers 409. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'proposal:decide');
  return json(await acceptProposal(ctx, params.id!, validate(proposalAcceptSchema, await readJson(request))));
});
