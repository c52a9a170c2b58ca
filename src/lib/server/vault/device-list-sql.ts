/**
 * The device list as one SQL statement. No database access here, so the vault benchmark's baseline
 * runs exactly this statement through a bare client.
 */
import { sql, type SQL } from 'drizzle-orm';
import type { DEVICE_ROLES } from '../../schemas/vault';
import { ftsQuery } from './fts';
import { PARITY_LETTERS, SHORTHAND_PIECES, type ShorthandPiece } from '../../frame/port-text';

export const DEVICE_SORTS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'machineName', 'siteName', 'updatedAt'] as const;

export type DeviceListOptions = {
  page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; siteId?: string; role?: (typeof DEVICE_ROLES)[number]; q?: string;
};

/** Each list order as SQL; `id` breaks ties. Orders on machine or site names join those tables into the page query. */
const SORT_SQL: Record<(typeof DEVICE_SORTS)[number], { key: SQL; joins: 'none' | 'machine' | 'site' }> = {
  tag: { key: sql`device.tag`, joins: 'none' },
  name: { key: sql`device.name`, joins: 'none' },
  role: { key: sql`device.role`, joins: 'none' },
  maker: { key: sql`device.maker`, joins: 'none' },
  model: { key: sql`device.model`, joins: 'none' },
  serialNumber: { key: sql`device.serial_number`, joins: 'none' },
  updatedAt: { key: sql`device.updated_at`, joins: 'none' },
  machineName: { key: sql`machine.name`, joins: 'machine' },
  siteName: { key: sql`site.name`, joins: 'site' },
};

const JOIN_MACHINE = sql`JOIN machine ON machine.id = device.machine_id`;
const JOIN_SITE = sql`JOIN site ON site.id = machine.site_id`;

/** The ISO 8601 text `Date.toJSON()` gives, from a millisecond timestamp column. */
const isoTime = (column: SQL) => sql`strftime('%Y-%m-%dT%H:%M:%fZ', ${column} / 1000.0, 'unixepoch')`;

/** A SQL string literal of fixed text. */
const literal = (text: string) => sql.raw(`'${text.replaceAll("'", "''")}'`);
const setting = (key: string) => sql.raw(`(port.settings ->> '$.${key}')`);

/** One shorthand piece of ../../frame/port-text.ts as SQL over the port's settings JSON. */
function pieceSql(p: ShorthandPiece): SQL {
  if ('text' in p) return literal(p.text);
  if ('setting' in p) return setting(p.setting);
  if ('parityLetter' in p) {
    const cases = Object.entries(PARITY_LETTERS).map(([parity, letter]) => sql`WHEN ${literal(parity)} THEN ${literal(letter)}`);
    return sql`CASE ${setting('parity')} ${sql.join(cases, sql` `)} END`;
  }
  return sql`CASE WHEN coalesce(${setting(p.ifSet)}, '') <> '' THEN ${literal(p.before)} || ${setting(p.ifSet)} ELSE '' END`;
}

const piecesSql = (pieces: readonly ShorthandPiece[]) => sql.join(pieces.map(pieceSql), sql` || `);

/**
 * A port's shorthand from its settings JSON, written from the same pieces as `portShorthand()`
 * (../../frame/port-text.ts). Baud and data bits are integers, stop bits 1, 1.5 or 2 and the TCP port an
 * integer, so SQLite prints the numbers as JavaScript does; a test compares both on every parity, stop bits
 * and interface.
 */
export const PORT_SHORTHAND_SQL = sql`CASE WHEN ${setting('interface')} = 'tcp' THEN ${piecesSql(SHORTHAND_PIECES.tcp)} ELSE ${piecesSql(SHORTHAND_PIECES.serial)} END`;

/** The statement behind `listDevicesJson` (one row, one column: `page`); the vault benchmark's baseline runs it too. */
export function deviceListStatement(teamId: string, opts: DeviceListOptions): SQL {
  const match = opts.q ? ftsQuery(opts.q) : null;
  const conditions = [
    sql`device.team_id = ${teamId} AND device.deleted_at IS NULL`,
    opts.machineId ? sql`device.machine_id = ${opts.machineId}` : undefined,
    opts.siteId ? sql`machine.site_id = ${opts.siteId}` : undefined,
    opts.role ? sql`device.role = ${opts.role}` : undefined,
    match ? sql`device.id IN (SELECT device_id FROM device_search WHERE device_search MATCH ${match} AND team_id = ${teamId})` : undefined,
  ].filter((c): c is SQL => c !== undefined);
  const where = sql.join(conditions, sql` AND `);
  const order = SORT_SQL[opts.sort as (typeof DEVICE_SORTS)[number]] ?? SORT_SQL.tag;
  const dir = sql.raw(opts.dir === 'desc' ? 'DESC' : 'ASC');
  const needsMachine = order.joins !== 'none' || !!opts.siteId;
  const joins = sql.join([needsMachine ? JOIN_MACHINE : undefined, order.joins === 'site' ? JOIN_SITE : undefined].filter((j): j is SQL => !!j), sql` `);
  const countJoins = opts.siteId ? JOIN_MACHINE : sql``;
  return sql`
    WITH page AS (
      SELECT device.id AS id, ${order.key} AS k FROM device ${joins} WHERE ${where}
      ORDER BY k ${dir}, device.id LIMIT ${opts.pageSize} OFFSET ${(opts.page - 1) * opts.pageSize}
    )
    SELECT json_object(
      'items', (SELECT json_group_array(json_object(
         'id', device.id, 'tag', device.tag, 'name', device.name, 'role', device.role, 'maker', device.maker,
         'model', device.model, 'serialNumber', device.serial_number, 'firmware', device.firmware,
         'location', device.location, 'version', device.version, 'updatedAt', ${isoTime(sql`device.updated_at`)},
         'machineId', device.machine_id, 'machineName', machine.name, 'siteId', machine.site_id, 'siteName', site.name,
         'ports', (SELECT json_group_array(json_object('id', port.id, 'name', port.name, 'shorthand', ${PORT_SHORTHAND_SQL},
                     'interface', port.settings ->> '$.interface') ORDER BY port.position, port.id)
                   FROM port WHERE port.device_id = device.id AND port.deleted_at IS NULL)
       ) ORDER BY page.k ${dir}, page.id)
       FROM page JOIN device ON device.id = page.id ${JOIN_MACHINE} ${JOIN_SITE}),
      'page', ${opts.page}, 'pageSize', ${opts.pageSize},
      'total', (SELECT count(*) FROM device ${countJoins} WHERE ${where}),
      'sort', ${opts.sort}, 'dir', ${opts.dir}
    ) AS page`;
}
