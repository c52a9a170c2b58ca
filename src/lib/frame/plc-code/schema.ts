/** Request body of `POST /api/tools/st`. */
import { z } from 'zod';
import { fieldValuesSchema } from '../schema-common';
import { templateSchema } from '../template';

export const plcCodeRequestSchema = z.strictObject({
  template: templateSchema,
  /** Names the POU; default the template's name, else `Command`. */
  name: z.string().max(120).optional(),
  /** Put in front of the POU name, e.g. `DRV_`. */
  prefix: z.string().max(32).optional(),
  /** Fixed values (a preset): these fields become constants, the others inputs. */
  values: fieldValuesSchema.optional(),
  /** `string` (default): a FUNCTION returning STRING(n); `bytes`: a FUNCTION_BLOCK filling an ARRAY OF BYTE. */
  form: z.enum(['string', 'bytes']).optional(),
});
export type PlcCodeRequest = z.infer<typeof plcCodeRequestSchema>;
