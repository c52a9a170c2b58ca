/** The command library service: list, read, create, update, trash and copy, scoped to the caller's team. */
import { and, asc, eq, isNotNull, isNull, or } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { command } from '../../../db/schema';
import { recordCreated, trashRecord } from '../records/engine';
import { commandEntity } from '../records/entities';
import { marksProblems, valuesProblems, type CommandCopy, type CommandCreate, type CommandUpdate } from '../../schemas/commands';
import { Conflict, Invalid } from '../errors';
import { assembleSaved, referencedIds, type StepInfo } from '../../composer/saved-sequence';
import { checkSteps, inlineSteps, sequencesUsing, stepCommands, stepsOf } from './sequences';
import { previewFrame } from '../../frame';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import { definedOnly } from '../records/diff';
import { findOwner, liveProfileId, type CommandOwner } from './owners';
import { snapshotOf } from '../records/entity';
import { commandNotFound, findCommand, updateCommandVersioned, type CommandRow } from './records';

export interface CommandView extends CommandRow {
  /** On a create or update: codes of the error findings it was saved with (frame checks on its port), else absent. */
  savedWithErrors?: string[];
  owner: { kind: CommandOwner['kind']; id: string; label: string };
  /** Listed on a device but kept on its profile: read-only there, copy to change. */
  inherited: boolean;
  /** A sequence's steps as they stand: names, and the gap where a step's command is in the trash or purged. */
  steps?: StepInfo[];
}

const view = (row: CommandRow, owner: CommandOwner, inherited = false): CommandView => ({
  ...row,
  owner: { kind: owner.kind, id: owner.id, label: owner.label },
  inherited,
});

/**
 * Commands of a device (its own first, then those of its profile, marked inherited) or of a
 * profile, by name. `trashed` lists the ones in the trash instead (own commands only).
 */
export async function listCommands(ctx: TeamContext, ref: { deviceId?: string; profileId?: string; trashed?: boolean }): Promise<{ owner: CommandOwner; items: CommandView[] }> {
  const owner = await findOwner(db, ctx, ref);
  const profileId = owner.kind === 'device' && !ref.trashed ? await liveProfileId(db, ctx, owner.profileId) : null;
  const ownerCol = owner.kind === 'device' ? command.deviceId : command.profileId;
  const rows = await db
    .select()
    .from(command)
    .where(
      and(
        eq(command.teamId, ctx.team.id),
        // Trashed on their own (an import's commands out of sight until it commits carry the job's stamp instead).
        ref.trashed ? and(isNotNull(command.deletedAt), eq(command.trashId, command.id)) : isNull(command.deletedAt),
        profileId ? or(eq(ownerCol, owner.id), eq(command.profileId, profileId)) : eq(ownerCol, owner.id),
      ),
    )
    .orderBy(asc(command.name), asc(command.id));
  const profile = profileId ? await findOwner(db, ctx, { profileId }) : null;
  const withSteps = await stepsOf(db, ctx, rows);
  const own = withSteps.filter((r) => (owner.kind === 'device' ? r.deviceId === owner.id : true)).map((r) => view(r, owner));
  const inherited = profile ? withSteps.filter((r) => r.profileId === profileId).map((r) => view(r, profile, true)) : [];
  return { owner, items: [...own, ...inherited] };
}

/** One command with its owner. `forDevice` answers a profile command as seen from a device made from it. */
export async function getCommand(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<CommandView> {
  const [row] = await stepsOf(q, ctx, [await findCommand(q, ctx, id)]);
  return view(row!, await findOwner(q, ctx, row!));
}

/** The command as seen from a device page: its own, or its profile's (inherited); 404 otherwise. */
export async function getCommandForDevice(ctx: TeamContext, deviceId: string, id: string): Promise<CommandView & { device: CommandOwner }> {
  const deviceOwner = await findOwner(db, ctx, { deviceId });
  const c = await getCommand(ctx, id);
  const inherited = c.profileId !== null && c.profileId === (await liveProfileId(db, ctx, deviceOwner.profileId));
  if (c.deviceId !== deviceId && !inherited) throw commandNotFound();
  return { ...c, inherited, device: deviceOwner };
}

export async function createCommand(ctx: TeamContext, input: CommandCreate): Promise<CommandView> {
  return db.transaction(async (tx) => {
    const owner = await findOwner(tx, ctx, input);
    const { deviceId: _d, profileId: _p, ...fields } = input;
    if (input.sequence) {
      sequenceShape(input);
      await checkSteps(tx, ctx, { deviceId: input.deviceId ?? null, profileId: input.profileId ?? null }, null, input.sequence);
    }
    const [row] = await tx
      .insert(command)
      .values({ id: newId('cmd'), teamId: ctx.team.id, deviceId: input.deviceId ?? null, profileId: input.profileId ?? null, ...fields, updatedBy: ctx.user.id })
      .returning();
    const errors = await errorFindings(tx, ctx, row!, owner);
    await recordCreated(tx, ctx, commandEntity, row!, `Created command ${row!.name}${findingsNote(errors)}`);
    return { ...view(row!, owner), ...(errors.length ? { savedWithErrors: errors } : {}) };
  });
}

export async function updateCommand(ctx: TeamContext, id: string, input: CommandUpdate): Promise<CommandView> {
  const { version, ...patch } = input;
  return db.transaction(async (tx) => {
    const current = await findCommand(tx, ctx, id);
    if (patch.presets !== undefined || patch.template !== undefined) presetsFit(current, patch);
    const next = { ...current, ...definedOnly(patch) } as CommandRow;
    const marks = marksProblems(next);
    if (marks.length) throw new Invalid(marks[0]![1], { fields: Object.fromEntries(marks) });
    if (patch.sequence !== undefined || (current.sequence && patch.template !== undefined)) await sequenceFits(tx, ctx, current, next);
    const owner = await findOwner(tx, ctx, current);
    const errors = await errorFindings(tx, ctx, next, owner);
    const { row } = await updateCommandVersioned(tx, ctx, id, version, definedOnly(patch) as Partial<CommandRow>, { note: findingsNote(errors) });
    return { ...view(row, owner), ...(errors.length ? { savedWithErrors: errors } : {}) };
  });
}

/** A sequence's own template stays empty and it has no values or presets of its own: its steps hold them. */
function sequenceShape(c: Pick<CommandRow, 'template' | 'fieldValues' | 'presets'>) {
  if (c.template.segments.length) throw new Invalid('A sequence keeps its templates in its steps; send its own template empty ({ "version": 1, "segments": [] }).', { fields: { template: 'Leave empty for a sequence.' } });
  if (Object.keys(c.fieldValues).length) throw new Invalid('A sequence keeps its values in its steps; send no fieldValues.', { fields: { fieldValues: 'Leave empty for a sequence.' } });
  if (c.presets.length) throw new Invalid('A sequence has no presets of its own; use the presets of its steps\' commands.', { fields: { presets: 'Leave empty for a sequence.' } });
}

/** An updated sequence's steps follow the rules; a command used as a step cannot itself become a sequence. */
async function sequenceFits(tx: DbOrTx, ctx: TeamContext, current: CommandRow, next: CommandRow) {
  if (!next.sequence) return;
  sequenceShape(next);
  if (!current.sequence) {
    const users = await sequencesUsing(tx, ctx, current);
    if (users.length) throw new Invalid(`"${current.name}" is a step of ${users.map((u) => `"${u.name}"`).join(', ')}; a step must be a single command, so it cannot become a sequence.`);
  }
  await checkSteps(tx, ctx, current, current.id, next.sequence, referencedIds(current.sequence));
}

/** Codes of the error findings the command's frame has with its saved values, checked on its port as the composer checks it. */
async function errorFindings(q: DbOrTx, ctx: TeamContext, c: Pick<CommandRow, 'template' | 'fieldValues' | 'portName' | 'sequence'>, owner: CommandOwner): Promise<string[]> {
  const port = owner.ports.find((p) => p.name === c.portName) ?? owner.ports[0];
  if (c.sequence) {
    const found = await stepCommands(q, ctx, referencedIds(c.sequence));
    const s = assembleSaved(c.sequence, (id) => found.get(id), { settings: port?.settings });
    return [...new Set(s.findings.filter((f) => f.severity === 'error').map((f) => f.code))];
  }
  try {
    return [...new Set(previewFrame(c.template, c.fieldValues, port?.settings).findings.filter((f) => f.severity === 'error').map((f) => f.code))];
  } catch {
    return [];
  }
}

/** What a revision says of a save with error findings (the composer asks before saving one). */
const findingsNote = (codes: string[]) => (codes.length ? ` · saved with ${codes.length === 1 ? 'an error finding' : `${codes.length} kinds of error finding`} (${codes.join(', ')})` : '');

/**
 * Presets must fit the template they are kept with: the one sent, or the saved one when only presets are sent;
 * a new template must fit the saved presets (send presets with it to change both at once).
 */
function presetsFit(current: CommandRow, patch: Omit<CommandUpdate, 'version'>) {
  const template = patch.template ?? current.template;
  const fields: Record<string, string> = {};
  (patch.presets ?? current.presets).forEach((p, i) => {
    for (const [key, message] of valuesProblems(template, p.values)) fields[`presets.${i}.values.${key}`] ??= `Preset "${p.name}": ${message}`;
  });
  const first = Object.values(fields)[0];
  if (first) throw new Invalid(patch.presets ? first : `${first} Change the preset with the template, or remove it.`, { fields });
}

/**
 * Moves a command to the trash (its history stays; restoring a revision brings it back). A command that live
 * sequences use as a step is refused (409 with `usedBy`, each sequence and its step numbers) unless
 * `confirmUsed`: then those sequences show the gap until it is restored or the step replaced.
 */
export async function trashCommand(ctx: TeamContext, id: string, version?: number, confirmUsed = false) {
  return db.transaction(async (tx) => {
    if (!confirmUsed) {
      const usedBy = await sequencesUsing(tx, ctx, await findCommand(tx, ctx, id));
      if (usedBy.length) {
        const list = usedBy.map((u) => `"${u.name}" (step ${u.steps.join(', ')})`).join(', ');
        throw new Conflict(`This command is a step of ${usedBy.length === 1 ? 'the sequence' : 'the sequences'} ${list}. Moved to the trash, it leaves a gap there until it is restored or the step replaced; confirm to move it anyway.`, { usedBy });
      }
    }
    const row = await trashRecord(tx, ctx, commandEntity, id, version);
    return { id, trashed: true, version: row.version };
  });
}

/** `Name (copy)`, or `Name (copy 2)`, … : the first such name no live command of the same owner has. */
async function copyName(q: DbOrTx, ctx: TeamContext, source: CommandRow): Promise<string> {
  const owner = source.deviceId ? eq(command.deviceId, source.deviceId) : eq(command.profileId, source.profileId!);
  const taken = new Set((await q.select({ name: command.name }).from(command).where(and(eq(command.teamId, ctx.team.id), owner, isNull(command.deletedAt)))).map((r) => r.name.toLowerCase()));
  const base = source.name.replace(/ \(copy(?: \d+)?\)$/, '').slice(0, 100);
  for (let n = 1; ; n++) {
    const name = `${base} (copy${n === 1 ? '' : ` ${n}`})`;
    if (!taken.has(name.toLowerCase())) return name;
  }
}

/**
 * A new command with the same template, values, presets and notes, on another device or profile of the team, or
 * on the same one (a duplicate, named `… (copy)` unless a name is given).
 */
export async function copyCommand(ctx: TeamContext, id: string, input: CommandCopy): Promise<CommandView> {
  return db.transaction(async (tx) => {
    const source = await findCommand(tx, ctx, id);
    const owner = await findOwner(tx, ctx, input);
    const sameOwner = (input.deviceId ?? null) === source.deviceId && (input.profileId ?? null) === source.profileId;
    const name = input.name ?? (sameOwner ? await copyName(tx, ctx, source) : source.name);
    const fields = { ...(snapshotOf(commandEntity, source) as Pick<CommandRow, (typeof commandEntity.snapshotKeys)[number]>), name };
    // Steps point at commands of their own device or profile: elsewhere they become inline steps.
    if (fields.sequence && !sameOwner) fields.sequence = await inlineSteps(tx, ctx, fields.sequence);
    const [row] = await tx
      .insert(command)
      .values({ ...fields, id: newId('cmd'), teamId: ctx.team.id, deviceId: input.deviceId ?? null, profileId: input.profileId ?? null, updatedBy: ctx.user.id })
      .returning();
    const from = await findOwner(tx, ctx, source);
    await recordCreated(tx, ctx, commandEntity, row!, `Copied from ${from.label} (command ${source.name})`, 'copy');
    return view(row!, owner);
  });
}
