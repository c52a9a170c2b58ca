import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { restoreCommandRevision } from '../../../../lib/server/commands/revisions';
import { commandRestoreSchema } from '../../../../lib/schemas/commands';

/** `{ revisionId, version }`: back to that revision (a new revision); also brings a trashed command back. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'command:update');
  const { revisionId, version } = validate(commandRestoreSchema, await readJson(request));
  return json(await restoreCommandRevision(ctx, params.id!, revisionId, version));
});
