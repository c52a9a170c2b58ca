/** Helpers for vault pages, which call services directly. */
import { HttpError } from '../http';

/** The record, or null when the service answers 404 (the page then shows "not found" with status 404). */
export async function orNotFound<T>(load: () => Promise<T>): Promise<T | null> {
  try {
    return await load();
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) return null;
    throw err;
  }
}
