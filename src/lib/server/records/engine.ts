/**
 * The record engine: find-in-team, create, update (conditional on the version, writing a revision), trash,
 * restore and purge for every declared entity (./entities.ts), over the one `revision` table and the one
 * trash (`deleted_at` / `trash_id`).
 */
import { and, eq, getTableColumns, inArray, isNotNull, isNull, sql, type InferSelectModel, type SQL } from 'drizzle-orm';
import type { SQLiteUpdateSetSource } from 'drizzle-orm/sqlite-core';
import type { DbOrTx } from '../../../db/client';
import { revision, type FieldChange, type RecordType } from '../../../db/schema';
import type { TeamContext, TeamScope } from '../guard';
import { Conflict, Stale, notFound } from '../errors';
import { newId } from '../ids';
import { changesFromNothing, diffSnapshots } from './diff';
import { snapshotOf, type Entity, type VersionedRow, type VersionedTable } from './entity';

export const now = () => new Date();

/**
 * The values of an UPDATE on a declared table. `VersionedTable` guarantees the bookkeeping columns and the
 * entity's declaration the others; TypeScript cannot follow a generic table into drizzle's set type, hence
 * this one conversion.
 */
function setOf<T extends VersionedTable>(_table: T, values: Record<string, unknown>): SQLiteUpdateSetSource<T> {
  return values as SQLiteUpdateSetSource<T>;
}

/** A row of the entity's table as the entity declares it (the same columns; `hydrate` adds the rest). */
function asRow<T extends VersionedTable, Row extends VersionedRow>(_e: Entity<T, Row>, row: InferSelectModel<T>): Row {
  return row as unknown as Row;
}

export type RecordState = 'live' | 'any' | 'trash';

/**
 * The record if it belongs to the caller's team and is in `state` (default live: not in the trash); NotFound
 * otherwise, in the one wording "No device with that id in this team." (`in the trash` for trashed roots).
 */
export async function findInTeam<T extends VersionedTable, Row extends VersionedRow>(
  q: DbOrTx,
  ctx: TeamScope,
  entity: Entity<T, Row>,
  id: string,
  state: RecordState = 'live',
): Promise<Row> {
  const t = entity.table;
  const where = and(eq(t.id, id), eq(t.teamId, ctx.team.id), state === 'live' ? isNull(t.deletedAt) : undefined);
  const [found] = await q.select().from(t).where(where);
  const row = found && asRow(entity, found);
  if (state === 'trash' && (!row || !row.deletedAt || row.trashId !== id)) throw notFound(entity.noun, 'in the trash');
  if (!row) throw notFound(entity.noun);
  return row;
}

/** The record with the state kept outside its row (a link's members). */
export async function hydrated<T extends VersionedTable, Row extends VersionedRow>(q: DbOrTx, entity: Entity<T, Row>, row: Row): Promise<Row> {
  return entity.hydrate ? entity.hydrate(q, row) : row;
}

/** 409 with the record as it is now. */
export function staleError(entity: { noun: string }, current: unknown, version: number): Stale {
  const at = (current as { version?: unknown } | null)?.version;
  const nowAt = typeof at === 'number' ? `, it is now at ${at}` : '';
  return new Stale(
    `This ${entity.noun} was changed by someone else since you opened it (you edited version ${version}${nowAt}). Compare and re-apply your changes.`,
    current,
  );
}

export type RevisionAction = 'create' | 'update' | 'delete' | 'restore' | 'revert' | 'copy';

export interface RevisionInput {
  type: RecordType;
  entityId: string;
  version: number;
  action: RevisionAction;
  changes: FieldChange[];
  snapshot: Record<string, unknown>;
  summary?: string;
}

/** A revision's columns as the app reads and answers them (its job stamp is the long jobs' bookkeeping). */
const { jobId: _jobStamp, ...shownColumns } = getTableColumns(revision);
export const revisionColumns = shownColumns;
export type ShownRevision = Omit<typeof revision.$inferSelect, 'jobId'>;

/**
 * The revisions anyone may see (in SQL naming the revision table `table`): not those a long job wrote with its new records while that job is not done
 * (still staging, or failed and being removed); its commit, which marks it done, shows them all at once.
 */
export const shownRevisionAs = (table: 'revision' | 'r'): SQL => sql.raw(`(${table}.job_id IS NULL OR ${table}.job_id NOT IN (SELECT id FROM job WHERE state <> 'done'))`);
/** The same, for queries built on the `revision` table itself. */
export const shownRevision: SQL = shownRevisionAs('revision');

/** A revision row as written (also built in bulk by imports). */
export function revisionRow(ctx: { team: { id: string }; user: { id: string; name: string } }, r: RevisionInput, id = newId('rev')) {
  return {
    id,
    teamId: ctx.team.id,
    entityType: r.type,
    entityId: r.entityId,
    version: r.version,
    action: r.action,
    userId: ctx.user.id,
    userName: ctx.user.name,
    summary: r.summary ?? '',
    changes: r.changes,
    snapshot: r.snapshot,
  };
}

export async function writeRevision(q: DbOrTx, ctx: TeamContext, r: RevisionInput): Promise<void> {
  await q.insert(revision).values(revisionRow(ctx, r));
}

/** The revision a new record starts its history with: every snapshot field, from nothing. */
export function creationRevision<K extends string>(
  entity: { type: RecordType; snapshotKeys: readonly K[] },
  row: { id: string } & Partial<Record<K, unknown>>,
  summary: string,
  action: 'create' | 'copy' = 'create',
): RevisionInput {
  const snap = snapshotOf(entity, row);
  return { type: entity.type, entityId: row.id, version: 1, action, changes: changesFromNothing(snap), snapshot: snap, summary };
}

/** Writes the creation revision of a record just inserted. */
export async function recordCreated<T extends VersionedTable, Row extends VersionedRow>(
  q: DbOrTx,
  ctx: TeamContext,
  entity: Entity<T, Row>,
  row: Row,
  summary?: string,
  action: 'create' | 'copy' = 'create',
) {
  await writeRevision(q, ctx, creationRevision(entity, row, summary ?? `Created ${entity.noun} ${entity.describe(row)}`, action));
}

export function summarize(changes: FieldChange[]): string {
  const names = changes.map((c) => c.field);
  return names.length <= 4 ? `Changed ${names.join(', ')}` : `Changed ${names.slice(0, 3).join(', ')} and ${names.length - 3} more`;
}

/**
 * Applies `values` to the record if it is still at `version` (`UPDATE … WHERE id=? AND version=?`)
 * and writes a revision with the field changes. 404 for a missing/other team's/trashed record,
 * 409 with the current record when the version is stale. No change at all writes nothing.
 * `fromTrash` also takes a record out of the trash (commands come back by restoring a revision).
 */
export async function updateVersioned<T extends VersionedTable, Row extends VersionedRow>(
  q: DbOrTx,
  ctx: TeamContext,
  entity: Entity<T, Row>,
  id: string,
  version: number,
  values: Record<string, unknown>,
  opts: { action?: RevisionAction; summary?: string; note?: string; present?: (row: NoInfer<Row>) => Promise<unknown> | unknown; fromTrash?: boolean } = {},
): Promise<{ row: Row; changes: FieldChange[] }> {
  const t = entity.table;
  const load = async (state: RecordState) => hydrated(q, entity, await findInTeam(q, ctx, entity, id, state));
  const before = await load(opts.fromTrash ? 'any' : 'live');
  const present = opts.present ?? ((r: Row) => r);
  if (before.version !== version) throw staleError(entity, await present(before), version);
  const changes = diffSnapshots(snapshotOf(entity, before), snapshotOf(entity, { ...before, ...values }));
  const untrash = opts.fromTrash === true && before.deletedAt !== null;
  if (changes.length === 0 && !untrash) return { row: before, changes };
  const columns = Object.fromEntries(Object.entries(values).filter(([k]) => !entity.extraKeys?.includes(k)));
  const result = await q
    .update(t)
    .set(setOf(t, { ...columns, ...(untrash ? { deletedAt: null, deletedBy: null, trashId: null } : {}), version: version + 1, updatedAt: now(), updatedBy: ctx.user.id }))
    .where(and(eq(t.id, id), eq(t.teamId, ctx.team.id), eq(t.version, version), opts.fromTrash ? undefined : isNull(t.deletedAt)));
  if (result.rowsAffected === 0) {
    throw staleError(entity, await present(await load('any')), version);
  }
  await entity.writeExtra?.(q, ctx, id, values);
  const row = await load('live');
  await writeRevision(q, ctx, {
    type: entity.type,
    entityId: id,
    version: version + 1,
    action: opts.action ?? 'update',
    changes,
    snapshot: snapshotOf(entity, row),
    summary: (opts.summary ?? summarize(changes)) + (opts.note ?? ''),
  });
  return { row, changes };
}

/** The trash stamp: when, by whom, and the record the user deleted (everything moved with it shares it). */
export interface TrashStamp {
  deletedAt: Date;
  deletedBy: string;
  trashId: string;
}

/**
 * Moves a record to the trash (`version`, when given, must be current, else 409) and writes its revision;
 * `cascade` moves what lives inside it along, in the same transaction.
 */
export async function trashRecord<T extends VersionedTable, Row extends VersionedRow>(
  tx: DbOrTx,
  ctx: TeamContext,
  entity: Entity<T, Row>,
  id: string,
  version: number | undefined,
  cascade?: (stamp: TrashStamp) => Promise<void>,
): Promise<Row> {
  const row = await findInTeam(tx, ctx, entity, id);
  if (version !== undefined && row.version !== version) throw staleError(entity, row, version);
  const stamp: TrashStamp = { deletedAt: now(), deletedBy: ctx.user.id, trashId: id };
  const t = entity.table;
  const res = await tx
    .update(t)
    .set(setOf(t, { ...stamp, version: row.version + 1 }))
    .where(and(eq(t.id, id), eq(t.teamId, ctx.team.id), eq(t.version, row.version), isNull(t.deletedAt)));
  if (res.rowsAffected === 0) throw staleError(entity, await findInTeam(tx, ctx, entity, id, 'any'), row.version);
  await cascade?.(stamp);
  const snap = snapshotOf(entity, await hydrated(tx, entity, row));
  await writeRevision(tx, ctx, {
    type: entity.type, entityId: id, version: row.version + 1, action: 'delete', changes: [], snapshot: snap,
    summary: `Moved ${entity.noun} ${entity.describe(row)} to the trash`,
  });
  return { ...row, version: row.version + 1 };
}

/** Marks every live row of `entity` matching `where` as moved to the trash with `stamp`. */
export async function stampTrash<T extends VersionedTable, Row extends VersionedRow>(tx: DbOrTx, ctx: TeamContext, entity: Entity<T, Row>, where: SQL | undefined, stamp: TrashStamp) {
  const t = entity.table;
  await tx.update(t).set(setOf(t, { ...stamp })).where(and(eq(t.teamId, ctx.team.id), where, isNull(t.deletedAt)));
}

/** Takes every row of `entity` moved to the trash with `trashId` out of it. */
export async function clearTrash<T extends VersionedTable, Row extends VersionedRow>(tx: DbOrTx, ctx: TeamContext, entity: Entity<T, Row>, trashId: string) {
  const t = entity.table;
  await tx.update(t).set(setOf(t, { deletedAt: null, deletedBy: null, trashId: null })).where(and(eq(t.teamId, ctx.team.id), eq(t.trashId, trashId)));
}

/** The ids of the rows of `entity` in the trash under `trashId`. */
export async function idsInTrash<T extends VersionedTable, Row extends VersionedRow>(q: DbOrTx, ctx: TeamContext, entity: Entity<T, Row>, trashId: string): Promise<string[]> {
  const t = entity.table;
  const rows = await q.select({ id: t.id }).from(t).where(and(eq(t.teamId, ctx.team.id), eq(t.trashId, trashId), isNotNull(t.deletedAt)));
  return rows.map((r) => String(r.id));
}

/** After the rows under `trashId` came back: bumps the root's version and writes its `restore` revision. */
export async function recordRestored<T extends VersionedTable, Row extends VersionedRow>(tx: DbOrTx, ctx: TeamContext, entity: Entity<T, Row>, root: Row) {
  const t = entity.table;
  await tx.update(t).set(setOf(t, { version: root.version + 1, updatedAt: now(), updatedBy: ctx.user.id })).where(eq(t.id, root.id));
  const live = await hydrated(tx, entity, await findInTeam(tx, ctx, entity, root.id));
  await writeRevision(tx, ctx, {
    type: entity.type, entityId: root.id, version: root.version + 1, action: 'restore', changes: [], snapshot: snapshotOf(entity, live),
    summary: `Restored ${entity.noun} ${entity.describe(live)} from the trash`,
  });
  return live;
}

/** 409 unless the record is live (a revision is restored onto a live record only). */
export function refuseTrashed(entity: { noun: string }, current: VersionedRow) {
  if (current.deletedAt) throw new Conflict(`This ${entity.noun} is in the trash; restore it from the trash first.`, { current });
}

/** Removes the revisions of `ids` (purged records), in slices. */
export async function purgeRevisions(tx: DbOrTx, ctx: TeamContext, ids: string[], slice: number, between: () => Promise<void>) {
  for (let lo = 0; lo < ids.length; lo += slice) {
    await tx.delete(revision).where(and(eq(revision.teamId, ctx.team.id), inArray(revision.entityId, ids.slice(lo, lo + slice))));
    await between();
  }
}

