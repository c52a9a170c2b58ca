/**
 * What a long job writes, and when (docs/decisions/008-long-jobs-in-batches.md):
 * - **Versioned records** (sites, machines, profiles, devices, ports, links, commands) go straight into their
 *   tables in short batches, out of sight: stamped like the trash (`deleted_at` set) with the job's id as their
 *   `trash_id`, so no list, search, export or trash page shows them and no unique name rule counts them. The
 *   final transaction shows them all at once, a stamp cleared per row (`show`), after checking their parents.
 *   A device's search row is written with it (searches read live devices only), not when it is shown.
 * - **Their history** (creation revisions) goes straight into `revision` too, stamped with the job's id
 *   (`job_id`): every reader of revisions leaves out those of a job that is not done, so the commit that marks
 *   the job done shows them with their records, and nothing is written for them after it.
 * - **Other rows** are staged in `job_row` as JSON and moved with `INSERT … SELECT` inside the final transaction:
 *   link members and the import map.
 * Batches are written on the background writer's connection (src/db/background-writer.ts), one in flight while
 * the caller builds the next. A failed job removes what it wrote out of sight (`discardJob`); so does the sweep for
 * a job whose server stopped.
 */
import { eq, getTableColumns, getTableName, is, sql, SQL, type Column } from 'drizzle-orm';
import { SQLiteAsyncDialect, type SQLiteTable } from 'drizzle-orm/sqlite-core';
import type { InArgs, InStatement } from '@libsql/client';
import { backgroundWriter, client, db, type Tx } from '../../../db/client';
import { inWriteTurn } from '../../../db/write-gate';
import { CONNECTION_CACHE_KIB } from '../../../db/connection-settings';
import { device, job, jobRow, revision } from '../../../db/schema';
import { Conflict } from '../errors';
import { ENTITIES, entityOf } from '../records/entities';
import type { AnyEntity } from '../records/entity';
import { hiddenSearchRows, removeSearchRows, searchRowsOf } from '../vault/search';
import { nextTurn } from './turns';

/** Rows written per statement while staging (each its own short write). */
export const STAGE_BATCH = 500;
/** Rows shown (or moved) per statement in the final transaction, which yields to other requests between them. */
export const APPLY_BATCH = 500;
/**
 * Page cache of the final transaction's connection, in KiB (SQLite's default is 2,000 KiB). Showing the rows
 * moves their entries in several indexes keyed by random ids; with the default cache those pages are evicted
 * and read back again and again, which more than doubled the time the transaction holds the write lock. Not
 * larger either: the dirty pages a cache holds are all written at the commit, in one call that stops every other
 * request (64 MiB held 0.3 s of writing at the commit of a 50,000-row import); with 16 MiB the pages beyond it are
 * written a few at a time while the statements run, between which other requests get their turn.
 */
export const APPLY_CACHE_KIB = 16_384;
/** Rows removed (or moved after the commit) per statement. */
const CLEAR_BATCH = 500;

/** The versioned records a job may write out of sight, parents first. */
const RECORDS: AnyEntity[] = [...(Object.keys(ENTITIES) as (keyof typeof ENTITIES)[]).map(entityOf), entityOf('command')];
const recordOf = (table: SQLiteTable) => RECORDS.find((e) => e.table === table);
/** Tables whose rows a job writes in place, stamped with its id in `job_id` and shown by its state: its history. */
const JOB_STAMPED: SQLiteTable[] = [revision];
/**
 * History an earlier version staged in `job_row` and moved after the commit; a committed job's leftovers (its server
 * stopped during the move) are still moved by the sweep.
 */
const STAGED_AFTER_COMMIT: SQLiteTable[] = [revision];

interface Target {
  table: SQLiteTable;
  name: string;
  columns: [string, Column][];
  count: number;
  /** Set for a versioned record, written out of sight rather than staged. */
  record?: AnyEntity;
  /** Parents its rows live under that this job did not write itself (checked again in the final transaction). */
  outsideParents: Set<string>;
  /** Written in place with the job's id in `job_id` (its history), rather than staged. */
  jobStamped: boolean;
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
  if (typeof v === 'object' && is(v, SQL)) throw new Error(`staged column ${col.name}: SQL defaults are not supported`);
  return col.mapToDriverValue(v);
}

const dialect = new SQLiteAsyncDialect();
const toStatement = (q: SQL): InStatement => {
  const built = dialect.sqlToQuery(q);
  return { sql: built.sql, args: built.params as InArgs };
};
/**
 * One staged batch in one transaction: on the background writer's connection for a file, so SQLite's work on it runs
 * on another core (taking this process's write gate like any write), else through the client.
 */
function writeBatch(statements: InStatement[]): Promise<void> {
  const writer = backgroundWriter;
  if (!writer) return client.batch(statements).then(() => undefined);
  return inWriteTurn(client, () => writer.write(statements));
}

const quoteName = (name: string) => `"${name.replaceAll('"', '""')}"`;

/** The last insert text per table, with its row count. */
const insertTexts = new Map<string, { rows: number; text: string }>();
/**
 * `INSERT INTO table (columns) VALUES (?, …), …` for `rows` rows, its values given flat. The last text per table
 * is kept: a job writes hundreds of batches alike.
 */
function rawInsert(table: string, columns: string[], rows: number, args: unknown[]): InStatement {
  const last = insertTexts.get(table);
  let text = last?.rows === rows ? last.text : undefined;
  if (text === undefined) {
    const one = `(${columns.map(() => '?').join(', ')})`;
    text = `INSERT INTO ${quoteName(table)} (${columns.map(quoteName).join(', ')}) VALUES ${Array(rows).fill(one).join(', ')}`;
    insertTexts.set(table, { rows, text });
  }
  return { sql: text, args: args as InArgs };
}

const columnList = (t: Target) => sql.join(t.columns.map(([, col]) => sql.identifier(col.name)), sql`, `);
const fromStage = (t: Target) => sql.join(t.columns.map((_, i) => sql.raw(`json_extract(data, '$[${i}]')`)), sql`, `);

function targetOf(table: SQLiteTable, opts: { onConflict?: SQL } = {}): Target {
  const record = recordOf(table);
  return {
    table, name: getTableName(table), columns: Object.entries(getTableColumns(table)) as [string, Column][], count: 0,
    record, jobStamped: JOB_STAMPED.includes(table), onConflict: opts.onConflict, outsideParents: new Set(),
  };
}

export class Stage {
  private targets = new Map<string, Target>();
  /** Progress written with the next batch: input records checked, of the total. */
  private progress = { done: 0, total: 0 };
  private expected: number | null = null;
  /** The trash stamp that keeps the job's records out of sight until its final transaction. */
  private readonly hidden: { deletedAt: Date; deletedBy: string };
  /** Ids of the records this job wrote (parents are written before their children). */
  private readonly own = new Set<string>();

  /** The last batch handed to the writer (`addTogether` returns before it lands). */
  private inFlight: Promise<void> = Promise.resolve();

  constructor(readonly jobId: string, userId: string) {
    this.hidden = { deletedAt: new Date(), deletedBy: userId };
  }

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
    if (!this.targets.has(name)) this.targets.set(name, targetOf(table, opts));
  }

  get staged(): number {
    let n = 0;
    for (const t of this.targets.values()) n += t.count;
    return n;
  }

  /**
   * Writes rows (as they would be given to `db.insert(table).values(...)`), a batch at a time: versioned records
   * into their own table out of sight, other rows into the stage.
   */
  async add(table: SQLiteTable, rows: Record<string, unknown>[]): Promise<void> {
    for (let i = 0; i < rows.length; i += STAGE_BATCH) await this.addTogether([[table, rows.slice(i, i + STAGE_BATCH)]]);
  }

  /**
   * Writes the rows of several tables (parents first) in one short write, as `add` does for one: a few hundred
   * rows of each at most. A write's commit copies every page it changed to the log, and rows of related
   * tables written together share those pages' copies (a 10,000-row CSV import wrote 600 small commits).
   */
  async addTogether(parts: [SQLiteTable, Record<string, unknown>[]][]): Promise<void> {
    const writes: InStatement[] = [];
    for (const [table, rows] of parts) {
      this.target(table);
      const t = this.targets.get(getTableName(table))!;
      for (let i = 0; i < rows.length; i += STAGE_BATCH) writes.push(...this.writesOf(t, rows.slice(i, i + STAGE_BATCH)));
    }
    if (this.expected !== null) this.progress = { done: this.staged, total: this.expected };
    const statements = [
      ...writes,
      toStatement(sql`UPDATE job SET done = ${this.progress.done}, total = ${this.progress.total}, updated_at = ${Date.now()} WHERE id = ${this.jobId}`),
    ];
    // One batch in flight: it is written (on the worker's connection, for a file) while the caller builds the next.
    await this.inFlight;
    const landed = writeBatch(statements);
    landed.catch(() => undefined); // seen by the next write, `flush` or `discard`
    this.inFlight = landed;
    await nextTurn();
  }

  /** Waits for the batch still being written; throws if it failed. Called before the final transaction. */
  async flush(): Promise<void> {
    await this.inFlight;
  }

  /** The statements that write one batch of a target's rows (counted as staged). */
  private writesOf(t: Target, slice: Record<string, unknown>[]): InStatement[] {
    if (t.record) {
      const parentKey = t.record.parent?.field;
      for (const row of slice) {
        this.own.add(String(row.id));
        const parent = parentKey ? row[parentKey] : undefined;
        if (typeof parent === 'string' && !this.own.has(parent)) t.outsideParents.add(parent);
      }
    }
    // The insert's text and values are written directly: building it from drizzle's `sql` pieces, a piece per
    // value, cost more than SQLite's own work on it (1.2 s of a 10,000-row import).
    // Values go straight into one flat list (a copy of each row with the stamp, then a list per row, cost as much again).
    const args: unknown[] = [];
    if (t.record || t.jobStamped) {
      const stamped: Record<string, unknown> = t.record ? { ...this.hidden, trashId: this.jobId } : { jobId: this.jobId };
      for (const row of slice) for (const [key, col] of t.columns) args.push(driverValue(col, key in stamped ? stamped[key] : row[key]));
    } else {
      slice.forEach((row, k) => args.push(this.jobId, t.name, t.count + k, JSON.stringify(t.columns.map(([key, col]) => driverValue(col, row[key])))));
    }
    const write = t.record || t.jobStamped
      ? rawInsert(t.name, t.columns.map(([, col]) => col.name), slice.length, args)
      : rawInsert('job_row', ['job_id', 'target', 'seq', 'data'], slice.length, args);
    t.count += slice.length;
    // A device's search row goes in with it, so the final transaction need not write 50,000 of them.
    return t.table === device ? [write, toStatement(searchRowsOf(slice.map((row) => String(row.id))))] : [write];
  }

  /**
   * Inside the final transaction: refuses if a record's parent went to the trash meanwhile or a record was
   * removed with its parent; shows the job's records, parents first; moves the staged rows that belong in it.
   * Other requests are answered between its statements.
   */
  async apply(tx: Tx): Promise<void> {
    await tx.run(sql.raw(`PRAGMA cache_size = -${APPLY_CACHE_KIB}`));
    const records = [...this.targets.values()].filter((t) => t.record);
    for (const t of records) await this.refuseTrashedParent(tx, t);
    for (const t of records) {
      let shown = 0;
      for (;;) {
        const res = await tx.run(sql`UPDATE ${sql.identifier(t.name)} SET deleted_at = NULL, deleted_by = NULL, trash_id = NULL
          WHERE rowid IN (SELECT rowid FROM ${sql.identifier(t.name)} WHERE trash_id = ${this.jobId} LIMIT ${APPLY_BATCH})`);
        shown += res.rowsAffected;
        await nextTurn();
        if (res.rowsAffected < APPLY_BATCH) break;
      }
      if (shown !== t.count) {
        throw new Conflict(`Some ${t.record!.noun}s this import was adding were removed meanwhile, with a record they belong to; nothing was imported. Import again.`);
      }
    }
    for (const t of this.targets.values()) {
      if (!t.record && !t.jobStamped) await moveStaged(tx, this.jobId, t);
    }
  }

  /** Refuses when a parent the job's records live under (one it did not write) was moved to the trash meanwhile. */
  private async refuseTrashedParent(tx: Tx, t: Target): Promise<void> {
    const parent = t.record!.parent;
    if (!parent || t.outsideParents.size === 0) return;
    const p = entityOf(parent.type);
    const ids = [...t.outsideParents];
    for (let lo = 0; lo < ids.length; lo += APPLY_BATCH) {
      const [hit] = await tx.all<{ id: string }>(sql`SELECT id FROM ${sql.identifier(getTableName(p.table))}
        WHERE id IN (${sql.join(ids.slice(lo, lo + APPLY_BATCH).map((id) => sql`${id}`), sql`, `)}) AND deleted_at IS NOT NULL LIMIT 1`);
      if (hit) throw new Conflict(`A ${p.noun} this import adds ${t.record!.noun}s to was moved to the trash meanwhile; nothing was imported. Restore it, or import into another ${p.noun}.`);
    }
  }

  /** Last in the final transaction, whatever happened: the connection goes back to the pool with the app's page cache. */
  async restoreCache(tx: Tx): Promise<void> {
    await tx.run(sql.raw(`PRAGMA cache_size = -${CONNECTION_CACHE_KIB}`)).catch(() => undefined);
  }

  /** After the commit: the stage's rows (moved in the final transaction) are removed. */
  async afterCommit(): Promise<void> {
    await finishAfterCommit(this.jobId);
  }

  /** After a failure: what the job wrote out of sight, and its stage, removed a batch per statement. */
  async discard(): Promise<void> {
    await this.inFlight.catch(() => undefined);
    await discardJob(this.jobId);
  }
}

const stagedRange = (jobId: string, t: Target, lo: number) => sql`job_id = ${jobId} AND target = ${t.name} AND seq >= ${lo} AND seq < ${lo + APPLY_BATCH}`;
// `WHERE` is required before an upsert clause on INSERT … SELECT; it is there anyway.
const moveRange = (jobId: string, t: Target, lo: number) => sql`INSERT INTO ${sql.identifier(t.name)} (${columnList(t)}) SELECT ${fromStage(t)} FROM job_row
  WHERE ${stagedRange(jobId, t, lo)} ORDER BY seq ${t.onConflict ?? sql``}`;

/** Inside the final transaction: every staged row of a target into its table (the stage is cleared after the commit). */
async function moveStaged(tx: Tx, jobId: string, t: Target): Promise<void> {
  for (let lo = 0; lo < t.count; lo += APPLY_BATCH) {
    await tx.run(moveRange(jobId, t, lo));
    await nextTurn();
  }
}

/**
 * After the commit: a target's staged rows into its table, each batch in its own short transaction that also
 * removes it from the stage, so a move cut short (the server stopped) resumes where it was.
 */
async function moveStagedAfterCommit(jobId: string, t: Target): Promise<void> {
  for (;;) {
    const [first] = await db.all<{ lo: number | null }>(sql`SELECT min(seq) AS lo FROM job_row WHERE job_id = ${jobId} AND target = ${t.name}`);
    const lo = first?.lo;
    if (lo === null || lo === undefined) return;
    await db.batch([db.run(moveRange(jobId, t, lo)), db.run(sql`DELETE FROM job_row WHERE ${stagedRange(jobId, t, lo)}`)]);
    await nextTurn();
  }
}

/** A committed job's stage goes; history an earlier version left staged there (its server stopped) is moved first. */
export async function finishAfterCommit(jobId: string): Promise<void> {
  for (const table of STAGED_AFTER_COMMIT) await moveStagedAfterCommit(jobId, targetOf(table));
  await clearStaged(jobId);
}

/** Removes what a job that did not commit wrote out of sight (its history, its records, children first) and its stage. */
export async function discardJob(jobId: string): Promise<void> {
  // Its history first. It was written after the job began, so it is found on the team's history index from the
  // job's start: bounded by what the team wrote since, and found even where its records are gone already (a purge
  // of their parent during the import cascades to them).
  const [started] = await db.all<{ teamId: string; createdAt: number }>(sql`SELECT team_id AS teamId, created_at AS createdAt FROM job WHERE id = ${jobId}`);
  if (started) {
    for (;;) {
      const res = await db.run(sql`DELETE FROM revision WHERE rowid IN (SELECT rowid FROM revision
        WHERE team_id = ${started.teamId} AND created_at >= ${Number(started.createdAt)} AND job_id = ${jobId} LIMIT ${CLEAR_BATCH})`);
      if (res.rowsAffected < CLEAR_BATCH) break;
      await nextTurn();
    }
  }
  // Then the search rows of its devices (found while the devices are still there).
  const searchRows = await hiddenSearchRows(jobId);
  for (let lo = 0; lo < searchRows.length; lo += CLEAR_BATCH) {
    await db.run(removeSearchRows(searchRows.slice(lo, lo + CLEAR_BATCH)));
    await nextTurn();
  }
  for (const e of [...RECORDS].reverse()) {
    for (;;) {
      const name = sql.identifier(getTableName(e.table));
      const res = await db.run(sql`DELETE FROM ${name} WHERE rowid IN (SELECT rowid FROM ${name} WHERE trash_id = ${jobId} LIMIT ${CLEAR_BATCH})`);
      if (res.rowsAffected < CLEAR_BATCH) break;
      await nextTurn();
    }
  }
  await clearStaged(jobId);
}

/** Ids of jobs that still have records out of sight (a job's id is their trash stamp; their history goes with them). */
export async function jobsWithHiddenRecords(): Promise<string[]> {
  const ids = new Set<string>();
  for (const e of RECORDS) {
    const name = sql.identifier(getTableName(e.table));
    const rows = await db.all<{ id: string }>(sql`SELECT DISTINCT trash_id AS id FROM ${name} WHERE trash_id IS NOT NULL AND trash_id LIKE 'job\\_%' ESCAPE '\\'`);
    rows.forEach((r) => ids.add(r.id));
  }
  return [...ids];
}

export async function clearStaged(jobId: string): Promise<void> {
  for (;;) {
    const res = await db.run(sql`DELETE FROM job_row WHERE rowid IN (SELECT rowid FROM job_row WHERE job_id = ${jobId} LIMIT ${CLEAR_BATCH})`);
    if (res.rowsAffected < CLEAR_BATCH) return;
    await nextTurn();
  }
}
