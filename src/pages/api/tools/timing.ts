import type { APIRoute } from 'astro';
import { z } from 'zod';
import { lineSettingsSchema, timingReport } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';

const ms = z.number().min(0).max(600_000);
const timingSchema = lineSettingsSchema
  .extend({
    byteCount: z.number().int().min(0).max(1_000_000),
    replyByteCount: z.number().int().min(0).max(1_000_000).optional(),
    /** The device's delay from the end of the request to the start of its reply. */
    responseMs: ms.optional(),
    /** Older name of `responseMs`, still accepted. */
    turnaroundMs: ms.optional(),
  })
  .superRefine((b, ctx) => {
    if (b.responseMs !== undefined && b.turnaroundMs !== undefined && b.responseMs !== b.turnaroundMs) {
      ctx.addIssue({ code: 'custom', path: ['turnaroundMs'], message: 'turnaroundMs is the older name of responseMs; give one of them, or the same value in both' });
    }
    const response = b.responseMs ?? b.turnaroundMs ?? 0;
    if (response > 0 && !b.replyByteCount) {
      ctx.addIssue({ code: 'custom', path: [b.responseMs !== undefined ? 'responseMs' : 'turnaroundMs'], message: 'A response time needs a reply; give replyByteCount or leave the response time out' });
    }
  });

/** Public: character time, frame time, silent intervals and one Modbus RTU transaction for a port setting and byte count. */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(timingSchema, await readJson(request, 64 * 1024));
  return json(timingReport(body, body.byteCount, body.replyByteCount ?? 0, body.responseMs ?? body.turnaroundMs ?? 0));
});
