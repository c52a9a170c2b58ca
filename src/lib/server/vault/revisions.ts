/** History: list the revisions of a record and restore any of them (which writes a new revision). */
import { and, desc, eq, inArray, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { machine, port, revision, type EntityType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { countWhere, notFound, updateVersioned, type Page } from './records';
import { SPECS } from './specs';
import { uniqueName } from './devices';
import type { StoredMember } from './link-members';

export type RevisionRow = typeof revision.$inferSelect;

/** The record in any state (live or in the trash) if it belongs to the team. */
export async function findAny(q: DbOrTx, ctx: TeamContext, type: EntityType, id: string) {
  const t = SPECS[type].table;
  const [row] = await q.select().from(t).where(and(eq(t.id, id), eq(t.teamId, ctx.team.id)));
  if (!row) throw notFound(SPECS[type].noun);
  return row as Record<string, unknown> & { id: string; version: number; deletedAt: Date | null };
}

export async function listRevisions(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; dir: 'asc' | 'desc'; entityType?: EntityType; entityId?: string },
): Promise<Page<RevisionRow>> {
  if (opts.entityId) {
    if (!opts.entityType) throw new HttpError(422, 'entityType: say what kind of record entityId is', { fields: { entityType: 'Required with entityId.' } });
    await findAny(db, ctx, opts.entityType, opts.entityId);
  }
  const where = and(
    eq(revision.teamId, ctx.team.id),
    opts.entityType ? eq(revision.entityType, opts.entityType) : undefined,
    opts.entityId ? eq(revision.entityId, opts.entityId) : undefined,
  );
  const order = opts.dir === 'asc' ? [revision.createdAt, revision.version] : [desc(revision.createdAt), desc(revision.version)];
  const [items, total] = await Promise.all([
    db.select().from(revision).where(where).orderBy(...order).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize),
    countWhere(revision, where),
  ]);
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: 'createdAt', dir: opts.dir };
}

export async function getRevision(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<RevisionRow> {
  const [row] = await q.select().from(revision).where(and(eq(revision.id, id), eq(revision.teamId, ctx.team.id)));
  if (!row) throw new HttpError(404, 'No revision with that id in this team.');
  return row;
}

/** Values to write back from a snapshot, leaving out references that no longer resolve. */
async function restorable(q: DbOrTx, ctx: TeamContext, type: EntityType, snap: Record<string, unknown>): Promise<Record<string, unknown>> {
  const values = { ...snap };
  if (type === 'device' && typeof values.machineId === 'string') {
    const [m] = await q.select({ id: machine.id }).from(machine).where(and(eq(machine.id, values.machineId), eq(machine.teamId, ctx.team.id), isNull(machine.deletedAt)));
    if (!m) delete values.machineId;
  }
  if (type === 'machine') delete values.siteId;
  if (type === 'link' && Array.isArray(values.members)) {
    const members = values.members as StoredMember[];
    const ids = members.map((m) => m.portId);
    const live = ids.length
      ? new Set((await q.select({ id: port.id }).from(port).where(and(inArray(port.id, ids), eq(port.teamId, ctx.team.id), isNull(port.deletedAt)))).map((r) => r.id))
      : new Set<string>();
    values.members = members.filter((m) => live.has(m.portId));
  }
  return values;
}

/**
 * Puts the record back as it stood at revision `id`. `version` is the record's current version
 * as the user saw it: a stale one answers 409 with the current record.
 */
export async function restoreRevision(ctx: TeamContext, id: string, version: number) {
  return db.transaction(async (tx) => {
    const rev = await getRevision(ctx, id, tx);
    const spec = SPECS[rev.entityType];
    const current = await findAny(tx, ctx, rev.entityType, rev.entityId);
    if (current.deletedAt) throw new HttpError(409, `This ${spec.noun} is in the trash; restore it from the trash first.`, { current });
    const values = await restorable(tx, ctx, rev.entityType, rev.snapshot);
    try {
      const { row, changes } = await updateVersioned(tx, ctx, spec as never, rev.entityId, version, values, {
        action: 'revert',
        summary: `Restored version ${rev.version}`,
      });
      return { entityType: rev.entityType, entityId: rev.entityId, restoredVersion: rev.version, record: row as Record<string, unknown>, changed: changes.length };
    } catch (err) {
      throw uniqueName(err, 'name');
    }
  });
}
