/**
 * The one conflict path of every edit form (docs/decisions/003). A save answers 409 with the record as it is now
 * ("theirs"); the form holds what it opened ("base") and what the user made of it ("mine"). All three are
 * compared as *shapes*: plain objects whose leaves are the values the form edits (arrays and primitives are
 * leaves; lists edited item by item are turned into objects keyed by a stable id with `keyed`). From them:
 * which paths each side changed, one row per changed part for the notice, and "theirs with only my changes
 * laid over it" — the value the re-apply sends, with their version.
 *
 * Pure: no React, no fetch. Paths are arrays of keys, so ids containing dots stay whole.
 */

export type Path = readonly string[];
type Obj = Record<string, unknown>;

const isObj = (v: unknown): v is Obj => !!v && typeof v === 'object' && !Array.isArray(v);

/** Deep equality of JSON-like values; a missing key equals `undefined`. */
export function same(a: unknown, b: unknown): boolean {
  if (Object.is(a, b)) return true;
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((x, i) => same(x, b[i]));
  if (isObj(a) && isObj(b)) {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const k of keys) if (!same(a[k], b[k])) return false;
    return true;
  }
  return false;
}

export function getAt(value: unknown, path: Path): unknown {
  let v = value;
  for (const k of path) v = isObj(v) ? v[k] : undefined;
  return v;
}

/** A copy of `value` with `path` set (created as objects on the way); `undefined` removes the key. */
export function setAt<T>(value: T, path: Path, next: unknown): T {
  if (path.length === 0) return next as T;
  const [k, ...rest] = path as [string, ...string[]];
  const copy: Obj = isObj(value) ? { ...value } : {};
  const child = setAt(copy[k], rest, next);
  if (child === undefined) delete copy[k];
  else copy[k] = child;
  return copy as T;
}

/** Says which objects are compared whole (a composer segment), at the level the form edits them. */
export type IsLeaf = (path: Path) => boolean;

/** Leaf paths where `to` differs from `from`. Where one side is not an object the whole value is one leaf. */
export function changedPaths(from: unknown, to: unknown, isLeaf: IsLeaf = () => false, prefix: string[] = []): string[][] {
  if (isObj(from) && isObj(to) && !isLeaf(prefix)) {
    const keys = new Set([...Object.keys(from), ...Object.keys(to)]);
    return [...keys].flatMap((k) => changedPaths(from[k], to[k], isLeaf, [...prefix, k]));
  }
  return same(from, to) ? [] : [prefix];
}

const startsWith = (p: Path, q: Path) => q.length <= p.length && q.every((k, i) => p[i] === k);
const overlaps = (p: Path, q: Path) => startsWith(p, q) || startsWith(q, p);

export interface ConflictRow {
  /** The part compared: the shorter of two overlapping changed paths, so a removed item is one row. */
  path: string[];
  /** As the form opened it. */
  base: unknown;
  /** As saved now by the other person. */
  theirs: unknown;
  /** As the user has it. */
  mine: unknown;
  theirsChanged: boolean;
  mineChanged: boolean;
  /** Both changed this part, to different values: re-applying puts mine in place of theirs here. */
  clash: boolean;
}

export interface Conflict<S> {
  rows: ConflictRow[];
  /** Paths the user changed (from base to mine): the only ones the re-apply touches. */
  minePaths: string[][];
  /** Theirs with my changes laid over it. */
  merged: S;
}

/** Everything the conflict notice and the re-apply need, from the three versions. */
export function compareVersions<S>(base: S, mine: S, theirs: S, isLeaf?: IsLeaf): Conflict<S> {
  const minePaths = changedPaths(base, mine, isLeaf);
  const theirPaths = changedPaths(base, theirs, isLeaf);
  const all = [...minePaths, ...theirPaths];
  const rowPaths: string[][] = [];
  for (const p of all) {
    if (all.some((q) => q.length < p.length && startsWith(p, q))) continue;
    if (!rowPaths.some((r) => same(r, p))) rowPaths.push(p);
  }
  // In the order the form has its parts (the shapes' key order), not mine first.
  const order = keyOrder([base, mine, theirs]);
  rowPaths.sort((p, q) => order.indexOf(JSON.stringify(p)) - order.indexOf(JSON.stringify(q)));
  const rows = rowPaths.map((path) => {
    const theirsChanged = theirPaths.some((q) => overlaps(path, q));
    const mineChanged = minePaths.some((q) => overlaps(path, q));
    const row = { path, base: getAt(base, path), theirs: getAt(theirs, path), mine: getAt(mine, path), theirsChanged, mineChanged };
    return { ...row, clash: theirsChanged && mineChanged && !same(row.theirs, row.mine) };
  });
  return { rows, minePaths, merged: reapply(mine, theirs, minePaths) };
}

/** Every path of the given values, parents before children, in their keys' order. */
function keyOrder(values: unknown[], prefix: string[] = [], out: string[] = []): string[] {
  out.push(JSON.stringify(prefix));
  const objs = values.filter(isObj);
  const keys = [...new Set(objs.flatMap((o) => Object.keys(o)))];
  for (const k of keys) keyOrder(objs.map((o) => o[k]), [...prefix, k], out);
  return out;
}

/**
 * Theirs with each of my changed paths set to my value. Where theirs no longer has the object a path runs
 * through (they removed the item I edited), my whole item goes back in.
 */
export function reapply<S>(mine: S, theirs: S, minePaths: readonly Path[]): S {
  let out = theirs;
  for (const p of minePaths) {
    let at: Path = p;
    for (let i = 1; i < p.length; i++) {
      if (!isObj(getAt(out, p.slice(0, i)))) {
        at = p.slice(0, i);
        break;
      }
    }
    out = setAt(out, at, getAt(mine, at));
  }
  return out;
}

/** The top-level fields a re-apply sends: only those holding a change of mine, each whole (as the API takes them). */
export function changedFields<S extends Obj>(value: S, minePaths: readonly Path[]): Partial<S> {
  const keys = [...new Set(minePaths.map((p) => p[0]).filter((k): k is string => k !== undefined))];
  return Object.fromEntries(keys.map((k) => [k, value[k]])) as Partial<S>;
}

/** A list edited item by item, as an object keyed by each item's stable id (link members by port, segments by id). */
export function keyed<T>(list: readonly T[], keyOf: (item: T, index: number) => string): Record<string, T> {
  return Object.fromEntries(list.map((item, i) => [keyOf(item, i), item]));
}

/** True when the items both lists hold are in a different order in `next` than in `base`. */
export function reordered(base: readonly string[], next: readonly string[]): boolean {
  const common = base.filter((id) => next.includes(id));
  const after = next.filter((id) => base.includes(id));
  return !same(common, after);
}

/**
 * The order of a merged keyed list: theirs, without the items I removed, in my order where I reordered,
 * with my additions (and items I edited that they removed) after the item they follow in mine.
 * `present` is the set of ids the merged list holds.
 */
export function mergeOrder(base: readonly string[], mine: readonly string[], theirs: readonly string[], present: ReadonlySet<string>): string[] {
  let out = theirs.filter((id) => mine.includes(id) || !base.includes(id));
  if (reordered(base, mine)) {
    const mineOrder = mine.filter((id) => out.includes(id));
    let i = 0;
    out = out.map((id) => (mine.includes(id) ? mineOrder[i++]! : id));
  }
  for (const [index, id] of mine.entries()) {
    if (out.includes(id) || !present.has(id)) continue;
    const before = mine.slice(0, index).reverse().find((x) => out.includes(x));
    out.splice(before === undefined ? 0 : out.indexOf(before) + 1, 0, id);
  }
  out = out.filter((id) => present.has(id));
  for (const id of present) if (!out.includes(id)) out.push(id);
  return out;
}

/** The merged keyed list back as a list, in `mergeOrder`'s order. */
export function mergedList<T>(merged: Record<string, T>, order: { base: readonly string[]; mine: readonly string[]; theirs: readonly string[] }): T[] {
  const present = new Set(Object.keys(merged));
  return mergeOrder(order.base, order.mine, order.theirs, present).map((id) => merged[id]!);
}

/** A value from a revision or a comparison, readable: blanks as a dash, objects as compact JSON. */
export function showValue(v: unknown): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'boolean') return v ? 'on' : 'off';
  if (typeof v === 'object') return JSON.stringify(v);
  return String(v);
}
