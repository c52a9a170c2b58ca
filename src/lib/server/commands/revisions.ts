/** A command's history (in the one `revision` table) and restoring any version of it (which writes a new revision). */
import { and, desc, eq } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { revision } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { NotFound } from '../errors';
import { findInTeam, revisionColumns, shownRevision, type ShownRevision } from '../records/engine';
import { commandEntity, entityOf, type CommandRow } from '../records/entities';
import { snapshotValues } from '../records/entity';
import { referencesOf, refuseMissing } from '../records/references';
import { findCommand, updateCommandVersioned } from './records';

/** A revision of a command as the API has always answered it: `commandId` for the entity. */
export type CommandRevisionRow = Omit<ShownRevision, 'entityType' | 'entityId'> & { commandId: string };

const ofCommand = (teamId: string, id: string) => and(eq(revision.teamId, teamId), eq(revision.entityType, 'command'), eq(revision.entityId, id), shownRevision);

/** Newest first; also for a command in the trash, so it can be brought back. */
export async function listCommandRevisions(ctx: TeamContext, id: string): Promise<{ commandId: string; version: number; trashed: boolean; items: CommandRevisionRow[] }> {
  const row = await findCommand(db, ctx, id, { trashed: true });
  const rows = await db.select(revisionColumns).from(revision).where(ofCommand(ctx.team.id, id)).orderBy(desc(revision.version), desc(revision.createdAt));
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
    await refuseMissingOwner(tx, ctx, current);
    const [rev] = await tx.select(revisionColumns).from(revision).where(and(eq(revision.id, revisionId), ofCommand(ctx.team.id, id)));
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

/**
 * The trash page's restore: the command comes back as it was moved to the trash (a `restore` revision, as
 * vault records write). 404 unless it is in the team's trash; refused (409) like a revision restore while its
 * device or profile is in the trash.
 */
export async function restoreCommandFromTrash(ctx: TeamContext, id: string) {
  return db.transaction(async (tx) => {
    const current = await findInTeam(tx, ctx, commandEntity, id, 'trash');
    await refuseMissingOwner(tx, ctx, current);
    await updateCommandVersioned(tx, ctx, id, current.version, {}, {
      action: 'restore',
      summary: `Restored command ${commandEntity.describe(current)} from the trash`,
      fromTrash: true,
    });
    return { type: 'command' as const, id, restored: true };
  });
}

/** ReferenceMissing (409) while the command's device or profile is in the trash (or gone). */
function refuseMissingOwner(q: DbOrTx, ctx: TeamContext, current: CommandRow) {
  return refuseMissing(q, ctx, 'This command', referencesOf(entityOf('command'), current));
}
