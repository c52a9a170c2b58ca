/** The request body of the poll cycle tool (`POST /api/tools/bus-cycle`), shared with the bus page's panel. */
import { z } from 'zod';
import { BUS_TOPOLOGIES } from './bus-layout';
import { portSettingsSchema } from './port-settings';

/** Most polls in one cycle (64 members, a few polls each). */
export const MAX_BUS_POLLS = 256;
/** Largest frame accepted, bytes. */
export const MAX_POLL_BYTES = 65_536;
/** Longest response time or timeout accepted, ms (as the port's response timeout). */
export const MAX_POLL_MS = 600_000;

const bytes = (what: string, min: number) =>
  z.number({ error: `Give the ${what} as a whole number of bytes` }).int(`Give the ${what} as a whole number of bytes`).min(min, `The ${what} is at least ${min} byte${min === 1 ? '' : 's'}`).max(MAX_POLL_BYTES, `The ${what} is at most ${MAX_POLL_BYTES} bytes`);
export const millis = (what: string) => z.number({ error: `Give the ${what} in milliseconds` }).finite().min(0, `The ${what} cannot be negative`).max(MAX_POLL_MS, `The ${what} is at most ${MAX_POLL_MS} ms`);

/** What one poll sends and gets back (also the stored poll of a bus plan, src/lib/schemas/bus-plan.ts). */
export const busPollFields = {
  label: z.string().max(120, 'A label has at most 120 characters').optional(),
  requestBytes: bytes('request', 1),
  replyBytes: bytes('reply', 0),
  responseMs: millis('response time').optional(),
  perCycle: z.number().int('Polls per cycle is a whole number').min(1, 'A poll is sent at least once per cycle').max(1000, 'At most 1000 times per cycle').optional(),
};

/** A poll without a reply has no response time. */
export function checkNoReplyResponse(p: { replyBytes: number; responseMs?: number }, ctx: z.RefinementCtx): void {
  if (p.replyBytes === 0 && p.responseMs !== undefined && p.responseMs > 0) {
    ctx.addIssue({ code: 'custom', path: ['responseMs'], message: 'A poll without a reply (replyBytes 0) has no response time; give the reply bytes or leave responseMs out' });
  }
}

export const busPollSchema = z
  .strictObject({
    ...busPollFields,
    /** Polls naming the same device go silent together in the worst case. */
    device: z.string().max(120, 'A device name has at most 120 characters').optional(),
  })
  .superRefine(checkNoReplyResponse);

export const busLayoutMemberSchema = z.strictObject({
  label: z.string().min(1, 'Name the device').max(120, 'A label has at most 120 characters'),
  dropM: z.number().finite().min(0, 'A drop cannot be negative').max(10_000, 'A drop is at most 10,000 m').optional(),
  tapPorts: z.number().int().min(1, 'A tap has at least 1 port').max(64, 'A tap has at most 64 ports').optional(),
  termination: z.boolean().optional(),
  bias: z.boolean().optional(),
});

export const busCycleSchema = z.strictObject({
  /** Partial port settings of the master; defaults fill the rest. */
  settings: portSettingsSchema.optional(),
  polls: z.array(busPollSchema).min(1, 'List at least one poll').max(MAX_BUS_POLLS, `A cycle has at most ${MAX_BUS_POLLS} polls`),
  /** Override the settings' retries and response timeout. */
  retries: z.number().int('Retries is a whole number').min(0, 'Retries cannot be negative').max(100, 'At most 100 retries').optional(),
  responseTimeoutMs: millis('response timeout').optional(),
  targetCycleMs: millis('target cycle').optional(),
  /** Where the cable runs (drops, taps, terminators, bias); optional. */
  layout: z
    .strictObject({
      trunkM: z.number().finite().min(0, 'The trunk cannot be negative').max(100_000, 'The trunk is at most 100,000 m').optional(),
      topology: z.enum(BUS_TOPOLOGIES, { error: `Choose ${BUS_TOPOLOGIES.join(', ')}` }).optional(),
      members: z.array(busLayoutMemberSchema).max(64, 'At most 64 members on one bus').default([]),
    })
    .optional(),
});

export type BusCycleRequest = z.infer<typeof busCycleSchema>;
