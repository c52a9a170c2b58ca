/**
 * The search statements (no database access here, so the vault benchmark's baseline runs exactly these through a
 * bare client). Their cost does not grow with the team: the query is scoped to the team in the index itself (its
 * token, `teamFtsQuery`), and at most SEARCH_CAP + 1 matches are read and ordered (docs/api.md, "Search").
 */
import { sql, type SQL } from 'drizzle-orm';
import type { InArgs } from '@libsql/client';
import { ShapedStatements } from './shaped-sql';
import { RECORD_SEARCH_COLUMNS, teamFtsQuery } from './fts';

/** Matches read per search; above it the answer says `totalCapped: true` and orders the first SEARCH_CAP found. */
export const SEARCH_CAP = 200;

/**
 * One page of a device search as rows; every row also carries `found` (matches read, up to SEARCH_CAP + 1) and
 * `live` (those of live devices). Null when nothing searchable was typed. Devices whose tag holds every typed word
 * come first, then the rest, each in tag order. (FTS5's bm25 is not used: it counts every row holding each word of the query, the
 * team's word included, on every search, a cost that grows with the team.)
 */
export function deviceSearchStatement(teamId: string, q: string, pageSize: number, offset: number): SQL | null {
  const values = searchValues(teamId, q, pageSize, offset);
  return values && searchSql(values);
}

/** What a device search takes as parameters (values, or drizzle placeholders of the same names); its text depends only on the number of words. */
interface SearchValues { teamId: unknown; match: unknown; words: unknown[]; pageSize: unknown; offset: unknown }

function searchValues(teamId: string, q: string, pageSize: number, offset: number): SearchValues | null {
  const match = teamFtsQuery(teamId, q);
  if (!match) return null;
  return { teamId, match, words: q.toLowerCase().match(/[\p{L}\p{N}]+/gu)!.slice(0, 8), pageSize, offset };
}

function searchSql(v: SearchValues): SQL {
  const inTag = sql.join(v.words.map((w) => sql`instr(lower(f.tag), ${w}) > 0`), sql` AND `);
  return sql`
    WITH hidden AS MATERIALIZED (
      SELECT EXISTS (SELECT 1 FROM device INDEXED BY device_trash_idx
        WHERE trash_id > 'job_' AND trash_id < 'job_{' AND deleted_at IS NOT NULL AND team_id = ${v.teamId}) AS any
    ), hits AS MATERIALIZED (
      SELECT f.device_id, CASE WHEN ${inTag} THEN 0 ELSE 1 END AS score, f.tag, f.name, f.role, f.maker, f.model, f.serial_number,
             f.former_serials, f.site_name, f.machine_name
      FROM device_search f WHERE device_search MATCH ${v.match} LIMIT ${SEARCH_CAP + 1}
    ), live AS MATERIALIZED (
      SELECT * FROM hits h WHERE NOT (SELECT any FROM hidden)
        OR EXISTS (SELECT 1 FROM device d WHERE d.id = h.device_id AND d.deleted_at IS NULL)
    )
    SELECT l.device_id AS id, l.tag, l.name, l.role, l.maker, l.model, l.serial_number AS serialNumber, d.former_serials AS formerSerials,
           l.machine_name AS machineName, l.site_name AS siteName, d.machine_id AS machineId, m.site_id AS siteId,
           (SELECT count(*) FROM hits) AS found, (SELECT count(*) FROM live) AS live
    FROM (SELECT * FROM live ORDER BY score, tag, device_id LIMIT ${v.pageSize} OFFSET ${v.offset}) l
    JOIN device d ON d.id = l.device_id JOIN machine m ON m.id = d.machine_id
    ORDER BY l.score, l.tag, l.device_id`;
}

const shapes = new ShapedStatements<number>();

/** `deviceSearchStatement` as the text and arguments the client runs, its text built once per number of words (./shaped-sql.ts). */
export function deviceSearchQuery(teamId: string, q: string, pageSize: number, offset: number): { sql: string; args: InArgs } | null {
  const v = searchValues(teamId, q, pageSize, offset);
  if (!v) return null;
  const n = v.words.length;
  const named: Record<string, unknown> = { teamId: v.teamId, match: v.match, pageSize: v.pageSize, offset: v.offset };
  v.words.forEach((w, i) => { named[`w${i}`] = w; });
  return shapes.query(n, () => searchSql({
    teamId: sql.placeholder('teamId'), match: sql.placeholder('match'), pageSize: sql.placeholder('pageSize'), offset: sql.placeholder('offset'),
    words: Array.from({ length: n }, (_, i) => sql.placeholder(`w${i}`)),
  }), named);
}

/**
 * The commands and ports (by their notes) that match a search, in name order, as rows of `kind` 'command' or 'port', each with its
 * owner (a device, or a profile for a profile's command); `found` counts the matches read, up to SEARCH_CAP + 1.
 */
export function recordSearchStatement(teamId: string, q: string, limit: number): SQL | null {
  const match = teamFtsQuery(teamId, q, RECORD_SEARCH_COLUMNS);
  if (!match) return null;
  return sql`
    WITH hits AS MATERIALIZED (
      SELECT kind, record_id, 0 AS score FROM record_search WHERE record_search MATCH ${match} LIMIT ${SEARCH_CAP + 1}
    )
    SELECT * FROM (
      SELECT h.kind, h.score, c.id, c.name, c.purpose AS detail, c.notes, c.device_id AS deviceId, d.tag AS deviceTag,
             c.profile_id AS profileId, p.name AS profileName, (SELECT count(*) FROM hits) AS found
      FROM hits h JOIN command c ON h.kind = 'command' AND c.id = h.record_id
      LEFT JOIN device d ON d.id = c.device_id LEFT JOIN device_profile p ON p.id = c.profile_id
      WHERE c.deleted_at IS NULL AND (d.id IS NULL OR d.deleted_at IS NULL) AND (p.id IS NULL OR p.deleted_at IS NULL)
      UNION ALL
      SELECT h.kind, h.score, x.id, x.name, '' AS detail, x.notes, x.device_id AS deviceId, d.tag AS deviceTag,
             NULL AS profileId, NULL AS profileName, (SELECT count(*) FROM hits) AS found
      FROM hits h JOIN port x ON h.kind = 'port' AND x.id = h.record_id JOIN device d ON d.id = x.device_id
      WHERE x.deleted_at IS NULL AND d.deleted_at IS NULL
    ) ORDER BY score, name LIMIT ${limit}`;
}
