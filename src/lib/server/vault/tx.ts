/** Write transactions for the vault, queued one at a time inside this server process. */
import { db, type Tx } from '../../../db/client';

let tail: Promise<unknown> = Promise.resolve();

/**
 * Runs `fn` in one database transaction (BEGIN IMMEDIATE), after every earlier vault write of
 * this process has finished.
 *
 * libSQL gives each open transaction its own connection and its driver calls are synchronous:
 * a second connection waiting on SQLite's busy lock blocks the event loop, so the first one can
 * never commit and both fail after the 5 s busy timeout. Queueing writers here avoids that;
 * writers in other processes still wait on the busy timeout as usual.
 */
export function writeTx<T>(fn: (tx: Tx) => Promise<T>): Promise<T> {
  const run = tail.then(() => db.transaction(fn));
  tail = run.catch(() => undefined);
  return run;
}
