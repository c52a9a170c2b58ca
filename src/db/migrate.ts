import { resolve } from 'node:path';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { client, databaseUrl, db } from './client';
import { startCheckpointer } from './checkpointer';

/** Folder of generated migrations; relative to the working directory unless MIGRATIONS_DIR is set. */
const migrationsFolder = resolve(process.env.MIGRATIONS_DIR ?? 'drizzle');

let ready: Promise<void> | null = null;

/**
 * Applies pending migrations once per process; WAL for a file database (libSQL turns foreign keys on for every
 * connection), with its checkpoints run from a worker thread (src/db/checkpointer.ts).
 */
export function ensureDatabase(): Promise<void> {
  ready ??= (async () => {
    if (databaseUrl.startsWith('file:')) {
      await client.execute('PRAGMA journal_mode = WAL');
      const path = databaseUrl.slice('file:'.length);
      if (path && path !== ':memory:') startCheckpointer(path);
    }
    await migrate(db, { migrationsFolder });
  })();
  return ready;
}
