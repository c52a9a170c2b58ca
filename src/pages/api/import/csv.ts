import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../lib/server/http';
import { guard } from '../../../lib/server/guard';
import { applyCsvImport, previewCsvImport } from '../../../lib/server/field/csv-import';
import { csvImportSchema } from '../../../lib/schemas/field';

const CSV_BODY_LIMIT = 11 * 1024 * 1024;

/** { machineId, csv, mapping, apply, skipInvalid }: a preview with per-row errors, or the write. */
export const POST: APIRoute = route(async ({ locals, request }) => {
  const ctx = guard(locals, 'transfer:import');
  const req = validate(csvImportSchema, await readJson(request, CSV_BODY_LIMIT));
  return req.apply ? json(await applyCsvImport(ctx, req), 201) : json(await previewCsvImport(ctx, req));
});
