/**
 * Statements whose text depends only on their shape (an order, which filters, how many words) and whose values are
 * parameters: the text is built by drizzle once per shape, with placeholders where the values go, and the values are
 * filled in per request. Building a large statement from drizzle's pieces, a piece per value, took longer than
 * SQLite's reading of a page of the device list. No database access here (the benchmark's baseline imports it too).
 */
import { fillPlaceholders, type SQL } from 'drizzle-orm';
import { SQLiteSyncDialect } from 'drizzle-orm/sqlite-core';
import type { InArgs } from '@libsql/client';

const dialect = new SQLiteSyncDialect();

export class ShapedStatements<K> {
  private readonly built = new Map<K, { sql: string; params: unknown[] }>();

  /** The statement of shape `key` (built by `withPlaceholders` the first time) with `values` for its placeholders. */
  query(key: K, withPlaceholders: () => SQL, values: Record<string, unknown>): { sql: string; args: InArgs } {
    let b = this.built.get(key);
    if (!b) {
      const q = dialect.sqlToQuery(withPlaceholders());
      b = { sql: q.sql, params: q.params };
      this.built.set(key, b);
    }
    return { sql: b.sql, args: fillPlaceholders(b.params, values) as InArgs };
  }
}
