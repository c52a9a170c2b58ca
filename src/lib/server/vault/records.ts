/** List paging for the vault's services (the record mechanics themselves are in ../records/engine.ts). */
import { asc, desc, sql, type SQL } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import type { TeamScope } from '../guard';
import { validate } from '../http';
import { listQuerySchema } from '../../schemas/vault';
import { Invalid, notFound } from '../errors';
import { findInTeam } from '../records/engine';
import type { Entity, VersionedRow, VersionedTable } from '../records/entity';

/** Find, create and versioned update live in the record engine; re-exported for the vault's services. */
export { findInTeam, now, recordCreated, staleError, summarize, updateVersioned, writeRevision, type RevisionInput } from '../records/engine';
export { notFound };

/** The record if it belongs to the caller's team and is not in the trash; NotFound otherwise. */
export function findLive<T extends VersionedTable, Row extends VersionedRow>(q: DbOrTx, ctx: TeamScope, entity: Entity<T, Row>, id: string): Promise<Row> {
  return findInTeam(q, ctx, entity, id);
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
      throw new Invalid(`sort: choose one of ${sortable.join(', ')}`, { fields: { sort: `Sort by one of ${sortable.join(', ')}.` } });
    }
    return { ...parsed, sort };
  };
}

export function orderBy(column: SQLiteColumn | SQL, dir: 'asc' | 'desc', tieBreak: SQLiteColumn): SQL[] {
  return [dir === 'desc' ? desc(column) : asc(column), asc(tieBreak)];
}

export async function countWhere(table: SQLiteTable, where: SQL | undefined, q: DbOrTx = db): Promise<number> {
  const [row] = await q.select({ n: sql<number>`count(*)` }).from(table).where(where);
  return Number(row?.n ?? 0);
}

/** `%text%` for LIKE, with the wildcards in `text` escaped (use with `ESCAPE '\\'`). */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
