import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { createClient, type Client } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { config } from '../config';
import * as schema from './schema';
import { gateWrites } from './write-gate';
import { cacheStatements } from './statement-cache';
import { configureConnections } from './connection-settings';
import { startBackgroundWriter, type BackgroundWriter } from './background-writer';

function openClient(url: string): Client {
  if (url.startsWith('file:')) {
    const path = url.slice('file:'.length);
    if (path && path !== ':memory:') mkdirSync(dirname(resolve(path)), { recursive: true });
  }
  cacheStatements();
  // Per-connection settings for a local file: no fsync at commit, checkpoints off the main thread.
  if (url.startsWith('file:')) configureConnections();
  // `timeout` is SQLite's busy timeout in ms: writers in other processes wait instead of failing with SQLITE_BUSY.
  const raw = createClient({ url, authToken: config.databaseAuthToken, timeout: 5000 });
  return url.startsWith('file:') ? gateWrites(raw) : raw;
}

/** DATABASE_URL: a SQLite file (default `file:./data/baudbook.db`) or a libSQL server. */
export const databaseUrl = config.databaseUrl;
export const client = openClient(databaseUrl);
export const db = drizzle(client, { schema });
export type Db = typeof db;
/** A transaction handle, accepted wherever `db` is. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;

/**
 * For a SQLite file: a connection on a worker thread for the long jobs' staged batches (src/db/background-writer.ts),
 * its worker started on the first write. None for a libSQL server or an in-memory database, whose batches go
 * through `client`.
 */
export const backgroundWriter: BackgroundWriter | null = (() => {
  if (!databaseUrl.startsWith('file:')) return null;
  const path = databaseUrl.slice('file:'.length);
  return path && path !== ':memory:' ? startBackgroundWriter(resolve(path)) : null;
})();
