import type { APIRoute } from 'astro';
import { z } from 'zod';
import { lineSettingsSchema, lineTiming, lineShorthand } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';

const timingSchema = lineSettingsSchema.extend({
  byteCount: z.number().int().min(0).max(1_000_000),
  replyByteCount: z.number().int().min(0).max(1_000_000).optional(),
  turnaroundMs: z.number().min(0).max(600_000).optional(),
});

/** Rounds to nanoseconds so JSON stays readable. */
const ms = (x: number) => Math.round(x * 1e6) / 1e6;

/** Public: character time, frame time and silent intervals for a port setting and byte count. */
export const POST: APIRoute = route(async ({ request }) => {
  const body = validate(timingSchema, await readJson(request, 64 * 1024));
  const t = lineTiming(body, body.byteCount, body.replyByteCount ?? 0, body.turnaroundMs ?? 0);
  return json({
    port: lineShorthand(body),
    bitsPerChar: t.bitsPerChar,
    charsPerSecond: ms(t.charsPerSecond),
    charTimeMs: ms(t.charTimeMs),
    frameTimeMs: ms(t.frameTimeMs),
    replyTimeMs: ms(t.replyTimeMs),
    interCharTimeoutMs: ms(t.interCharTimeoutMs),
    interFrameGapMs: ms(t.interFrameGapMs),
    transactionMs: ms(t.transactionMs),
  });
});
