import type { APIRoute } from 'astro';
import { generatePlcCode, plcCodeRequestSchema } from '../../../lib/frame/plc-code';
import { Invalid } from '../../../lib/server/errors';
import { json, readJson, route, validate } from '../../../lib/server/http';

/**
 * Public: Structured Text (IEC 61131-3) that builds the command's bytes at run time from its fields; with
 * `values`, those fields are fixed (a preset). A template the generator cannot follow exactly is a 422.
 */
export const POST: APIRoute = route(async ({ request }) => {
  const { template, name, prefix, values, form } = validate(plcCodeRequestSchema, await readJson(request, 64 * 1024));
  const r = generatePlcCode([{ template, ...(values ? { fixed: values } : {}) }], { name: name ?? template.name ?? 'Command', prefix, form });
  if (!r.ok) throw new Invalid(r.error.message);
  const { name: pou, form: made, capacity, code, inputs, findings } = r.value;
  return json({ ok: true, name: pou, form: made, capacity, code, inputs, findings });
});
