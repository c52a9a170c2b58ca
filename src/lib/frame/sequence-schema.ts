/** The request body of a command sequence (`POST /api/tools/sequence`), shared with forms that build one. */
import { z } from 'zod';
import { portSettingsSchema } from './port-settings';
import { fieldValuesSchema } from './schema-common';
import { MAX_SEQUENCE_STEPS, SEQUENCE_MODES } from './sequence';
import { templateSchema } from './template';

/** Longest delay between separate sends, ms (as the port's turnaround delay). */
export const MAX_SEQUENCE_DELAY_MS = 60_000;
/** Largest PLC STRING capacity accepted, in characters (IEC 61131-3 leaves the maximum to the implementation). */
export const MAX_PLC_STRING_CAPACITY = 65_535;

export const sequenceStepSchema = z.strictObject({ template: templateSchema, values: fieldValuesSchema.default({}) });

export const sequenceSchema = z
  .strictObject({
    steps: z.array(sequenceStepSchema).min(1, 'Give at least one step').max(MAX_SEQUENCE_STEPS, `A sequence has at most ${MAX_SEQUENCE_STEPS} steps`),
    /** Partial port settings; defaults fill the rest. */
    settings: portSettingsSchema.optional(),
    mode: z.enum(SEQUENCE_MODES).default('one-string'),
    delayMs: z.number().finite().min(0).max(MAX_SEQUENCE_DELAY_MS).optional(),
    plcStringCapacity: z.number().int().min(1).max(MAX_PLC_STRING_CAPACITY).optional(),
  })
  .superRefine((body, ctx) => {
    if (body.delayMs !== undefined && body.mode !== 'separate') {
      ctx.addIssue({ code: 'custom', path: ['delayMs'], message: 'A delay applies only between separate sends; set "mode": "separate" or leave the delay out' });
    }
  });

export type SequenceRequest = z.infer<typeof sequenceSchema>;
