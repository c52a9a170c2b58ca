import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { annotateEntry } from '../../../../lib/server/field/field-log';
import { annotationCreateSchema } from '../../../../lib/schemas/field';

/** Adds a remark to a field-log entry; annotations, like entries, are never edited. */
export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'fieldLog:annotate');
  const { note } = validate(annotationCreateSchema, await readJson(request));
  return json(await annotateEntry(ctx, params.entryId!, note), 201);
});
