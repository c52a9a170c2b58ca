/**
 * Versioned writes and revisions for commands. The vault's `updateVersioned` writes into the vault's
 * own revision table (typed to vault records, restored through SPECS), so commands keep a small
 * equivalent over `command_revision`; the field diff (`diffSnapshots`) is the vault's.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { command, commandRevision, type CommandAction, type FieldChange } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { newId } from '../ids';
import { diffSnapshots } from '../vault/diff';
import { summarize } from '../vault/records';

export type CommandRow = typeof command.$inferSelect;

/** Everything a revision keeps and a restore puts back (the owner is not part of it). */
export const SNAPSHOT_KEYS = ['name', 'purpose', 'template', 'fieldValues', 'replyTemplate', 'portName', 'rawUnits', 'notes', 'movesMachinery'] as const;

export function snapshotOf(row: Pick<CommandRow, (typeof SNAPSHOT_KEYS)[number]>): Record<string, unknown> {
  return Object.fromEntries(SNAPSHOT_KEYS.map((k) => [k, row[k]]));
}

export const commandNotFound = () => new HttpError(404, 'No command with that id in this team.');

/** The command if it is the caller team's (and, unless `trashed`, not in the trash); 404 otherwise. */
export async function findCommand(q: DbOrTx, ctx: TeamContext, id: string, opts: { trashed?: boolean } = {}): Promise<CommandRow> {
  const [row] = await q
    .select()
    .from(command)
    .where(and(eq(command.id, id), eq(command.teamId, ctx.team.id), opts.trashed ? undefined : isNull(command.deletedAt)));
  if (!row) throw commandNotFound();
  return row;
}

export function staleCommand(current: CommandRow, version: number): HttpError {
  return new HttpError(
    409,
    `This command was changed by someone else since you opened it (you edited version ${version}, it is now at ${current.version}). Compare and re-apply your changes.`,
    { current },
  );
}

export async function writeCommandRevision(
  q: DbOrTx,
  ctx: TeamContext,
  r: { commandId: string; version: number; action: CommandAction; changes: FieldChange[]; snapshot: Record<string, unknown>; summary: string },
): Promise<void> {
  await q.insert(commandRevision).values({
    id: newId('crev'),
    teamId: ctx.team.id,
    commandId: r.commandId,
    version: r.version,
    action: r.action,
    userId: ctx.user.id,
    userName: ctx.user.name,
    summary: r.summary,
    changes: r.changes,
    snapshot: r.snapshot,
  });
}

/**
 * Applies `values` if the command is still at `version` (`UPDATE … WHERE version = ?`) and records
 * a revision; 409 with the current command when stale. `fromTrash` also takes it out of the trash.
 */
export async function updateCommandVersioned(
  q: DbOrTx,
  ctx: TeamContext,
  id: string,
  version: number,
  values: Partial<CommandRow>,
  opts: { action?: CommandAction; summary?: string; fromTrash?: boolean } = {},
): Promise<{ row: CommandRow; changes: FieldChange[] }> {
  const before = await findCommand(q, ctx, id, { trashed: opts.fromTrash });
  if (before.version !== version) throw staleCommand(before, version);
  const changes = diffSnapshots(snapshotOf(before), snapshotOf({ ...before, ...values }));
  const untrash = opts.fromTrash && before.deletedAt !== null;
  if (changes.length === 0 && !untrash) return { row: before, changes };
  const res = await q
    .update(command)
    .set({ ...values, ...(untrash ? { deletedAt: null, deletedBy: null } : {}), version: version + 1, updatedAt: new Date(), updatedBy: ctx.user.id })
    .where(and(eq(command.id, id), eq(command.teamId, ctx.team.id), eq(command.version, version)));
  if (res.rowsAffected === 0) throw staleCommand(await findCommand(q, ctx, id, { trashed: true }), version);
  const row = await findCommand(q, ctx, id);
  await writeCommandRevision(q, ctx, {
    commandId: id,
    version: version + 1,
    action: opts.action ?? 'update',
    changes,
    snapshot: snapshotOf(row),
    summary: opts.summary ?? summarize(changes),
  });
  return { row, changes };
}
