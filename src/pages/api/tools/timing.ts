import type { APIRoute } from 'astro';
import { z } from 'zod';
import { lineSettingsSchema, timingReport } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';

const timingSchema = lineSettingsSchema.extend({
  byteCount: z.number().int().min(0).max(1_000_000),
  replyByteCount: z.number().int().min(0).max(1_000_000).optional(),
  turnaroundMs: z.number().min(0).max(600_000).optional(),
});

/** Public: character time, frame time and silent intervals for a port setting and byte count. */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(timingSchema, await readJson(request, 64 * 1024));
  return json(timingReport(body, body.byteCount, body.replyByteCount ?? 0, body.turnaroundMs ?? 0));
});
