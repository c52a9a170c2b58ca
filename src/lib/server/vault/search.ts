/** Team-wide device search over the FTS5 index `device_search` (kept current by triggers). */
import { sql, type SQL } from 'drizzle-orm';
import { db } from '../../../db/client';
import type { TeamContext } from '../guard';
import type { Page } from './records';
import { ftsQuery } from './fts';
import { Invalid } from '../errors';

export const SEARCH_FIELDS = ['tag', 'name', 'maker', 'model', 'serialNumber', 'formerSerials', 'siteName', 'machineName'] as const;

export interface SearchHit {
  id: string; tag: string; name: string; role: string; maker: string; model: string; serialNumber: string;
  /** Serial numbers the device's record held before (a unit replaced in the field is still found by its old one). */
  formerSerials: string[];
  machineId: string; machineName: string; siteId: string; siteName: string;
  /** Fields in which the search words were found. */
  matched: string[];
}

export async function searchDevices(ctx: TeamContext, q: string, page: number, pageSize: number): Promise<Page<SearchHit> & { q: string }> {
  const match = ftsQuery(q);
  if (!match) throw new Invalid('q: type at least one letter or digit', { fields: { q: 'Type at least one letter or digit.' } });
  const offset = (page - 1) * pageSize;
  // Ranked by FTS5's bm25; the team filter is on the index row, so other teams' devices are never joined. A long
  // job's devices have their rows before they are shown (`searchRowsOf`), so only live devices count.
  const [rows, totals] = await Promise.all([
    db.all<Record<string, string>>(sql`
      SELECT d.id, d.tag, d.name, d.role, d.maker, d.model, d.serial_number AS serialNumber, d.former_serials AS formerSerials,
             f.machine_name AS machineName, f.site_name AS siteName, d.machine_id AS machineId, m.site_id AS siteId
      FROM device_search f
      JOIN device d ON d.id = f.device_id
      JOIN machine m ON m.id = d.machine_id
      WHERE device_search MATCH ${match} AND f.team_id = ${ctx.team.id} AND d.deleted_at IS NULL
      ORDER BY f.rank, d.tag
      LIMIT ${pageSize} OFFSET ${offset}`),
    countMatches(ctx.team.id, match),
  ]);
  const words = match.match(/"([^"]+)"/g)!.map((w) => w.slice(1, -1));
  const items = rows.map((r) => ({
    ...(r as unknown as Omit<SearchHit, 'matched' | 'formerSerials'>),
    formerSerials: JSON.parse(r.formerSerials ?? '[]') as string[],
    matched: matchedFields(r, words),
  }));
  return { items, page, pageSize, total: totals, sort: 'rank', dir: 'asc', q };
}

/**
 * Matches of the team's live devices. Only while one of the team's long jobs has devices out of sight (their search
 * rows written ahead) does the count look each match up in the device table; otherwise the index alone counts.
 */
async function countMatches(teamId: string, match: string): Promise<number> {
  // A job's id is `job_` and URL-safe base64 (below `{`); the trash-stamp index holds only stamped rows.
  const [hidden] = await db.all<{ n: number }>(sql`SELECT EXISTS (SELECT 1 FROM device INDEXED BY device_trash_idx
    WHERE trash_id > 'job_' AND trash_id < 'job_{' AND deleted_at IS NOT NULL AND team_id = ${teamId}) AS n`);
  const [row] = Number(hidden?.n)
    ? await db.all<{ n: number }>(sql`SELECT count(*) AS n FROM device_search f JOIN device d ON d.id = f.device_id
        WHERE device_search MATCH ${match} AND f.team_id = ${teamId} AND d.deleted_at IS NULL`)
    : await db.all<{ n: number }>(sql`SELECT count(*) AS n FROM device_search f WHERE device_search MATCH ${match} AND f.team_id = ${teamId}`);
  return Number(row?.n ?? 0);
}

function matchedFields(row: Record<string, string>, words: string[]): string[] {
  return SEARCH_FIELDS.filter((f) => {
    const tokens = String(row[f] ?? '').toLowerCase().match(/[\p{L}\p{N}]+/gu) ?? [];
    return words.some((w) => tokens.some((t) => t.startsWith(w)));
  });
}

/**
 * The search rows of devices a long job writes out of sight, written in the same batch as the devices (the row
 * `device_search_ai` would write for a live device), so the job's final transaction need not write them: showing
 * a device whose trash stamp is a job's id adds no search row (migrations 0015 and 0019, whose columns these are).
 */
export function searchRowsOf(deviceIds: readonly string[]): SQL {
  return sql`INSERT INTO device_search (device_id, team_id, tag, name, maker, model, serial_number, former_serials, site_name, machine_name)
    SELECT d.id, d.team_id, d.tag, d.name, d.maker, d.model, d.serial_number, d.former_serials, s.name, m.name
    FROM device d JOIN machine m ON m.id = d.machine_id JOIN site s ON s.id = m.site_id
    WHERE d.id IN (${sql.join(deviceIds.map((id) => sql`${id}`), sql`, `)})`;
}

/** Search rows of the devices a job still has out of sight (read in one pass: the index finds rows by id only by reading them all). */
export async function hiddenSearchRows(jobId: string): Promise<number[]> {
  const rows = await db.all<{ r: number }>(sql`SELECT f.rowid AS r FROM device_search f
    WHERE f.device_id IN (SELECT id FROM device WHERE trash_id = ${jobId} AND deleted_at IS NOT NULL)`);
  return rows.map((x) => Number(x.r));
}

/** Removes search rows by their row ids (a batch per call). */
export function removeSearchRows(rowids: readonly number[]): SQL {
  return sql`DELETE FROM device_search WHERE rowid IN (${sql.join(rowids.map((r) => sql`${r}`), sql`, `)})`;
}
