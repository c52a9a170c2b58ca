/** SQLite constraint failures recognised by their result code, never by message text. */

/**
 * SQLite's extended result code of a failed statement (`SQLITE_CONSTRAINT_UNIQUE`, …), looked up along the
 * error's causes: drizzle wraps libSQL's error, which wraps the driver's.
 */
export function sqliteCode(err: unknown): string | undefined {
  for (let e = err as { extendedCode?: unknown; code?: unknown; cause?: unknown } | undefined, depth = 0; e && depth < 5; e = e.cause as typeof e, depth++) {
    if (typeof e.extendedCode === 'string' && e.extendedCode.startsWith('SQLITE_')) return e.extendedCode;
    if (typeof e.code === 'string' && e.code.startsWith('SQLITE_CONSTRAINT_')) return e.code;
  }
  return undefined;
}

/** A unique index refused the write (a primary key clash is `SQLITE_CONSTRAINT_PRIMARYKEY`, not this). */
export const isUniqueViolation = (err: unknown) => sqliteCode(err) === 'SQLITE_CONSTRAINT_UNIQUE';
