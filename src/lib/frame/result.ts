/** Where and why a text input could not be read. `position` is a 0-based character offset into the input. */
export interface ParseError {
  position: number;
  message: string;
}

/** Outcome of an operation that can fail on malformed input; never thrown. */
export type Result<T> = { ok: true; value: T } | { ok: false; error: ParseError };

export function success<T>(value: T): Result<T> {
  return { ok: true, value };
}

export function failure<T = never>(position: number, message: string): Result<T> {
  return { ok: false, error: { position, message } };
}
