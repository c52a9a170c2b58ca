import { createRequire } from 'node:module';
import { Worker } from 'node:worker_threads';

/** How often the worker copies the write-ahead log into the database file. */
export const CHECKPOINT_EVERY_MS = 1000;

/**
 * The worker: its own connection to the file, a PASSIVE checkpoint every so often. A passive checkpoint takes no
 * write lock and waits for no one: it copies what no reader still needs and leaves the rest for the next round,
 * so the app's readers and its one writer carry on meanwhile. (Eval'd as CommonJS: the driver's path is given.)
 */
const WORKER = `
const { parentPort, workerData } = require('node:worker_threads');
const Database = require(workerData.driver);
const db = new Database(workerData.path, { timeout: 0 });
const checkpoint = () => {
  try {
    db.prepare('PRAGMA wal_checkpoint(PASSIVE)').all();
  } catch (err) {
    // SQLITE_BUSY (another checkpoint running, e.g. a second process): the next round tries again.
    if (!/BUSY|LOCKED/i.test(String(err && err.code) + String(err && err.message))) parentPort.postMessage({ error: String(err && err.message || err) });
  }
};
const timer = setInterval(checkpoint, workerData.everyMs);
parentPort.on('message', (m) => {
  if (m === 'checkpoint') checkpoint();
  if (m === 'stop') { clearInterval(timer); checkpoint(); db.close(); parentPort.close(); }
});
`;

export interface Checkpointer {
  /** Asks for a checkpoint now (it still runs on the worker). */
  nudge(): void;
  stop(): Promise<void>;
}

/**
 * Checkpoints the WAL of the database file at `path` from a worker thread, so the copy of the log into the
 * database file (and its fsync) never runs on the main thread, where it would stall every request. The app's
 * connections have automatic checkpoints turned off (src/db/connection-settings.ts). A worker that stops is
 * started again, so the log cannot grow without bound unnoticed.
 */
export function startCheckpointer(path: string, everyMs = CHECKPOINT_EVERY_MS): Checkpointer {
  const driver = createRequire(import.meta.url).resolve('libsql');
  let worker: Worker | null = null;
  let stopped = false;
  const start = () => {
    const w = new Worker(WORKER, { eval: true, workerData: { driver, path, everyMs } });
    w.unref();
    w.on('message', (m: { error?: string }) => {
      if (m?.error) console.error(`WAL checkpoint failed: ${m.error}`);
    });
    w.on('error', (err) => console.error('WAL checkpointer stopped on an error:', err));
    w.on('exit', () => {
      if (worker === w) worker = null;
      if (!stopped) setTimeout(start, everyMs).unref();
    });
    worker = w;
  };
  start();
  return {
    nudge: () => worker?.postMessage('checkpoint'),
    async stop() {
      stopped = true;
      const w = worker;
      if (!w) return;
      const exited = new Promise((resolve) => w.once('exit', resolve));
      w.postMessage('stop');
      await exited;
    },
  };
}
