/** FTS5 query text for the search indexes; no database access, so the benchmark's baseline can share it. */

/**
 * An FTS5 query from what the user typed, as a search box reads it while typing: every run of letters/digits must
 * match a whole word in some field, and the last one the start of a word (`DRV-20` finds `DRV-201`; `plant 7 li`
 * finds "Line 7 of plant 7"). Only the last word is a prefix because FTS5 gathers every word a prefix stands for
 * before it can skip through them (a cost that grows with the team); whole words are read only as far as needed.
 * Null when nothing searchable was typed.
 */
export function ftsQuery(text: string): string | null {
  const tokens = text.toLowerCase().match(/[\p{L}\p{N}]+/gu)?.slice(0, 8) ?? [];
  if (tokens.length === 0) return null;
  return tokens.map((t, i) => (i === tokens.length - 1 ? `"${t}"*` : `"${t}"`)).join(' ');
}

/**
 * The team's word in the search indexes: `t` and the team id's UTF-8 bytes in hex, one token to the tokenizer. The
 * migration writes it in SQL as `'t' || lower(hex(team_id))` (drizzle/0021_search_by_team.sql); the two must agree.
 */
export function teamToken(teamId: string): string {
  return `t${Buffer.from(teamId, 'utf8').toString('hex')}`;
}

/** The searchable columns of `device_search` (every indexed column but `team`). */
export const DEVICE_SEARCH_COLUMNS = 'tag name role maker model serial_number former_serials site_name machine_name';
/** The searchable columns of `record_search` (commands and port notes). */
export const RECORD_SEARCH_COLUMNS = 'name body';

/**
 * What the user typed, scoped to one team in the index itself: the team's token must be in the `team` column and
 * every word in one of `columns` (so a typed word never matches a team token). Null when nothing searchable was typed.
 */
export function teamFtsQuery(teamId: string, text: string, columns = DEVICE_SEARCH_COLUMNS): string | null {
  const words = ftsQuery(text);
  return words && `team : "${teamToken(teamId)}" AND {${columns}} : (${words})`;
}
