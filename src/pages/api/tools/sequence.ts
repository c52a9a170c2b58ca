import type { APIRoute } from 'astro';
import { assembleSequence, decodeSequenceReply, sequenceSchema, toHex } from '../../../lib/frame';
import { hexBytes } from '../../../lib/frame/schema-common';
import { json, readJson, route, validate } from '../../../lib/server/http';

/**
 * Public: assemble a sequence of commands (each a template with values) as one string or as separate
 * sends, with every notation of the whole string, each step's span and findings, the PLC string length
 * against a capacity, and the time on the line; with `received`, the replies split per step.
 */
export const POST: APIRoute = route(async ({ request }) => {
  const { steps, settings, mode, delayMs, plcStringCapacity, received } = validate(sequenceSchema, await readJson(request, 64 * 1024));
  const s = assembleSequence(steps, { settings, mode, delayMs, plcStringCapacity });
  return json({
    ok: s.ok,
    mode: s.mode,
    bytes: toHex(s.bytes),
    byteCount: s.byteCount,
    notations: s.notations,
    plcString: s.plcString,
    steps: s.steps,
    findings: s.findings,
    timing: s.timing,
    ...(received === undefined ? {} : { replies: decodeSequenceReply(steps.map((x) => x.reply ?? null), hexBytes(received)) }),
  });
});
