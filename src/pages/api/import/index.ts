import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { importDocument } from '../../../lib/server/field/import';
import { importRequestSchema } from '../../../lib/schemas/field';

const IMPORT_BODY_LIMIT = 20 * 1024 * 1024;

/** { document, apply }: apply=false answers what would be created; apply=true writes it in one transaction. */
export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'transfer:import');
  const { document, apply } = validate(importRequestSchema, await readJson(request, IMPORT_BODY_LIMIT));
  return json(await importDocument(ctx, document, apply), apply ? 201 : 200);
});
