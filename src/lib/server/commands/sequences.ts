/**
 * Saved sequences in the library (docs/decisions/015-saved-sequences.md): the rules for their steps'
 * references, the sequences a command is used by, and the lookup that tells each step's state.
 */
import { and, eq, inArray, isNotNull, isNull } from 'drizzle-orm';
import type { DbOrTx } from '../../../db/client';
import { command } from '../../../db/schema';
import { describeSteps, referencedIds, type SavedSequence, type StepCommand, type StepInfo } from '../../composer/saved-sequence';
import type { Template } from '../../frame/template';
import type { TeamContext, TeamScope } from '../guard';
import { Invalid } from '../errors';
import type { CommandRow } from './records';

export const EMPTY_TEMPLATE: Template = { version: 1, segments: [] };

type Owner = { deviceId: string | null; profileId: string | null };

/** The commands the ids name in the caller's team, in any state (live or in the trash); purged ones are absent. */
export async function stepCommands(q: DbOrTx, ctx: TeamScope, ids: readonly string[]): Promise<Map<string, StepCommand & Owner>> {
  const unique = [...new Set(ids)];
  if (!unique.length) return new Map();
  const rows = await q
    .select({ id: command.id, name: command.name, template: command.template, fieldValues: command.fieldValues, replyTemplate: command.replyTemplate, sequence: command.sequence, deletedAt: command.deletedAt, trashId: command.trashId, deviceId: command.deviceId, profileId: command.profileId })
    .from(command)
    .where(and(eq(command.teamId, ctx.team.id), inArray(command.id, unique)));
  // An import's records out of sight (stamped with the job's id, not their own) are not there yet.
  return new Map(rows.filter((r) => r.deletedAt === null || r.trashId === r.id).map((r) => [r.id, {
    id: r.id, name: r.name, template: r.template, fieldValues: r.fieldValues, replyTemplate: r.replyTemplate ?? null,
    isSequence: r.sequence !== null, trashed: r.deletedAt !== null, deviceId: r.deviceId, profileId: r.profileId,
  }]));
}

/**
 * Refuses (422, a message per step under `fields`) a step that points at a command not in this team's library,
 * of another device or profile, in the trash, itself a sequence, or the sequence itself. `kept` are references
 * the saved sequence already had: a gap left by the trash or a purge may stay while the rest is edited.
 */
export async function checkSteps(q: DbOrTx, ctx: TeamContext, owner: Owner, selfId: string | null, seq: SavedSequence, kept: readonly string[] = []) {
  const found = await stepCommands(q, ctx, referencedIds(seq));
  const fields: Record<string, string> = {};
  seq.steps.forEach((s, i) => {
    if (!s.commandId) return;
    const at = `Step ${i + 1}`;
    const c = found.get(s.commandId);
    const kept_ = kept.includes(s.commandId);
    let problem: string | null = null;
    if (s.commandId === selfId) problem = `${at}: a sequence cannot be a step of itself.`;
    else if (!c) problem = kept_ ? null : `${at}: no command with id ${s.commandId} in this team's library.`;
    else if (c.deviceId !== owner.deviceId || c.profileId !== owner.profileId) {
      problem = `${at}: "${c.name}" belongs to another ${c.deviceId ? 'device' : 'profile'}; a step must be a command of the sequence's own ${owner.deviceId ? 'device' : 'profile'} (copy the command here first).`;
    } else if (c.isSequence) problem = `${at}: "${c.name}" is itself a sequence; a step must be a single command.`;
    else if (c.trashed && !kept_) problem = `${at}: "${c.name}" is in the trash; restore it first, or pick another command.`;
    if (problem) fields[`sequence.steps.${i}.commandId`] = problem;
  });
  const first = Object.values(fields)[0];
  if (first) throw new Invalid(first, { fields });
}

export interface UsedBy {
  id: string;
  name: string;
  /** 1-based numbers of the steps that use the command. */
  steps: number[];
}

/** The live sequences of the command's own device or profile that have it as a step. */
export async function sequencesUsing(q: DbOrTx, ctx: TeamContext, c: Pick<CommandRow, 'id'> & Owner): Promise<UsedBy[]> {
  const owner = c.deviceId ? eq(command.deviceId, c.deviceId) : eq(command.profileId, c.profileId ?? '');
  const rows = await q.select({ id: command.id, name: command.name, sequence: command.sequence }).from(command)
    .where(and(eq(command.teamId, ctx.team.id), owner, isNull(command.deletedAt), isNotNull(command.sequence)));
  return rows
    .map((r) => ({ id: r.id, name: r.name, steps: (r.sequence?.steps ?? []).flatMap((s, i) => (s.commandId === c.id ? [i + 1] : [])) }))
    .filter((r) => r.steps.length > 0)
    .sort((a, b) => a.name.localeCompare(b.name));
}

/** Each sequence's steps as shown (names, gaps), for a list of commands; absent for single commands. */
export async function stepsOf<T extends Pick<CommandRow, 'id' | 'sequence'>>(q: DbOrTx, ctx: TeamContext, rows: T[]): Promise<(T & { steps?: StepInfo[] })[]> {
  const found = await stepCommands(q, ctx, rows.flatMap((r) => referencedIds(r.sequence)));
  return rows.map((r) => (r.sequence ? { ...r, steps: describeSteps(r.sequence, (id) => found.get(id)) } : r));
}

/**
 * The sequence as it goes to another device or profile: its steps point at commands of this owner only, so
 * each reference becomes an inline step holding the command's template, values and reply as they are now (a
 * gap stays a gap: an inline step cannot be made of a purged command, so it is refused).
 */
export async function inlineSteps(q: DbOrTx, ctx: TeamContext, seq: SavedSequence): Promise<SavedSequence> {
  const found = await stepCommands(q, ctx, referencedIds(seq));
  const info = describeSteps(seq, (id) => found.get(id));
  const gap = info.find((i) => i.gap);
  if (gap) throw new Invalid(`${gap.gap} A sequence with a gap can only be copied to its own device or profile.`);
  return {
    ...seq,
    steps: seq.steps.map((s) => {
      if (!s.commandId) return s;
      const c = found.get(s.commandId)!;
      const { commandId: _c, ...rest } = s;
      return { ...rest, template: c.template, values: { ...c.fieldValues, ...s.values }, replyTemplate: c.replyTemplate };
    }),
  };
}
