/**
 * The named errors services throw. They say what went wrong, in words for the user, and carry the details a
 * client needs (`fields`, `current`, `missing`, …); they know nothing of HTTP. `httpStatus` in ./http.ts maps
 * each to its status, in one place, and `route()` turns them into JSON answers `{ error, ...details }`.
 */

export class AppError extends Error {
  constructor(
    message: string,
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** A record that is not there for this caller (missing, another team's, or in the trash). */
export class NotFound extends AppError {}

/** The record changed since the caller read it: `current` is the record as it is now. */
export class Stale extends AppError {
  constructor(message: string, current: unknown) {
    super(message, { current });
  }
}

/** A unique name (tag, port name, …) already taken: a field message under `fields[field]`. */
export class Duplicate extends AppError {
  constructor(
    readonly field: string,
    message: string,
    fieldMessage: string,
  ) {
    super(message, { fields: { [field]: fieldMessage } });
  }
}

/** What a record would point at is in the trash or purged: `missing` lists each reference. */
export class ReferenceMissing extends AppError {
  constructor(
    message: string,
    readonly missing: readonly unknown[],
  ) {
    super(message, { missing });
  }
}

/** The state of things refuses the request (in the trash, a name clash on restore, a used link, …). */
export class Conflict extends AppError {}

/** Bad input: `fields` (when given) maps each field to its message. */
export class Invalid extends AppError {}

/** Not signed in. */
export class Unauthenticated extends AppError {}

/** Signed in, but the role (or the rule) does not allow it. */
export class Forbidden extends AppError {}

/** It was there and is not any more (a used or expired invitation). */
export class Gone extends AppError {}

/** The body is larger than allowed. */
export class TooLarge extends AppError {}

/** The body comes in a kind the endpoint does not read. */
export class Unsupported extends AppError {}

/** The request itself cannot be read. */
export class BadRequest extends AppError {}

/** `No device with that id in this team.` — the one wording of a team-scoped lookup that found nothing. */
export function notFound(noun: string, where = 'in this team'): NotFound {
  return new NotFound(`No ${noun} with that id ${where}.`);
}

// ---- SQLite constraint failures, recognised by their result code, never by message text ----

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

/** `err` as a Duplicate when a unique index refused the write; any other error unchanged. */
export function duplicateFrom(err: unknown, field: string, message: string, fieldMessage: string): unknown {
  return isUniqueViolation(err) ? new Duplicate(field, message, fieldMessage) : err;
}
