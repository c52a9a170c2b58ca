/** FTS5 query text for the device search index; no database access, so the benchmark's baseline can share it. */

/**
 * An FTS5 query from what the user typed: every run of letters/digits must match the start of
 * a word in some field (`DRV-20` finds `DRV-201`). Null when nothing searchable was typed.
 */
export function ftsQuery(text: string): string | null {
  const tokens = text.toLowerCase().match(/[\p{L}\p{N}]+/gu)?.slice(0, 8) ?? [];
  if (tokens.length === 0) return null;
  return tokens.map((t) => `"${t}"*`).join(' ');
}
