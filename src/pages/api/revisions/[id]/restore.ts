import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { restoreRevision } from '../../../../lib/server/vault/revisions';
import { restoreRevisionSchema } from '../../../../lib/schemas/vault';

/** Puts the record back as it was at this revision (a new revision); `version` is the record's current version. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'revision:restore');
  const { version } = validate(restoreRevisionSchema, await readJson(request));
  return json(await restoreRevision(ctx, params.id!, version));
});
