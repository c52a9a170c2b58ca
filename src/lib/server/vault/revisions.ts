/** History: list the revisions of a record and restore any of them (which writes a new revision). */
import { and, desc, eq, inArray } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { ENTITY_TYPES, revision, type EntityType, type RecordType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { countWhere, notFound, updateVersioned, type Page } from './records';
import { entityOf } from '../records/entities';
import { findInTeam, hydrated, refuseTrashed, revisionColumns, shownRevision, type ShownRevision } from '../records/engine';
import { snapshotValues } from '../records/entity';
import { uniqueName, uniqueTag } from './devices';
import type { DeviceRow } from '../records/entities';
import { formerSerialsAfter } from '../../field/serials';
import { referencesOf, refuseMissing } from '../records/references';
import { Invalid } from '../errors';

export type RevisionRow = ShownRevision;

/** The record in any state (live or in the trash) if it belongs to the team. */
export async function findAny(q: DbOrTx, ctx: TeamContext, type: RecordType, id: string) {
  return findInTeam(q, ctx, entityOf(type), id, 'any');
}

export async function listRevisions(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; dir: 'asc' | 'desc'; entityType?: EntityType; entityId?: string },
): Promise<Page<RevisionRow>> {
  if (opts.entityId) {
    if (!opts.entityType) throw new Invalid('entityType: say what kind of record entityId is', { fields: { entityType: 'Required with entityId.' } });
    await findAny(db, ctx, opts.entityType, opts.entityId);
  }
  const where = and(
    eq(revision.teamId, ctx.team.id),
    // The vault's history: commands keep theirs in the same table, listed with each command.
    opts.entityType ? eq(revision.entityType, opts.entityType) : inArray(revision.entityType, ENTITY_TYPES),
    opts.entityId ? eq(revision.entityId, opts.entityId) : undefined,
    shownRevision,
  );
  const order = opts.dir === 'asc' ? [revision.createdAt, revision.version] : [desc(revision.createdAt), desc(revision.version)];
  const [items, total] = await Promise.all([
    db.select(revisionColumns).from(revision).where(where).orderBy(...order).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize),
    countWhere(revision, where),
  ]);
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: 'createdAt', dir: opts.dir };
}

export async function getRevision(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<RevisionRow> {
  const [row] = await q.select(revisionColumns).from(revision).where(and(eq(revision.id, id), eq(revision.teamId, ctx.team.id), inArray(revision.entityType, ENTITY_TYPES), shownRevision));
  if (!row) throw notFound('revision');
  return row;
}

/**
 * Puts the record back as it stood at revision `id`. `version` is the record's current version
 * as the user saw it: a stale one answers 409 with the current record.
 */
export async function restoreRevision(ctx: TeamContext, id: string, version: number) {
  return db.transaction(async (tx) => {
    const rev = await getRevision(ctx, id, tx);
    const entity = entityOf(rev.entityType);
    const current = await findAny(tx, ctx, rev.entityType, rev.entityId);
    refuseTrashed(entity, current);
    await refuseMissing(tx, ctx, `Version ${rev.version} of this ${entity.noun}`, referencesOf(entity, rev.snapshot, await hydrated(tx, entity, current)));
    const values: Record<string, unknown> = snapshotValues(entity, rev.snapshot);
    // A device going back to an earlier serial number keeps the one it leaves among its earlier ones (searchable).
    const former = rev.entityType === 'device' ? formerSerialsAfter(current as DeviceRow, values.serialNumber as string | undefined) : null;
    if (former) values.formerSerials = former;
    try {
      const { row, changes } = await updateVersioned(tx, ctx, entity, rev.entityId, version, values, {
        action: 'revert',
        summary: `Restored version ${rev.version}`,
      });
      return { entityType: rev.entityType, entityId: rev.entityId, restoredVersion: rev.version, record: row, changed: changes.length };
    } catch (err) {
      throw rev.entityType === 'device' ? uniqueTag(err) : uniqueName(err, 'name');
    }
  });
}
