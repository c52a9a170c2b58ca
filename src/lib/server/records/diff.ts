/** Field-level differences between two snapshots of a record, as stored in revisions. */
import type { FieldChange } from '../../../db/schema';

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function same(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  return JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
}

/**
 * Changes from `before` to `after`: nested objects (port settings, frame rules) are compared
 * field by field with dotted names (`settings.baud`); arrays and scalars as a whole.
 */
export function diffSnapshots(before: Record<string, unknown>, after: Record<string, unknown>, prefix = ''): FieldChange[] {
  const out: FieldChange[] = [];
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
  for (const key of keys) {
    const a = before[key];
    const b = after[key];
    const field = prefix + key;
    if (isPlainObject(a) && isPlainObject(b)) out.push(...diffSnapshots(a, b, `${field}.`));
    else if (!same(a, b)) out.push({ field, from: a ?? null, to: b ?? null });
  }
  return out;
}

/**
 * `diffSnapshots({}, after)` without comparing each value's JSON with nothing: every field set to a value that is
 * not null (by its JSON: NaN counts as null, as it is stored), from null. Imports build thousands of these.
 */
export function changesFromNothing(after: Record<string, unknown>): FieldChange[] {
  const out: FieldChange[] = [];
  for (const [field, b] of Object.entries(after)) {
    if (b === undefined || b === null || (typeof b === 'number' && !Number.isFinite(b))) continue;
    const plain = typeof b === 'string' || typeof b === 'number' || typeof b === 'boolean' || Array.isArray(b)
      || (typeof b === 'object' && [Object.prototype, null].includes(Object.getPrototypeOf(b)));
    // Anything else (a date, a value with its own JSON) is compared as before.
    if (!plain) return diffSnapshots({}, after);
    out.push({ field, from: null, to: b });
  }
  return out;
}

/** The keys of `patch` that are present (PATCH semantics: absent means unchanged). */
export function definedOnly<T extends Record<string, unknown>>(patch: T): Partial<T> {
  const out: Partial<T> = {};
  for (const [k, v] of Object.entries(patch)) if (v !== undefined) (out as Record<string, unknown>)[k] = v;
  return out;
}
