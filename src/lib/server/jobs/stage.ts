/**
 * Staged rows: a long job writes the rows it means to create into `job_row` in short batches, then moves
 * them into their tables in its one final transaction with `INSERT … SELECT`, and clears them out again.
 */
import { eq, getTableColumns, getTableName, is, sql, SQL, type Column } from 'drizzle-orm';
import type { SQLiteTable } from 'drizzle-orm/sqlite-core';
import { db, type Tx } from '../../../db/client';
import { job, jobRow } from '../../../db/schema';
import { nextTurn } from './turns';

/** Rows written to the stage per statement (each its own short write). */
export const STAGE_BATCH = 500;
/** Rows moved per `INSERT … SELECT` in the final transaction, which yields to other requests between them. */
export const APPLY_BATCH = 500;
/**
 * Page cache of the final transaction's connection, in KiB (SQLite's default is 2,000 KiB). The move updates
 * several indexes keyed by random ids; with the default cache their pages are evicted, spilled to the log and
 * read back again and again, which more than doubled the time the transaction holds the write lock.
 */
export const APPLY_CACHE_KIB = 65_536;
/** Staged rows removed per statement when clearing. */
const CLEAR_BATCH = 500;

interface Target {
  table: SQLiteTable;
  name: string;
  columns: [string, Column][];
  count: number;
  /** Raw SQL appended to the INSERT, e.g. an ON CONFLICT clause. */
  onConflict?: SQL;
}

/** A column's stored value as Drizzle's insert would write it, defaults included. */
function driverValue(col: Column, value: unknown): unknown {
  let v = value;
  if (v === undefined) {
    if (col.default !== null && col.default !== undefined) v = col.default;
    else if (col.defaultFn !== undefined) v = col.defaultFn();
    else if (col.onUpdateFn !== undefined) v = col.onUpdateFn();
  }
  if (v === undefined || v === null) return null;
  if (is(v, SQL)) throw new Error(`staged column ${col.name}: SQL defaults are not supported`);
  return col.mapToDriverValue(v);
}

export class Stage {
  private targets = new Map<string, Target>();
  /** Progress written with the next batch: input records checked, of the total. */
  private progress = { done: 0, total: 0 };

  constructor(readonly jobId: string) {}

  private expected: number | null = null;

  report(done: number, total: number): void {
    this.progress = { done, total };
  }

  /** From now on, progress is the rows staged of `expected`. */
  countStaged(expected: number): void {
    this.expected = expected;
  }

  /** Declares a target table, in the order the final transaction fills them (parents first). */
  target(table: SQLiteTable, opts: { onConflict?: SQL } = {}): void {
    const name = getTableName(table);
    if (!this.targets.has(name)) {
      this.targets.set(name, { table, name, columns: Object.entries(getTableColumns(table)) as [string, Column][], count: 0, onConflict: opts.onConflict });
    }
  }

  get staged(): number {
    let n = 0;
    for (const t of this.targets.values()) n += t.count;
    return n;
  }

  /** Writes rows (as they would be given to `db.insert(table).values(...)`) to the stage, a batch at a time. */
  async add(table: SQLiteTable, rows: Record<string, unknown>[]): Promise<void> {
    this.target(table);
    const t = this.targets.get(getTableName(table))!;
    for (let i = 0; i < rows.length; i += STAGE_BATCH) {
      const values = rows.slice(i, i + STAGE_BATCH).map((row) => ({
        jobId: this.jobId, target: t.name, seq: t.count++,
        data: JSON.stringify(t.columns.map(([key, col]) => driverValue(col, row[key]))),
      }));
      if (this.expected !== null) this.progress = { done: this.staged, total: this.expected };
      await db.batch([
        db.insert(jobRow).values(values),
        db.update(job).set({ done: this.progress.done, total: this.progress.total, updatedAt: new Date() }).where(eq(job.id, this.jobId)),
      ]);
      await nextTurn();
    }
  }

  /** Inside the final transaction: every staged row into its table, in batches that let other requests in between. */
  async apply(tx: Tx): Promise<void> {
    await tx.run(sql.raw(`PRAGMA cache_size = -${APPLY_CACHE_KIB}`));
    for (const t of this.targets.values()) {
      const cols = sql.join(t.columns.map(([, col]) => sql.identifier(col.name)), sql`, `);
      const values = sql.join(t.columns.map((_, i) => sql.raw(`json_extract(data, '$[${i}]')`)), sql`, `);
      for (let lo = 0; lo < t.count; lo += APPLY_BATCH) {
        // `WHERE` is required before an upsert clause on INSERT … SELECT; it is there anyway.
        await tx.run(sql`INSERT INTO ${sql.identifier(t.name)} (${cols}) SELECT ${values} FROM job_row
          WHERE job_id = ${this.jobId} AND target = ${t.name} AND seq >= ${lo} AND seq < ${lo + APPLY_BATCH} ORDER BY seq ${t.onConflict ?? sql``}`);
        await nextTurn();
      }
    }
  }

  /** Last in the final transaction, whatever happened: the connection goes back to the pool with SQLite's default page cache. */
  async restoreCache(tx: Tx): Promise<void> {
    await tx.run(sql.raw('PRAGMA cache_size = -2000')).catch(() => undefined);
  }

  /** Removes this job's staged rows, a batch per statement. */
  async clear(): Promise<void> {
    await clearStaged(this.jobId);
  }
}

export async function clearStaged(jobId: string): Promise<void> {
  for (;;) {
    const res = await db.run(sql`DELETE FROM job_row WHERE rowid IN (SELECT rowid FROM job_row WHERE job_id = ${jobId} LIMIT ${CLEAR_BATCH})`);
    if (res.rowsAffected < CLEAR_BATCH) return;
    await nextTurn();
  }
}
