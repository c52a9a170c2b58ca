/** The request body of a command sequence (`POST /api/tools/sequence`), shared with forms that build one. */
import { z } from 'zod';
import { portSettingsSchema } from './port-settings';
import { fieldValuesSchema } from './schema-common';
import { parseHex } from './notations/numeric';
import { MAX_REPLY_WAIT_MS, MAX_SEQUENCE_DELAY_MS, MAX_SEQUENCE_STEPS, SEQUENCE_MODES } from './sequence-limits';
import { templateSchema } from './template';

export { MAX_REPLY_WAIT_MS, MAX_SEQUENCE_DELAY_MS };
/** Largest PLC STRING capacity accepted, in characters (IEC 61131-3 leaves the maximum to the implementation). */
export const MAX_PLC_STRING_CAPACITY = 65_535;

export const sequenceStepSchema = z.strictObject({
  template: templateSchema,
  values: fieldValuesSchema.default({}),
  /** What the device answers this step; absent or null = no reply expected. */
  reply: templateSchema.nullable().optional(),
  /** `separate` only: wait for the reply, at most this long, before the next send. */
  waitForReplyMs: z.number().finite().min(0).max(MAX_REPLY_WAIT_MS).optional(),
});

export const sequenceSchema = z
  .strictObject({
    steps: z.array(sequenceStepSchema).min(1, 'Give at least one step').max(MAX_SEQUENCE_STEPS, `A sequence has at most ${MAX_SEQUENCE_STEPS} steps`),
    /** Partial port settings; defaults fill the rest. */
    settings: portSettingsSchema.optional(),
    mode: z.enum(SEQUENCE_MODES).default('one-string'),
    delayMs: z.number().finite().min(0).max(MAX_SEQUENCE_DELAY_MS).optional(),
    plcStringCapacity: z.number().int().min(1).max(MAX_PLC_STRING_CAPACITY).optional(),
    /** What the device sent back for the whole sequence, as hex: split per step against the steps' `reply` templates. */
    received: z.string().max(60_000).superRefine((text, ctx) => {
      const r = parseHex(text);
      if (!r.ok) ctx.addIssue({ code: 'custom', message: `${r.error.message} (character ${r.error.position})` });
    }).optional(),
  })
  .superRefine((body, ctx) => {
    if (body.delayMs !== undefined && body.mode !== 'separate') {
      ctx.addIssue({ code: 'custom', path: ['delayMs'], message: 'A delay applies only between separate sends; set "mode": "separate" or leave the delay out' });
    }
    if (body.received !== undefined && !body.steps.some((s) => s.reply)) {
      ctx.addIssue({ code: 'custom', path: ['received'], message: 'No step expects a reply; give the steps that answer a "reply" template' });
    }
    body.steps.forEach((step, i) => {
      if (step.waitForReplyMs === undefined) return;
      if (body.mode !== 'separate') ctx.addIssue({ code: 'custom', path: ['steps', i, 'waitForReplyMs'], message: 'A step waits for its reply only when the steps are sent separately; set "mode": "separate" or leave the wait out' });
      else if (!step.reply) ctx.addIssue({ code: 'custom', path: ['steps', i, 'waitForReplyMs'], message: 'Give the step a reply template to wait for, or leave the wait out' });
    });
  });

export type SequenceRequest = z.infer<typeof sequenceSchema>;
