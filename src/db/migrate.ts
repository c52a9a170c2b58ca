import { migrate } from 'drizzle-orm/libsql/migrator';
import { config } from '../config';
import { client, databaseUrl, db } from './client';
import { startCheckpointer } from './checkpointer';

let ready: Promise<void> | null = null;

/**
 * Applies pending migrations once per process; WAL for a file database (libSQL turns foreign keys on for every
 * connection). The app server (`{ checkpointer: true }`) runs the log's checkpoints from a worker thread
 * (src/db/checkpointer.ts); a script (seed, migrate, benchmark) does not start one, so it exits when done, and
 * SQLite checkpoints the log when its last connection closes.
 */
export function ensureDatabase(options: { checkpointer?: boolean } = {}): Promise<void> {
  ready ??= (async () => {
    if (databaseUrl.startsWith('file:')) {
      await client.execute('PRAGMA journal_mode = WAL');
      const path = databaseUrl.slice('file:'.length);
      if (options.checkpointer && path && path !== ':memory:') startCheckpointer(path);
    }
    await migrate(db, { migrationsFolder: config.migrationsDir });
  })();
  return ready;
}
