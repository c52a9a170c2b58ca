import Database from 'libsql';

/** How many statements each connection keeps prepared. */
export const STATEMENT_CACHE_SIZE = 256;

// Only handed back to the client, never used here.
type Statement = object;
const caches = new WeakMap<object, Map<string, Statement>>();
let installed = false;


/**
 * Keeps each local connection's statements prepared, least recently used dropped first.
 *
 * `@libsql/client` prepares every statement afresh on every call. For the vault's larger reads (the device page,
 * the session lookup) compiling the SQL took a fifth of the request's time; for an import's multi-row inserts
 * (a hundred rows of a table with a dozen indexes and a search trigger, one program for all of them) it took
 * longer than SQLite's writing of the rows. SQLite statements are reusable by design: the client binds and runs
 * every row out (a write runs to its end, a read returns all its rows), which resets the statement each time;
 * a statement that failed is reset by its next run; and SQLite re-prepares a cached statement by itself after a
 * schema change. Each connection (the client's and each transaction's) has a cache of its own, dropped with the
 * connection. SQLite keeps the values last bound to a statement until its next run, so a cached import insert
 * holds one batch of rows (under a megabyte) until the text is used again or dropped.
 */
export function cacheStatements(): void {
  if (installed) return;
  installed = true;
  const proto = Database.prototype as unknown as { prepare(this: object, sql: string): Statement };
  const prepare = proto.prepare;
  proto.prepare = function cachedPrepare(this: object, sql: string): Statement {
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
