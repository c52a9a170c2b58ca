import type { APIRoute } from 'astro';
import { z } from 'zod';
import { fieldValuesSchema, portSettingsSchema, previewFrame, templateSchema, toHex } from '../../../lib/frame';
import { json, readJson, route, validate } from '../../../lib/server/http';

const frameSchema = z.object({
  template: templateSchema,
  values: fieldValuesSchema.default({}),
  settings: portSettingsSchema.optional(),
});

/** Public: assemble a command from a template and values, with every notation, the segment map and findings. */
export const POST: APIRoute = route(async ({ request }) => {
  const { template, values, settings } = validate(frameSchema, await readJson(request, 64 * 1024));
  const p = previewFrame(template, values, settings);
  return json({
    ok: p.ok,
    bytes: toHex(p.bytes),
    byteCount: p.byteCount,
    notations: p.notations,
    segments: p.segments,
    findings: p.findings,
  });
});
