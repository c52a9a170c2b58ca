import type { APIRoute } from 'astro';
import { json, readJson, route, validate } from '../../../../lib/server/http';
import { guard } from '../../../../lib/server/guard';
import { createFieldLogEntry, listFieldLog } from '../../../../lib/server/field/field-log';
import { fieldLogCreateSchema } from '../../../../lib/schemas/field';

/** The device's field log, newest first. Entries cannot be changed or removed: there is no PATCH or DELETE. */
export const GET: APIRoute = route(async ({ locals, params }) => {
  const ctx = guard(locals, 'fieldLog:read');
  return json({ items: await listFieldLog(ctx, params.id!) });
});

export const POST: APIRoute = route(async ({ locals, params, request }) => {
  const ctx = guard(locals, 'fieldLog:create');
  const { created, ...entry } = await createFieldLogEntry(ctx, params.id!, validate(fieldLogCreateSchema, await readJson(request)));
  // A resend of an entry already written (same clientKey) answers 200 with that entry, not 201.
  return json(entry, created ? 201 : 200);
});
