/** A command's history (in the one `revision` table) and restoring any version of it (which writes a new revision). */
import { and, desc, eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { revision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { NotFound } from '../errors';
import { commandEntity, entityOf } from '../records/entities';
import { snapshotValues } from '../records/entity';
import { referencesOf, refuseMissing } from '../records/references';
import { findCommand, updateCommandVersioned } from './records';

/** A revision of a command as the API has always answered it: `commandId` for the entity. */
export type CommandRevisionRow = Omit<typeof revision.$inferSelect, 'entityType' | 'entityId'> & { commandId: string };

const ofCommand = (teamId: string, id: string) => and(eq(revision.teamId, teamId), eq(revision.entityType, 'command'), eq(revision.entityId, id));

/** Newest first; also for a command in the trash, so it can be brought back. */
export async function listCommandRevisions(ctx: TeamContext, id: string): Promise<{ commandId: string; version: number; trashed: boolean; items: CommandRevisionRow[] }> {
  const row = await findCommand(db, ctx, id, { trashed: true });
  const rows = await db.select().from(revision).where(ofCommand(ctx.team.id, id)).orderBy(desc(revision.version), desc(revision.createdAt));
  const items = rows.map(({ entityType: _t, entityId, ...r }) => ({ ...r, commandId: entityId }));
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
    await refuseMissing(tx, ctx, 'This command', referencesOf(entityOf('command'), current));
    const [rev] = await tx.select().from(revision).where(and(eq(revision.id, revisionId), ofCommand(ctx.team.id, id)));
    if (!rev) throw new NotFound('No revision with that id for this command.');
    const values = snapshotValues(commandEntity, rev.snapshot);
    const { row, changes } = await updateCommandVersioned(tx, ctx, id, version, values, {
      action: 'revert',
      summary: `Restored version ${rev.version}`,
      fromTrash: true,
    });
    return { command: row, restoredVersion: rev.version, changed: changes.length };
  });
}
