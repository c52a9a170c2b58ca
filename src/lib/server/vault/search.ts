/** Team-wide device search over the FTS5 index `device_search` (kept current by triggers). */
import { sql, type SQL } from 'drizzle-orm';
import { client, db } from '../../../db/client';
import type { TeamContext } from '../guard';
import type { Page } from './records';
import { ftsQuery } from './fts';
import { deviceSearchQuery, recordSearchStatement, SEARCH_CAP } from './search-sql';
import { Invalid } from '../errors';

export const SEARCH_FIELDS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'formerSerials', 'siteName', 'machineName'] as const;

export interface SearchHit {
  id: string; tag: string; name: string; role: string; maker: string; model: string; serialNumber: string;
  /** Serial numbers the device's record held before (a unit replaced in the field is still found by its old one). */
  formerSerials: string[];
  machineId: string; machineName: string; siteId: string; siteName: string;
  /** Fields in which the search words were found. */
  matched: string[];
}

export async function searchDevices(ctx: TeamContext, q: string, page: number, pageSize: number): Promise<Page<SearchHit> & { q: string; totalCapped: boolean }> {
  const statement = deviceSearchQuery(ctx.team.id, q, pageSize, (page - 1) * pageSize);
  if (!statement) throw new Invalid('q: type at least one letter or digit', { fields: { q: 'Type at least one letter or digit.' } });
  const rows = (await client.execute(statement)).rows as unknown as Record<string, string>[];
  const words = ftsQuery(q)!.match(/"([^"]+)"/g)!.map((w) => w.slice(1, -1));
  // Each hit built field by field (a spread of the driver's row objects cost more than the rest of the mapping).
  const items = rows.map((r): SearchHit => ({
    id: r.id!, tag: r.tag!, name: r.name!, role: r.role!, maker: r.maker!, model: r.model!, serialNumber: r.serialNumber!,
    formerSerials: JSON.parse(r.formerSerials ?? '[]') as string[],
    machineId: r.machineId!, machineName: r.machineName!, siteId: r.siteId!, siteName: r.siteName!,
    matched: matchedFields(r, words),
  }));
  const { total, totalCapped } = rows.length ? capped(Number(rows[0]!.found), Number(rows[0]!.live)) : await emptyPageTotal(ctx.team.id, q);
  return { items, page, pageSize, total, totalCapped, sort: 'rank', dir: 'asc', q };
}

function capped(found: number, live: number) {
  return { total: Math.min(live, SEARCH_CAP), totalCapped: found > SEARCH_CAP };
}

/** A page past the last: the counts alone (the same statement, first row). */
async function emptyPageTotal(teamId: string, q: string) {
  const [row] = (await client.execute(deviceSearchQuery(teamId, q, 1, 0)!)).rows;
  return row ? capped(Number(row.found), Number(row.live)) : { total: 0, totalCapped: false };
}

export interface RecordHit {
  kind: 'command' | 'port';
  id: string; name: string;
  /** A command's purpose ('' for a port). */
  detail: string;
  notes: string;
  deviceId: string | null; deviceTag: string | null; profileId: string | null; profileName: string | null;
  /** Where the record is shown. */
  href: string;
}

/** Commands (name, purpose, notes, the text of their literal parts) and ports (by their notes) of the team, best first. */
export async function searchRecords(ctx: TeamContext, q: string, limit: number): Promise<{ items: RecordHit[]; totalCapped: boolean }> {
  const statement = recordSearchStatement(ctx.team.id, q, limit);
  if (!statement) throw new Invalid('q: type at least one letter or digit', { fields: { q: 'Type at least one letter or digit.' } });
  const rows = await db.all<Omit<RecordHit, 'href'> & { found: number; score: number }>(statement);
  const items = rows.map(({ found: _f, score: _s, ...r }) => ({
    ...r,
    href: r.kind === 'port' ? `/vault/devices/${r.deviceId}#ports`
      : r.deviceId ? `/vault/devices/${r.deviceId}/commands/${r.id}` : `/vault/profiles/${r.profileId}/commands/${r.id}`,
  }));
  return { items, totalCapped: rows.some((r) => Number(r.found) > SEARCH_CAP) };
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
 * a device whose trash stamp is a job's id adds no search row (migrations 0015 and 0021, whose columns these are).
 */
export function searchRowsOf(deviceIds: readonly string[]): SQL {
  return sql`INSERT INTO device_search (device_id, team, tag, name, role, maker, model, serial_number, former_serials, site_name, machine_name)
    SELECT d.id, 't' || lower(hex(d.team_id)), d.tag, d.name, d.role, d.maker, d.model, d.serial_number, d.former_serials, s.name, m.name
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
