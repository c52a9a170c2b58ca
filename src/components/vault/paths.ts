/** Dotted-path helpers for nested form values (port settings, frame rules). */

/** `{ settings: { baud: true } }` (react-hook-form's dirtyFields) → `['settings.baud']`. */
export function dirtyPaths(dirty: unknown, prefix = ''): string[] {
  if (dirty === true) return [prefix.slice(0, -1)];
  if (Array.isArray(dirty)) return dirty.some((d) => d && (d === true || dirtyPaths(d).length)) ? [prefix.slice(0, -1)] : [];
  if (!dirty || typeof dirty !== 'object') return [];
  return Object.entries(dirty).flatMap(([k, v]) => dirtyPaths(v, `${prefix}${k}.`));
}

export function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

export function setPath<T>(obj: T, path: string, value: unknown): T {
  const copy = structuredClone(obj) as Record<string, unknown>;
  const keys = path.split('.');
  let o = copy;
  for (const k of keys.slice(0, -1)) {
    o[k] = o[k] && typeof o[k] === 'object' ? o[k] : {};
    o = o[k] as Record<string, unknown>;
  }
  o[keys[keys.length - 1]!] = value;
  return copy as T;
}

/** `{ settings: { baud: 1 } }` → `{ 'settings.baud': 1 }`; arrays stay whole. */
export function flatten(obj: Record<string, unknown>, prefix = ''): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(obj)) {
    if (v && typeof v === 'object' && !Array.isArray(v)) Object.assign(out, flatten(v as Record<string, unknown>, `${prefix}${k}.`));
    else out[prefix + k] = v;
  }
  return out;
}
