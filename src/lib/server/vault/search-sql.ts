/**
 * The search statements (no database access here, so the vault benchmark's baseline runs exactly these through a
 * bare client). Their cost does not grow with the team: the query is scoped to the team in the index itself (its
 * token, `teamFtsQuery`), and at most SEARCH_CAP + 1 matches are read and ranked (docs/api.md, "Search").
 */
import { sql, type SQL } from 'drizzle-orm';
import { RECORD_SEARCH_COLUMNS, teamFtsQuery } from './fts';

/** Matches read per search; above it the answer says `totalCapped: true` and ranks the first SEARCH_CAP found. */
export const SEARCH_CAP = 500;

/**
 * One page of a device search as rows; every row also carries `found` (matches read, up to SEARCH_CAP + 1) and
 * `live` (those of live devices). Null when nothing searchable was typed. Ranked by FTS5's bm25 among the matches
 * read, then by tag.
 */
export function deviceSearchStatement(teamId: string, q: string, pageSize: number, offset: number): SQL | null {
  const match = teamFtsQuery(teamId, q);
  if (!match) return null;
  // A long job's devices have their rows before they are shown (`searchRowsOf`), so only live devices are kept.
  return sql`
    WITH hits AS MATERIALIZED (
      SELECT device_id, rank AS score, site_name, machine_name FROM device_search WHERE device_search MATCH ${match} LIMIT ${SEARCH_CAP + 1}
    ), live AS MATERIALIZED (
      SELECT h.score, d.id, d.tag, d.name, d.role, d.maker, d.model, d.serial_number AS serialNumber, d.former_serials AS formerSerials,
             h.machine_name AS machineName, h.site_name AS siteName, d.machine_id AS machineId
      FROM hits h JOIN device d ON d.id = h.device_id WHERE d.deleted_at IS NULL
    )
    SELECT l.id, l.tag, l.name, l.role, l.maker, l.model, l.serialNumber, l.formerSerials, l.machineName, l.siteName, l.machineId,
           m.site_id AS siteId, (SELECT count(*) FROM hits) AS found, (SELECT count(*) FROM live) AS live
    FROM (SELECT * FROM live ORDER BY score, tag LIMIT ${pageSize} OFFSET ${offset}) l JOIN machine m ON m.id = l.machineId
    ORDER BY l.score, l.tag`;
}

/**
 * The best commands and ports (by their notes) for a search, as rows of `kind` 'command' or 'port', each with its
 * owner (a device, or a profile for a profile's command); `found` counts the matches read, up to SEARCH_CAP + 1.
 */
export function recordSearchStatement(teamId: string, q: string, limit: number): SQL | null {
  const match = teamFtsQuery(teamId, q, RECORD_SEARCH_COLUMNS);
  if (!match) return null;
  return sql`
    WITH hits AS MATERIALIZED (
      SELECT kind, record_id, rank AS score FROM record_search WHERE record_search MATCH ${match} LIMIT ${SEARCH_CAP + 1}
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
