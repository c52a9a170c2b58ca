import Database from 'libsql';

/**
 * Settings every connection to the app's local database file needs: libSQL's local client opens connections
 * as it needs them (one held by each open transaction, others for what runs meanwhile), and both settings
 * belong to a connection, not to the file.
 *
 * - `synchronous = NORMAL`: in WAL mode a commit no longer waits for the log to reach the disk; the log is
 *   synced when it is checkpointed. The database stays consistent whatever happens, and a crash of the app
 *   (even kill -9) loses nothing; only a power loss or an OS crash can lose the last commits before the next
 *   checkpoint (docs/decisions/008-long-jobs-in-batches.md).
 * - `wal_autocheckpoint = 0`: a commit never copies the log into the database file on the committing (main)
 *   thread; the checkpointer (src/db/checkpointer.ts) does it from a worker thread.
 * - `cache_size`: a page cache of CONNECTION_CACHE_KIB (SQLite's default is 2 MB). A page of a large team's list
 *   or search touches rows spread over the tables; with the small cache each is read from the operating system
 *   again (docs/performance.md). It is an upper bound, filled only as pages are read.
 */
export const CONNECTION_CACHE_KIB = 32 * 1024;
export const CONNECTION_PRAGMAS = ['PRAGMA synchronous = NORMAL', 'PRAGMA wal_autocheckpoint = 0', `PRAGMA cache_size = -${CONNECTION_CACHE_KIB}`] as const;

const configured = new WeakSet<object>();
let installed = false;

/**
 * Applies CONNECTION_PRAGMAS to every local connection of this process before its first statement (so before
 * any BEGIN: the safety level cannot change inside a transaction). Hooked where the statement cache is, on the
 * driver's `prepare`, which every statement of the client goes through; a connection opened later (for a
 * transaction, or after a reconnect) is set up the same way.
 */
export function configureConnections(): void {
  if (installed) return;
  installed = true;
  const proto = Database.prototype as unknown as { prepare(this: object, sql: string): unknown; exec(this: object, sql: string): unknown };
  const prepare = proto.prepare;
  proto.prepare = function configuredPrepare(this: object, sql: string): unknown {
    if (!configured.has(this)) {
      configured.add(this);
      for (const pragma of CONNECTION_PRAGMAS) proto.exec.call(this, pragma);
    }
    return prepare.call(this, sql);
  };
}
