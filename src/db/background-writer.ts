import { createRequire } from 'node:module';
import { Worker } from 'node:worker_threads';
import type { InStatement } from '@libsql/client';
import { CONNECTION_PRAGMAS } from './connection-settings';

/**
 * The worker: its own connection to the file, with the app's connection settings. Each message is a list of
 * statements run in one transaction (all or none); the statements are prepared once per text (the last 32 kept). It may wait on
 * SQLite's busy timeout: it is not the thread that answers requests. (Eval'd as CommonJS: the driver's path is given.)
 */
const WORKER = `
const { parentPort, workerData } = require('node:worker_threads');
const Database = require(workerData.driver);
const db = new Database(workerData.path, { timeout: workerData.busyMs });
for (const pragma of workerData.pragmas) db.exec(pragma);
const prepared = new Map();
const bound = (v) => (v === undefined ? null : typeof v === 'boolean' ? (v ? 1 : 0) : v);
parentPort.on('message', ({ id, statements }) => {
  try {
    db.exec('BEGIN IMMEDIATE');
    for (const s of statements) {
      let st = prepared.get(s.sql);
      if (st) prepared.delete(s.sql);
      else st = db.prepare(s.sql);
      // The most recently used texts only (a batch's last insert has a row count of its own).
      prepared.set(s.sql, st);
      if (prepared.size > workerData.keep) prepared.delete(prepared.keys().next().value);
      st.run((s.args || []).map(bound));
    }
    db.exec('COMMIT');
    parentPort.postMessage({ id });
  } catch (err) {
    try { if (db.inTransaction) db.exec('ROLLBACK'); } catch {}
    parentPort.postMessage({ id, error: { message: String((err && err.message) || err), code: err && err.code } });
  }
});
`;

/** Prepared statements the worker keeps (least recently used go first). */
const KEPT_STATEMENTS = 32;

export interface BackgroundWriter {
  /** Runs the statements in one transaction on the worker's connection; settles when it has committed (or failed, all undone). */
  write(statements: InStatement[]): Promise<void>;
  stop(): Promise<void>;
}

/** Positional arguments only: what the long jobs' writes use. */
function plain(s: InStatement): { sql: string; args: unknown[] } {
  if (typeof s === 'string') return { sql: s, args: [] };
  if (s.args !== undefined && !Array.isArray(s.args)) throw new Error('background writes take positional arguments only');
  return { sql: s.sql, args: (s.args ?? []) as unknown[] };
}

/**
 * Writes to the database file at `path` from a worker thread (docs/decisions/018-staged-writes-off-the-main-thread.md).
 * SQLite's work on a long job's staged batch (its rows, their indexes, the search rows) then runs on the other core
 * while this thread builds the next batch and answers requests. The caller takes the process's write gate around
 * each write, as for any other. A worker that stops fails what it was given and is started again on the next write.
 */
export function startBackgroundWriter(path: string, busyMs = 5000): BackgroundWriter {
  const driver = createRequire(import.meta.url).resolve('libsql');
  let worker: Worker | null = null;
  let next = 0;
  const waiting = new Map<number, { resolve(): void; reject(err: Error): void }>();
  const failAll = (err: Error) => {
    for (const w of waiting.values()) w.reject(err);
    waiting.clear();
  };
  const started = () => {
    if (worker) return worker;
    const w = new Worker(WORKER, { eval: true, workerData: { driver, path, busyMs, keep: KEPT_STATEMENTS, pragmas: [...CONNECTION_PRAGMAS] } });
    w.unref();
    w.on('message', (m: { id: number; error?: { message: string; code?: string } }) => {
      const entry = waiting.get(m.id);
      if (!entry) return;
      waiting.delete(m.id);
      if (waiting.size === 0) w.unref();
      if (m.error) entry.reject(Object.assign(new Error(m.error.message), { code: m.error.code }));
      else entry.resolve();
    });
    w.on('error', (err) => {
      if (worker === w) worker = null;
      failAll(err);
    });
    w.on('exit', (code) => {
      if (worker === w) worker = null;
      failAll(new Error(`the background writer stopped (exit code ${code})`));
    });
    worker = w;
    return w;
  };
  return {
    write(statements) {
      let sent: { sql: string; args: unknown[] }[];
      try {
        sent = statements.map(plain);
      } catch (err) {
        return Promise.reject(err);
      }
      const w = started();
      const id = next++;
      return new Promise<void>((resolve, reject) => {
        waiting.set(id, { resolve, reject });
        // Held open while a write is under way (a script must not exit before it lands), let go when idle.
        w.ref();
        w.postMessage({ id, statements: sent });
      });
    },
    async stop() {
      const w = worker;
      worker = null;
      if (w) await w.terminate();
    },
  };
}
