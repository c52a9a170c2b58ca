import Database from 'libsql';
import { isReadSql } from './read-sql';

/** How many read statements each connection keeps prepared. */
export const STATEMENT_CACHE_SIZE = 256;

// Only handed back to the client, never used here.
type Statement = object;
const caches = new WeakMap<object, Map<string, Statement>>();
let installed = false;


/**
 * Keeps each local connection's read statements prepared, least recently used dropped first.
 *
 * `@libsql/client` prepares every statement afresh on every call; for the vault's larger reads
 * (the device page, the session lookup) compiling the SQL took a fifth of the request's time.
 * SQLite statements are reusable by design: the client binds, runs every row out and so resets
 * the statement each time, and SQLite re-prepares a cached statement by itself after a schema
 * change. Writes are left alone. Each connection (the client's and each transaction's) has a
 * cache of its own, dropped with the connection.
 */
export function cacheReadStatements(): void {
  if (installed) return;
  installed = true;
  const proto = Database.prototype as unknown as { prepare(this: object, sql: string): Statement };
  const prepare = proto.prepare;
  proto.prepare = function cachedPrepare(this: object, sql: string): Statement {
    if (!isReadSql(sql)) return prepare.call(this, sql);
    let cache = caches.get(this);
    if (!cache) caches.set(this, (cache = new Map()));
    const hit = cache.get(sql);
    if (hit) {
      cache.delete(sql); // most recently used last
      cache.set(sql, hit);
      return hit;
    }
    const stmt = prepare.call(this, sql);
    cache.set(sql, stmt);
    if (cache.size > STATEMENT_CACHE_SIZE) cache.delete(cache.keys().next().value!);
    return stmt;
  };
}
