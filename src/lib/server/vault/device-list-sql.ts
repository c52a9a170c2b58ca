/**
 * The device list as one SQL statement. No database access here, so the vault benchmark's baseline
 * runs exactly this statement through a bare client.
 */
import { sql, type SQL } from 'drizzle-orm';
import type { InArgs } from '@libsql/client';
import { ShapedStatements } from './shaped-sql';
import type { DEVICE_ROLES } from '../../schemas/vault';
import { teamFtsQuery } from './fts';
import { PARITY_LETTERS, SHORTHAND_PIECES, type ShorthandPiece } from '../../frame/port-text';

export const DEVICE_SORTS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'machineName', 'siteName', 'updatedAt'] as const;

export type DeviceListOptions = {
  page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; siteId?: string; role?: (typeof DEVICE_ROLES)[number]; q?: string;
  /** Keyset cursor: the `next` of the previous page (its last row's sort key and id); `page` is then ignored. */
  after?: DeviceCursor;
};

/** The last row of a page: its sort key (text, or milliseconds for `updatedAt`) and its id. */
export type DeviceCursor = [string | number, string];

/** Totals are counted up to this many rows; above it the list says `totalCapped: true` (docs/api.md). */
export const TOTAL_CAP = 1000;

/** A cursor as the client sends it back (`after=`, the JSON text of a page's `next`); null when it is not one. */
export function parseDeviceCursor(text: string): DeviceCursor | null {
  try {
    const v = JSON.parse(text) as unknown;
    if (Array.isArray(v) && v.length === 2 && (typeof v[0] === 'string' || (typeof v[0] === 'number' && Number.isFinite(v[0]))) && typeof v[1] === 'string') return [v[0], v[1]];
  } catch {
    // not JSON
  }
  return null;
}

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

/** What decides a list statement's text: the order, and which filters and which paging it has. */
interface ListShape { sort: (typeof DEVICE_SORTS)[number]; desc: boolean; after: boolean; machine: boolean; site: boolean; role: boolean; match: boolean }
/** What a list statement takes as parameters: values, or drizzle placeholders of the same names. */
type ListValues = Record<'teamId' | 'machineId' | 'siteId' | 'role' | 'match' | 'afterKey' | 'afterId' | 'limit' | 'offset' | 'page' | 'pageSize' | 'lastOnPage' | 'sort' | 'dir', unknown>;

function listShape(teamId: string, opts: DeviceListOptions): { shape: ListShape; values: ListValues } {
  const match = opts.q ? teamFtsQuery(teamId, opts.q) : null;
  const sort = (Object.hasOwn(SORT_SQL, opts.sort) ? opts.sort : 'tag') as ListShape['sort'];
  return {
    shape: { sort, desc: opts.dir === 'desc', after: !!opts.after, machine: !!opts.machineId, site: !!opts.siteId, role: !!opts.role, match: !!match },
    values: {
      teamId, machineId: opts.machineId, siteId: opts.siteId, role: opts.role, match, afterKey: opts.after?.[0], afterId: opts.after?.[1],
      limit: opts.pageSize + 1, offset: opts.after ? 0 : (opts.page - 1) * opts.pageSize, page: opts.after ? null : opts.page,
      pageSize: opts.pageSize, lastOnPage: opts.pageSize - 1, sort: opts.sort, dir: opts.dir,
    },
  };
}

/**
 * The statement behind `listDevicesJson` (one row, one column: `page`); the vault benchmark's baseline runs it too.
 * Its cost does not grow with the team: the page is read off an index that serves the order (`device_team_*_idx`,
 * ties broken by `id` in the same direction), from the cursor on (`after`) or from an offset (`page`, kept for old
 * links; its cost grows with the page number); the total is counted up to TOTAL_CAP rows.
 */
export function deviceListStatement(teamId: string, opts: DeviceListOptions): SQL {
  const { shape, values } = listShape(teamId, opts);
  return listSql(shape, values);
}

function listSql(shape: ListShape, v: ListValues): SQL {
  const order = SORT_SQL[shape.sort];
  const dir = sql.raw(shape.desc ? 'DESC' : 'ASC');
  const filters = [
    sql`device.team_id = ${v.teamId} AND device.deleted_at IS NULL`,
    shape.machine ? sql`device.machine_id = ${v.machineId}` : undefined,
    shape.site ? sql`machine.site_id = ${v.siteId}` : undefined,
    shape.role ? sql`device.role = ${v.role}` : undefined,
    shape.match ? sql`device.id IN (SELECT device_id FROM device_search WHERE device_search MATCH ${v.match})` : undefined,
  ].filter((c): c is SQL => c !== undefined);
  const where = sql.join(filters, sql` AND `);
  const after = shape.after ? sql`AND (${order.key}, device.id) ${sql.raw(shape.desc ? '<' : '>')} (${v.afterKey}, ${v.afterId})` : sql``;
  const needsMachine = order.joins !== 'none' || shape.site;
  const joins = sql.join([needsMachine ? JOIN_MACHINE : undefined, order.joins === 'site' ? JOIN_SITE : undefined].filter((j): j is SQL => !!j), sql` `);
  const countJoins = shape.site ? JOIN_MACHINE : sql``;
  return sql`
    WITH rows AS MATERIALIZED (
      SELECT device.id AS id, ${order.key} AS k FROM device ${joins} WHERE ${where} ${after}
      ORDER BY k ${dir}, device.id ${dir} LIMIT ${v.limit} OFFSET ${v.offset}
    ), page AS MATERIALIZED (SELECT id, k FROM rows ORDER BY k ${dir}, id ${dir} LIMIT ${v.pageSize}),
    counted AS MATERIALIZED (SELECT count(*) AS n FROM (SELECT 1 FROM device ${countJoins} WHERE ${where} LIMIT ${TOTAL_CAP + 1}))
    SELECT json_object(
      'items', (SELECT json_group_array(json_object(
         'id', device.id, 'tag', device.tag, 'name', device.name, 'role', device.role, 'maker', device.maker,
         'model', device.model, 'serialNumber', device.serial_number, 'firmware', device.firmware,
         'location', device.location, 'version', device.version, 'updatedAt', ${isoTime(sql`device.updated_at`)},
         'machineId', device.machine_id, 'machineName', machine.name, 'siteId', machine.site_id, 'siteName', site.name,
         'ports', (SELECT json_group_array(json_object('id', port.id, 'name', port.name, 'shorthand', ${PORT_SHORTHAND_SQL},
                     'interface', port.settings ->> '$.interface') ORDER BY port.position, port.id)
                   FROM port WHERE port.device_id = device.id AND port.deleted_at IS NULL)
       ) ORDER BY page.k ${dir}, page.id ${dir})
       FROM page JOIN device ON device.id = page.id ${JOIN_MACHINE} ${JOIN_SITE}),
      'page', ${v.page}, 'pageSize', ${v.pageSize},
      'total', min((SELECT n FROM counted), ${TOTAL_CAP}), 'totalCapped', json((SELECT CASE WHEN n > ${TOTAL_CAP} THEN 'true' ELSE 'false' END FROM counted)),
      'next', CASE WHEN (SELECT count(*) FROM rows) > ${v.pageSize}
        THEN (SELECT json_array(k, id) || '' FROM page ORDER BY k ${dir}, id ${dir} LIMIT 1 OFFSET ${v.lastOnPage}) END,
      'sort', ${v.sort}, 'dir', ${v.dir}
    ) AS page`;
}

const shapes = new ShapedStatements<string>();
const PLACEHOLDERS = Object.fromEntries(
  (['teamId', 'machineId', 'siteId', 'role', 'match', 'afterKey', 'afterId', 'limit', 'offset', 'page', 'pageSize', 'lastOnPage', 'sort', 'dir'] as const)
    .map((name) => [name, sql.placeholder(name)]),
) as ListValues;

/** `deviceListStatement` as the text and arguments the client runs, its text built once per shape (./shaped-sql.ts). */
export function deviceListQuery(teamId: string, opts: DeviceListOptions): { sql: string; args: InArgs } {
  const { shape, values } = listShape(teamId, opts);
  return shapes.query(JSON.stringify(shape), () => listSql(shape, PLACEHOLDERS), values);
}
