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
  return json(await createFieldLogEntry(ctx, params.id!, validate(fieldLogCreateSchema, await readJson(request))), 201);
});
