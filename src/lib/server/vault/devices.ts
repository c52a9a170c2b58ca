/** Devices and their ports: one transaction writes a device, its ports and their revisions. */
import { and, asc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { device, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { newId } from '../ids';
import type { deviceCreateSchema, deviceUpdateSchema, PortInput } from '../../schemas/vault';
import { findLive, recordCreated, updateVersioned, type Page } from './records';
import { deviceSpec, machineSpec, portSpec, profileSpec, type DeviceRow, type PortRow } from './specs';
import { presentPort, type PortView } from './present';
import { definedOnly } from './diff';
import { ftsQuery } from './search';

export const DEVICE_SORTS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'machineName', 'siteName', 'updatedAt'] as const;

export interface DeviceListItem {
  id: string; tag: string; name: string; role: DeviceRow['role']; maker: string; model: string; serialNumber: string;
  firmware: string; location: string; version: number; updatedAt: Date;
  machineId: string; machineName: string; siteId: string; siteName: string;
  ports: { id: string; name: string; shorthand: string; interface: string }[];
}

export interface DeviceView extends DeviceRow {
  machineName: string;
  siteId: string;
  siteName: string;
  ports: PortView[];
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

/**
 * A port's shorthand (`9600 8-N-1`, `… @ host:port` over TCP) from its settings JSON: the SQL twin of
 * `shorthandOf()` in ./present.ts. Baud and data bits are integers and stop bits 1, 1.5 or 2, so
 * SQLite writes the numbers as JavaScript does; a test compares both on every parity, stop bits and
 * interface.
 */
const PORT_SHORTHAND = sql`(port.settings ->> '$.baud') || ' ' || (port.settings ->> '$.dataBits') || '-' ||
  CASE port.settings ->> '$.parity' WHEN 'none' THEN 'N' WHEN 'even' THEN 'E' WHEN 'odd' THEN 'O' WHEN 'mark' THEN 'M' WHEN 'space' THEN 'S' END ||
  '-' || (port.settings ->> '$.stopBits') ||
  CASE WHEN port.settings ->> '$.interface' = 'tcp' AND coalesce(port.settings ->> '$.tcpHost', '') <> ''
    THEN ' @ ' || (port.settings ->> '$.tcpHost') || ':' || coalesce(port.settings ->> '$.tcpPort', '') ELSE '' END`;

type ListOptions = { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; siteId?: string; role?: DeviceRow['role']; q?: string };

/**
 * One page of the team's devices, with the total and each device's port shorthand, as the JSON text
 * the API sends: one statement, in which the page's ids come straight off a list-order index and
 * SQLite assembles the page (device, machine, site and ports). One round trip, and no row mapping,
 * parsing or serialising in JavaScript (docs/vault.md, "Performance").
 */
export async function listDevicesJson(ctx: TeamContext, opts: ListOptions): Promise<string> {
  const [row] = await db.all<{ page: string }>(deviceListStatement(ctx.team.id, opts));
  return row!.page;
}

/** The statement behind `listDevicesJson` (one row, one column: `page`); the vault benchmark's baseline runs it too. */
export function deviceListStatement(teamId: string, opts: ListOptions): SQL {
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
         'ports', (SELECT json_group_array(json_object('id', port.id, 'name', port.name, 'shorthand', ${PORT_SHORTHAND},
                     'interface', port.settings ->> '$.interface') ORDER BY port.position, port.id)
                   FROM port WHERE port.device_id = device.id AND port.deleted_at IS NULL)
       ) ORDER BY page.k ${dir}, page.id)
       FROM page JOIN device ON device.id = page.id ${JOIN_MACHINE} ${JOIN_SITE}),
      'page', ${opts.page}, 'pageSize', ${opts.pageSize},
      'total', (SELECT count(*) FROM device ${countJoins} WHERE ${where}),
      'sort', ${opts.sort}, 'dir', ${opts.dir}
    ) AS page`;
}

/** The same page as objects, for pages and exports that read it on the server. */
export async function listDevices(ctx: TeamContext, opts: ListOptions): Promise<Page<DeviceListItem>> {
  const page = JSON.parse(await listDevicesJson(ctx, opts)) as Page<Omit<DeviceListItem, 'updatedAt'> & { updatedAt: string }>;
  return { ...page, items: page.items.map((d) => ({ ...d, updatedAt: new Date(d.updatedAt) })) };
}

export async function livePorts(q: DbOrTx, deviceId: string): Promise<PortRow[]> {
  return q.select().from(port).where(and(eq(port.deviceId, deviceId), isNull(port.deletedAt))).orderBy(asc(port.position), asc(port.id));
}

export async function getDevice(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<DeviceView> {
  const [row] = await q
    .select({ device, machineName: machine.name, siteId: site.id, siteName: site.name })
    .from(device)
    .innerJoin(machine, eq(machine.id, device.machineId))
    .innerJoin(site, eq(site.id, machine.siteId))
    .where(and(eq(device.id, id), eq(device.teamId, ctx.team.id), isNull(device.deletedAt)));
  if (!row) throw new HttpError(404, 'No device with that id in this team.');
  const ports = await livePorts(q, id);
  return { ...row.device, machineName: row.machineName, siteId: row.siteId, siteName: row.siteName, ports: ports.map(presentPort) };
}

/** Inserts ports with their revisions; a duplicate name answers 422 (and rolls the caller's transaction back). */
export async function insertPorts(
  tx: DbOrTx,
  ctx: TeamContext,
  deviceId: string,
  inputs: PortInput[],
  startAt = 0,
  fieldFor: (i: number) => string = (i) => `ports.${i}.name`,
): Promise<PortRow[]> {
  const out: PortRow[] = [];
  for (const [i, p] of inputs.entries()) {
    let row: PortRow | undefined;
    try {
      [row] = await tx
        .insert(port)
        .values({ id: newId('port'), teamId: ctx.team.id, deviceId, position: startAt + i, ...p, updatedBy: ctx.user.id })
        .returning();
    } catch (err) {
      throw uniqueName(err, fieldFor(i));
    }
    await recordCreated(tx, ctx, portSpec, row!);
    out.push(row!);
  }
  return out;
}

export async function createDevice(ctx: TeamContext, input: z.infer<typeof deviceCreateSchema>): Promise<DeviceView> {
  const { ports, profileId, ...fields } = input;
  return db.transaction(async (tx) => {
    await findLive(tx, ctx, machineSpec, fields.machineId);
    const profile = profileId ? await findLive(tx, ctx, profileSpec, profileId) : null;
    const values = {
      ...fields,
      role: fields.role ?? profile?.role ?? 'other',
      maker: fields.maker || profile?.maker || '',
      model: fields.model || profile?.model || '',
    };
    const [row] = await tx
      .insert(device)
      .values({ id: newId('dev'), teamId: ctx.team.id, profileId: profile?.id ?? null, ...values, updatedBy: ctx.user.id })
      .returning();
    await recordCreated(tx, ctx, deviceSpec, row!, profile ? `Created device ${row!.tag} from profile ${profile.name}` : undefined);
    await insertPorts(tx, ctx, row!.id, ports ?? profile?.ports ?? []);
    return getDevice(ctx, row!.id, tx);
  });
}

export async function updateDevice(ctx: TeamContext, id: string, input: z.infer<typeof deviceUpdateSchema>): Promise<DeviceView> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => {
    if (values.machineId) await findLive(tx, ctx, machineSpec, values.machineId);
    await updateVersioned(tx, ctx, deviceSpec, id, version, definedOnly(values), { present: () => getDevice(ctx, id, tx) });
    return getDevice(ctx, id, tx);
  });
}

/** Maps the unique (device, port name) index to a field message; other errors pass through. */
export function uniqueName(err: unknown, field: string): unknown {
  const e = err as { message?: string; cause?: { message?: string } };
  const text = `${e?.message ?? ''} ${e?.cause?.message ?? ''}`;
  if (!/UNIQUE constraint failed: port\.device_id, port\.name/.test(text)) return err;
  return new HttpError(422, `${field}: another port on this device already has this name`, {
    fields: { [field]: 'Another port on this device already has this name.' },
  });
}
