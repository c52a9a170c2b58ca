import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { declineProposal } from '../../../../lib/server/field/proposals';
import { proposalDeclineSchema } from '../../../../lib/schemas/field';

/** Leaves the record as it is; the note is shown to the technician on the log entry. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'proposal:decide');
  const { note } = validate(proposalDeclineSchema, await readJson(request));
  return json(await declineProposal(ctx, params.id!, note));
});
