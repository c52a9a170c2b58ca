/** Request body of `POST /api/tools/st`. */
import { z } from 'zod';
import { fieldValuesSchema } from '../schema-common';
import { templateSchema } from '../template';

/** At most as many steps as a saved sequence has (src/lib/schemas/commands.ts). */
const MAX_STEPS = 32;

export const plcCodeRequestSchema = z.strictObject({
  /** One command's template; or `steps` for a sequence sent as one string (exactly one of the two). */
  template: templateSchema.optional(),
  /** A sequence: each step's template and its fixed values, joined in order into one string (or byte array). */
  steps: z.array(z.strictObject({ template: templateSchema, values: fieldValuesSchema.optional() })).min(1, 'Give at least one step.').max(MAX_STEPS, `At most ${MAX_STEPS} steps.`).optional(),
  /** Names the POU; default the template's name, else `Command`. */
  name: z.string().max(120).optional(),
  /** Put in front of the POU name, e.g. `DRV_`. */
  prefix: z.string().max(32).optional(),
  /** Fixed values (a preset): these fields become constants, the others inputs. */
  values: fieldValuesSchema.optional(),
  /** `string` (default): a FUNCTION returning STRING(n); `bytes`: a FUNCTION_BLOCK filling an ARRAY OF BYTE. */
  form: z.enum(['string', 'bytes']).optional(),
}).superRefine((r, ctx) => {
  if (!r.template === !r.steps) ctx.addIssue({ code: 'custom', path: ['template'], message: 'Give either a template (one command) or steps (a sequence), one of them.' });
  if (r.steps && r.values) ctx.addIssue({ code: 'custom', path: ['values'], message: 'A sequence\'s fixed values go in each step\'s values.' });
});
export type PlcCodeRequest = z.infer<typeof plcCodeRequestSchema>;
