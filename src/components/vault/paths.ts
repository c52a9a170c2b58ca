/** Dotted-path helpers for react-hook-form's nested values (port settings, frame rules). */

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
