/**
 * The poll cycle panel's saved plan, in pure code: the link's stored plan and drops as the panel's inputs (text as
 * typed), the inputs back as what a save sends, and the shape the conflict notice compares (the plan's parts, and
 * each member's drop).
 */
import type { BusTopology } from '../frame/bus-layout';
import type { StoredBusPlan, StoredBusPoll } from '../schemas/bus-plan';
import { type BusPlan, type PollDraft, firstPoll } from './bus-plan';

export interface DropDraft { dropM: string; tapPorts: string }

/** Everything the panel edits, as typed. */
export interface PlanDraft {
  polls: PollDraft[];
  timeout: string;
  retries: string;
  target: string;
  topology: '' | BusTopology;
  /** By member port id. */
  drops: Record<string, DropDraft>;
}

export interface StoredDrop { dropM: number | null; tapPorts: number | null }

/** What the link holds: its plan, and its members with their drops. */
export interface SavedPlan {
  busPlan: StoredBusPlan | null;
  members: ({ portId: string } & StoredDrop)[];
}

/** Text as typed → the number the schema checks ('' → undefined, so the schema names what is missing). */
export const num = (t: string): number | undefined => (t.trim() === '' ? undefined : Number(t));
const text = (n: number | null | undefined) => (n === null || n === undefined ? '' : String(n));

/**
 * The panel's inputs from what the link holds. Polls of ports that are no longer live members other than the
 * master are left out (`dropped` counts them; the next save removes them); a command no longer in the member's
 * library leaves its byte counts, typed. Without a saved plan (or with none of its polls left) every member starts
 * with its first poll. Timeout and retries not kept in the plan are the master port's.
 */
export function draftOf(plan: BusPlan, saved: SavedPlan): { draft: PlanDraft; dropped: number } {
  const members = new Map(plan.members.map((m) => [m.portId, m]));
  const kept = (saved.busPlan?.polls ?? []).filter((p) => members.has(p.portId));
  const polls: PollDraft[] = kept.length
    ? kept.map((p) => ({
      portId: p.portId,
      commandId: p.commandId && members.get(p.portId)!.commands.some((c) => c.id === p.commandId) ? p.commandId : '',
      label: p.label ?? '',
      requestBytes: String(p.requestBytes),
      replyBytes: String(p.replyBytes),
      responseMs: text(p.responseMs),
      perCycle: String(p.perCycle ?? 1),
    }))
    : plan.members.map(firstPoll);
  const s = plan.master.settings;
  const drops: Record<string, DropDraft> = {};
  for (const m of saved.members) if (m.dropM !== null || m.tapPorts !== null) drops[m.portId] = { dropM: text(m.dropM), tapPorts: text(m.tapPorts) };
  return {
    draft: {
      polls,
      timeout: String(saved.busPlan?.responseTimeoutMs ?? s.responseTimeoutMs),
      retries: String(saved.busPlan?.retries ?? s.retries),
      target: text(saved.busPlan?.targetCycleMs),
      topology: saved.busPlan?.topology ?? '',
      drops,
    },
    dropped: (saved.busPlan?.polls.length ?? 0) - kept.length,
  };
}

/**
 * The plan as a save sends it. Timeout and retries are kept only where they differ from the master port's, so a
 * later change of the port's own values still counts. Numbers as typed: the route's schema checks them.
 */
export function planOf(plan: BusPlan, d: PlanDraft): StoredBusPlan {
  const s = plan.master.settings;
  const timeout = num(d.timeout);
  const retries = num(d.retries);
  const polls = d.polls.map((p): StoredBusPoll => {
    const replyBytes = num(p.replyBytes) as number;
    return {
      portId: p.portId,
      ...(p.commandId ? { commandId: p.commandId } : {}),
      ...(p.label.trim() ? { label: p.label.trim() } : {}),
      requestBytes: num(p.requestBytes) as number,
      replyBytes,
      ...(replyBytes !== 0 && num(p.responseMs) !== undefined ? { responseMs: num(p.responseMs) } : {}),
      perCycle: num(p.perCycle) ?? 1,
    };
  });
  return {
    polls,
    ...(timeout !== undefined && timeout !== s.responseTimeoutMs ? { responseTimeoutMs: timeout } : {}),
    ...(retries !== undefined && retries !== s.retries ? { retries } : {}),
    ...(num(d.target) !== undefined ? { targetCycleMs: num(d.target) } : {}),
    ...(d.topology ? { topology: d.topology } : {}),
  };
}

/** The drops as typed, by member port id ('' → null: not recorded). */
export function dropsOf(d: PlanDraft, portIds: string[]): Record<string, StoredDrop> {
  const n = (t: string | undefined) => (t === undefined || t.trim() === '' ? null : Number(t));
  return Object.fromEntries(portIds.map((id) => [id, { dropM: n(d.drops[id]?.dropM), tapPorts: n(d.drops[id]?.tapPorts) }]));
}

/** What the conflict notice compares: the plan's parts (the poll list whole) and each member's drop. */
export interface PlanShape {
  polls: StoredBusPoll[] | null;
  responseTimeoutMs?: number;
  retries?: number;
  targetCycleMs?: number;
  topology?: BusTopology;
  drops: Record<string, StoredDrop>;
}

export const PLAN_PARTS = ['polls', 'responseTimeoutMs', 'retries', 'targetCycleMs', 'topology'] as const;

export function shapeOf(busPlan: StoredBusPlan | null, drops: Record<string, StoredDrop>): PlanShape {
  const { polls = null, ...rest } = busPlan ?? {};
  return { polls, ...rest, drops };
}

/** The drops a link's members hold, by port id. */
export function storedDrops(members: SavedPlan['members']): Record<string, StoredDrop> {
  return Object.fromEntries(members.map((m) => [m.portId, { dropM: m.dropM, tapPorts: m.tapPorts }]));
}

/**
 * The body of `PATCH /api/links/{id}` for the parts in `changed` (paths into the shape): the plan whole when a part
 * of it changed, the member list (as the link holds it at `members`, with the drops of `value`) when a drop changed.
 */
export function saveBody(
  version: number,
  value: PlanShape,
  changed: readonly (readonly string[])[],
  members: { portId: string; role: string; isEnd: boolean | null; unitLoads: number | null; dropM: number | null; tapPorts: number | null }[],
): Record<string, unknown> {
  const body: Record<string, unknown> = { version };
  if (changed.some((p) => (PLAN_PARTS as readonly string[]).includes(p[0]!))) {
    const { drops: _d, polls, ...rest } = value;
    body.busPlan = polls && polls.length ? { polls, ...Object.fromEntries(Object.entries(rest).filter(([, v]) => v !== undefined)) } : null;
  }
  if (changed.some((p) => p[0] === 'drops')) {
    body.members = members.map(({ portId, role, isEnd, unitLoads, dropM, tapPorts }) => ({
      portId, role, isEnd, unitLoads, ...(value.drops[portId] ?? { dropM, tapPorts }),
    }));
  }
  return body;
}
