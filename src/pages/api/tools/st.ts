import type { APIRoute } from 'astro';
import { generatePlcCode, plcCodeRequestSchema } from '../../../lib/frame/plc-code';
import { Invalid } from '../../../lib/server/errors';
import { json, readJson, route, validate } from '../../../lib/server/http';

/**
 * Public: Structured Text (IEC 61131-3) that builds the command's bytes at run time from its fields; with
 * `values`, those fields are fixed (a preset); with `steps`, a sequence's steps joined into one string. A
 * template the generator cannot follow exactly is a 422.
 */
export const POST: APIRoute = route(async ({ request }) => {
  const { template, steps, name, prefix, values, form } = validate(plcCodeRequestSchema, await readJson(request, 64 * 1024));
  const parts = steps
    ? steps.map((s) => ({ template: s.template, ...(s.values ? { fixed: s.values } : {}) }))
    : [{ template: template!, ...(values ? { fixed: values } : {}) }];
  const r = generatePlcCode(parts, { name: name ?? template?.name ?? (steps ? 'Sequence' : 'Command'), prefix, form });
  if (!r.ok) throw new Invalid(r.error.message);
  const { name: pou, form: made, capacity, code, inputs, findings } = r.value;
  return json({ ok: true, name: pou, form: made, capacity, code, inputs, findings });
});
