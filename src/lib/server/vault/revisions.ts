/** History: list the revisions of a record and restore any of them (which writes a new revision). */
import { and, desc, eq } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { revision, type EntityType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { countWhere, notFound, updateVersioned, type Page } from './records';
import { SPECS } from './specs';
import { uniqueName, uniqueTag } from './devices';
import type { StoredMember } from './link-members';
import { missingReferences, missingReferencesError, type Reference } from './references';

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

/**
 * The records a snapshot points at that the record does not point at now: restoring must not write a
 * reference to something in the trash or purged (a reference the record already holds stays as it is).
 */
function newReferences(type: EntityType, snap: Record<string, unknown>, current: Record<string, unknown>): Reference[] {
  const refs: Reference[] = [];
  const single = (field: string, refType: EntityType) => {
    const id = snap[field];
    if (typeof id === 'string' && id !== current[field]) refs.push({ type: refType, id, field });
  };
  if (type === 'device') {
    single('machineId', 'machine');
    single('profileId', 'profile');
  }
  if (type === 'machine') single('siteId', 'site');
  if (type === 'link' && Array.isArray(snap.members)) {
    const now = new Set(((current.members ?? []) as StoredMember[]).map((m) => m.portId));
    for (const m of snap.members as StoredMember[]) if (!now.has(m.portId)) refs.push({ type: 'port', id: m.portId, field: 'members' });
  }
  return refs;
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
    const hydrated = spec.hydrate ? await spec.hydrate(tx, current as never) : current;
    const missing = await missingReferences(tx, ctx, newReferences(rev.entityType, rev.snapshot, hydrated as Record<string, unknown>));
    if (missing.length) throw missingReferencesError(`Version ${rev.version} of this ${spec.noun}`, missing);
    const values = { ...rev.snapshot };
    try {
      const { row, changes } = await updateVersioned(tx, ctx, spec as never, rev.entityId, version, values, {
        action: 'revert',
        summary: `Restored version ${rev.version}`,
      });
      return { entityType: rev.entityType, entityId: rev.entityId, restoredVersion: rev.version, record: row as Record<string, unknown>, changed: changes.length };
    } catch (err) {
      throw rev.entityType === 'device' ? uniqueTag(err) : uniqueName(err, 'name');
    }
  });
}
