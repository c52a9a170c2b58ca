/**
 * The bus plan a link keeps (`link.bus_plan`): what its master polls from each member, and the master's timing
 * where the plan differs from its port. The drops are kept on the members (`link_member.drop_m`, `tap_ports`) and
 * the trunk is the link's cable length. Pieces come from the poll cycle tool's schema, so the panel, the tool and
 * the link route check a poll alike.
 */
import { z } from 'zod';
import { MAX_BUS_POLLS, busLayoutMemberSchema, busPollFields, checkNoReplyResponse, millis } from '../frame/bus-cycle-schema';
import { BUS_TOPOLOGIES } from '../frame/bus-layout';

const recordId = (what: string) => z.string({ error: `Give the ${what}'s id` }).min(1, `Give the ${what}'s id`).max(64, `Not a ${what} id`);

export const busPlanPollSchema = z
  .strictObject({
    /** The member port the master asks (must be a member of the link). */
    portId: recordId('member port'),
    /** The library command it sends, on the member's device or its profile; absent when the byte counts were typed. */
    commandId: recordId('command').optional(),
    ...busPollFields,
  })
  .superRefine(checkNoReplyResponse);

export const busPlanSchema = z.strictObject({
  polls: z.array(busPlanPollSchema).min(1, 'List at least one poll').max(MAX_BUS_POLLS, `A cycle has at most ${MAX_BUS_POLLS} polls`),
  /** The master's wait for a reply; absent: its port's `responseTimeoutMs`. */
  responseTimeoutMs: millis('response timeout').optional(),
  /** Absent: the master port's `retries`. */
  retries: z.number().int('Retries is a whole number').min(0, 'Retries cannot be negative').max(100, 'At most 100 retries').optional(),
  targetCycleMs: millis('target cycle').optional(),
  /** As drawn; absent: worked out from the drops. */
  topology: z.enum(BUS_TOPOLOGIES, { error: `Choose ${BUS_TOPOLOGIES.join(', ')}` }).optional(),
});

export type StoredBusPlan = z.infer<typeof busPlanSchema>;
export type StoredBusPoll = z.infer<typeof busPlanPollSchema>;

/** A member's drop length and tap size as a link member keeps them (null: not recorded). */
export const memberDropM = busLayoutMemberSchema.shape.dropM.unwrap().nullable();
export const memberTapPorts = busLayoutMemberSchema.shape.tapPorts.unwrap().nullable();
