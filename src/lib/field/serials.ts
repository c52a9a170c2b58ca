/** A unit's serial numbers over time: the one a device's record holds now and the ones it held before. */

/**
 * The earlier serial numbers after the record's serial changes from `before.serialNumber` to `next`: the old one
 * joins the end of the list (once), and `next` leaves it if the unit goes back to an earlier number. Null when
 * the list stays as it is (`next` undefined or unchanged).
 */
export function formerSerialsAfter(before: { serialNumber: string; formerSerials: readonly string[] }, next: string | undefined): string[] | null {
  if (next === undefined || next === before.serialNumber) return null;
  const kept = before.formerSerials.filter((s) => s !== next && s !== before.serialNumber);
  const after = before.serialNumber ? [...kept, before.serialNumber] : kept;
  const same = after.length === before.formerSerials.length && after.every((s, i) => s === before.formerSerials[i]);
  return same ? null : after;
}
