/**
 * A record as its history compares it, for the conflict notice of a restore: the fields a revision keeps (its
 * snapshot), never the row's version, dates or who saved it; named as the history list names them.
 */
import { showValue } from '../../lib/client/conflict';
import { fieldLabel } from './shared';
import { portPartLabel, portPartValue } from './port-parts';

export type Snapshot = Record<string, unknown>;

/** Turns a record (or a snapshot) into the fields `like`, a snapshot of the same record, holds. */
export function snapshotShape(like: Snapshot): (value: Snapshot) => Snapshot {
  const keys = Object.keys(like);
  return (value) => Object.fromEntries(keys.map((k) => [k, value[k]]));
}

/** A part's name: a port's in the port form's words, other records' by field (as the history's table has them). */
export function revisionPartLabel(type: string, path: readonly string[]): string {
  return type === 'port' ? portPartLabel(path) : fieldLabel(path.join('.'));
}

export function revisionPartValue(type: string, path: readonly string[], value: unknown): string {
  return (type === 'port' ? portPartValue(path, value) : undefined) ?? showValue(value);
}
