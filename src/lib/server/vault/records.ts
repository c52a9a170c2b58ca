/** Shared record mechanics: team-scoped lookup, versioned updates with revisions, and list paging. */
import { and, asc, desc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import type { SQLiteColumn } from 'drizzle-orm/sqlite-core';
import { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { revision, type EntityType, type FieldChange } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError, validate } from '../http';
import { newId } from '../ids';
import { listQuerySchema } from '../../schemas/vault';
import { diffSnapshots } from './diff';

/** Columns every vault table has (drizzle's table types are too specific to share, hence the loose type). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type VaultTable = any;

export interface EntitySpec<Row = Record<string, unknown>> {
  type: EntityType;
  /** Used in messages: "No device with that id in this team." */
  noun: string;
  table: VaultTable;
  /** The editable state kept in revisions and restored from them. */
  snapshot(row: Row): Record<string, unknown>;
  /** Short label for history and trash lists (a tag, a name). */
  describe(row: Row): string;
  /** Adds state kept outside the main row (a link's members) before snapshots are taken. */
  hydrate?(q: DbOrTx, row: Row): Promise<Row>;
  /** Keys of an update kept outside the main row, and how to write them. */
  extraKeys?: readonly string[];
  writeExtra?(q: DbOrTx, ctx: TeamContext, id: string, values: Record<string, unknown>): Promise<void>;
}

export const now = () => new Date();

export function notFound(noun: string): HttpError {
  return new HttpError(404, `No ${noun} with that id in this team.`);
}

/** The record if it belongs to the caller's team and is not in the trash; 404 otherwise. */
export async function findLive<Row>(q: DbOrTx, ctx: TeamContext, spec: EntitySpec<Row>, id: string): Promise<Row> {
  const t = spec.table;
  const [row] = await q.select().from(t).where(and(eq(t.id, id), eq(t.teamId, ctx.team.id), isNull(t.deletedAt)));
  if (!row) throw notFound(spec.noun);
  return row as Row;
}

export function staleError(spec: EntitySpec<never>, current: unknown, version: number): HttpError {
  return new HttpError(
    409,
    `This ${spec.noun} was changed by someone else since you opened it (you edited version ${version}). Compare and re-apply your changes.`,
    { current },
  );
}

export interface RevisionInput {
  type: EntityType;
  entityId: string;
  version: number;
  action: 'create' | 'update' | 'delete' | 'restore' | 'revert' | 'copy';
  changes: FieldChange[];
  snapshot: Record<string, unknown>;
  summary?: string;
}

export async function writeRevision(q: DbOrTx, ctx: TeamContext, r: RevisionInput): Promise<void> {
  await q.insert(revision).values({
    id: newId('rev'),
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
  });
}

/**
 * Applies `values` to the record if it is still at `version` (`UPDATE … WHERE id=? AND version=?`)
 * and writes a revision with the field changes. 404 for a missing/other team's/trashed record,
 * 409 with the current record when the version is stale. No change at all writes nothing.
 */
export async function updateVersioned<Row extends { version: number }>(
  q: DbOrTx,
  ctx: TeamContext,
  spec: EntitySpec<Row>,
  id: string,
  version: number,
  values: Record<string, unknown>,
  opts: { action?: RevisionInput['action']; summary?: string; present?: (row: Row) => Promise<unknown> | unknown } = {},
): Promise<{ row: Row; changes: FieldChange[] }> {
  const t = spec.table;
  const load = async () => {
    const row = await findLive(q, ctx, spec, id);
    return spec.hydrate ? spec.hydrate(q, row) : row;
  };
  const before = await load();
  const present = opts.present ?? ((r: Row) => r);
  if (before.version !== version) throw staleError(spec as EntitySpec<never>, await present(before), version);
  const beforeSnap = spec.snapshot(before);
  const changes = diffSnapshots(beforeSnap, spec.snapshot({ ...before, ...values }));
  if (changes.length === 0) return { row: before, changes };
  const columns = Object.fromEntries(Object.entries(values).filter(([k]) => !spec.extraKeys?.includes(k)));
  const result = await q
    .update(t)
    .set({ ...columns, version: version + 1, updatedAt: now(), updatedBy: ctx.user.id })
    .where(and(eq(t.id, id), eq(t.teamId, ctx.team.id), eq(t.version, version), isNull(t.deletedAt)));
  if (result.rowsAffected === 0) {
    throw staleError(spec as EntitySpec<never>, await present(await load()), version);
  }
  await spec.writeExtra?.(q, ctx, id, values);
  const row = await load();
  await writeRevision(q, ctx, {
    type: spec.type,
    entityId: id,
    version: version + 1,
    action: opts.action ?? 'update',
    changes,
    snapshot: spec.snapshot(row),
    summary: opts.summary ?? summarize(changes),
  });
  return { row, changes };
}

export async function recordCreated<Row extends { id: string }>(q: DbOrTx, ctx: TeamContext, spec: EntitySpec<Row>, row: Row, summary?: string) {
  const snap = spec.snapshot(row);
  await writeRevision(q, ctx, {
    type: spec.type,
    entityId: row.id,
    version: 1,
    action: 'create',
    changes: diffSnapshots({}, snap),
    snapshot: snap,
    summary: summary ?? `Created ${spec.noun} ${spec.describe(row)}`,
  });
}

export function summarize(changes: FieldChange[]): string {
  const names = changes.map((c) => c.field);
  return names.length <= 4 ? `Changed ${names.join(', ')}` : `Changed ${names.slice(0, 3).join(', ')} and ${names.length - 3} more`;
}

// ---- lists ----

export interface Page<T> {
  items: T[];
  page: number;
  pageSize: number;
  total: number;
  sort: string;
  dir: 'asc' | 'desc';
}

/**
 * A parser for `?page=&pageSize=&sort=&dir=` plus an endpoint's own filters (unknown parameters
 * answer 422); `sort` must be one of `sortable`. Build it once per endpoint, at module level: zod
 * compiles a schema on its first parse, so a schema made per request pays that on every request.
 */
export function listParser<F extends z.ZodRawShape>(sortable: readonly string[], defaultSort: string, filters: F) {
  const schema = listQuerySchema.extend(filters);
  return (url: URL) => {
    const raw: Record<string, string> = {};
    for (const [k, v] of url.searchParams) raw[k] = v;
    const parsed = validate(schema, raw) as z.infer<typeof listQuerySchema> & z.infer<z.ZodObject<F>>;
    const sort = parsed.sort ?? defaultSort;
    if (!sortable.includes(sort)) {
      throw new HttpError(422, `sort: choose one of ${sortable.join(', ')}`, { fields: { sort: `Sort by one of ${sortable.join(', ')}.` } });
    }
    return { ...parsed, sort };
  };
}

export function orderBy(column: SQLiteColumn | SQL, dir: 'asc' | 'desc', tieBreak: SQLiteColumn): SQL[] {
  return [dir === 'desc' ? desc(column) : asc(column), asc(tieBreak)];
}

export async function countWhere(table: VaultTable, where: SQL | undefined, q: DbOrTx = db): Promise<number> {
  const [row] = await q.select({ n: sql<number>`count(*)` }).from(table).where(where);
  return Number(row?.n ?? 0);
}

/** `%text%` for LIKE, with the wildcards in `text` escaped (use with `ESCAPE '\\'`). */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
