/** A command's history and restoring any version of it (which writes a new revision). */
import { and, desc, eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { commandRevision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { missingReferences, missingReferencesError, type Reference } from '../vault/references';
import { SNAPSHOT_KEYS, findCommand, updateCommandVersioned, type CommandRow } from './records';

export type CommandRevisionRow = typeof commandRevision.$inferSelect;

/** Newest first; also for a command in the trash, so it can be brought back. */
export async function listCommandRevisions(ctx: TeamContext, id: string): Promise<{ commandId: string; version: number; trashed: boolean; items: CommandRevisionRow[] }> {
  const row = await findCommand(db, ctx, id, { trashed: true });
  const items = await db
    .select()
    .from(commandRevision)
    .where(and(eq(commandRevision.teamId, ctx.team.id), eq(commandRevision.commandId, id)))
    .orderBy(desc(commandRevision.version), desc(commandRevision.createdAt));
  return { commandId: id, version: row.version, trashed: row.deletedAt !== null, items };
}

/**
 * Puts the command back as it stood at `revisionId`; `version` is its current version as the user
 * saw it (stale: 409). A command in the trash comes back out of it. Refused (409) while its device
 * or profile is in the trash: a live command under a trashed owner would be out of everyone's reach.
 */
export async function restoreCommandRevision(ctx: TeamContext, id: string, revisionId: string, version: number) {
  return db.transaction(async (tx) => {
    const current = await findCommand(tx, ctx, id, { trashed: true });
    const owner: Reference = current.deviceId
      ? { type: 'device', id: current.deviceId, field: 'deviceId' }
      : { type: 'profile', id: current.profileId ?? '', field: 'profileId' };
    const missing = await missingReferences(tx, ctx, [owner]);
    if (missing.length) throw missingReferencesError('This command', missing);
    const [rev] = await tx
      .select()
      .from(commandRevision)
      .where(and(eq(commandRevision.id, revisionId), eq(commandRevision.teamId, ctx.team.id), eq(commandRevision.commandId, id)));
    if (!rev) throw new HttpError(404, 'No revision with that id for this command.');
    const values = Object.fromEntries(SNAPSHOT_KEYS.filter((k) => k in rev.snapshot).map((k) => [k, rev.snapshot[k]])) as Partial<CommandRow>;
    const { row, changes } = await updateCommandVersioned(tx, ctx, id, version, values, {
      action: 'revert',
      summary: `Restored version ${rev.version}`,
      fromTrash: true,
    });
    return { command: row, restoredVersion: rev.version, changed: changes.length };
  });
}
