/** Devices and their ports: one transaction writes a device, its ports and their revisions. */
import { and, asc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { device, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { newId } from '../ids';
import type { deviceCreateSchema, deviceUpdateSchema, PortInput } from '../../schemas/vault';
import type { PortSettings } from '../../frame/port-settings';
import { findLive, recordCreated, updateVersioned, type Page } from './records';
import { deviceSpec, machineSpec, portSpec, profileSpec, type DeviceRow, type PortRow } from './specs';
import { presentPort, shorthandOf, type PortView } from './present';
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

/**
 * One page of the team's devices with the total and each device's port shorthand, in one statement:
 * the page's ids come straight off a list-order index, then SQLite assembles the page (device, machine,
 * site and ports) as one JSON text. One round trip and one JSON.parse replace three queries and their
 * row mapping, which is where the device list's time went (docs/vault.md, "Performance").
 */
export async function listDevices(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; siteId?: string; role?: DeviceRow['role']; q?: string },
): Promise<Page<DeviceListItem>> {
  const match = opts.q ? ftsQuery(opts.q) : null;
  const conditions = [
    sql`device.team_id = ${ctx.team.id} AND device.deleted_at IS NULL`,
    opts.machineId ? sql`device.machine_id = ${opts.machineId}` : undefined,
    opts.siteId ? sql`machine.site_id = ${opts.siteId}` : undefined,
    opts.role ? sql`device.role = ${opts.role}` : undefined,
    match ? sql`device.id IN (SELECT device_id FROM device_search WHERE device_search MATCH ${match} AND team_id = ${ctx.team.id})` : undefined,
  ].filter((c): c is SQL => c !== undefined);
  const where = sql.join(conditions, sql` AND `);
  const order = SORT_SQL[opts.sort as (typeof DEVICE_SORTS)[number]] ?? SORT_SQL.tag;
  const dir = sql.raw(opts.dir === 'desc' ? 'DESC' : 'ASC');
  const needsMachine = order.joins !== 'none' || !!opts.siteId;
  const joins = sql.join([needsMachine ? JOIN_MACHINE : undefined, order.joins === 'site' ? JOIN_SITE : undefined].filter((j): j is SQL => !!j), sql` `);
  const countJoins = opts.siteId ? JOIN_MACHINE : sql``;
  const row = await db.get<{ total: number; items: string }>(sql`
    WITH page AS (
      SELECT device.id AS id, ${order.key} AS k FROM device ${joins} WHERE ${where}
      ORDER BY k ${dir}, device.id LIMIT ${opts.pageSize} OFFSET ${(opts.page - 1) * opts.pageSize}
    )
    SELECT
      (SELECT count(*) FROM device ${countJoins} WHERE ${where}) AS total,
      (SELECT json_group_array(json_object(
         'id', device.id, 'tag', device.tag, 'name', device.name, 'role', device.role, 'maker', device.maker,
         'model', device.model, 'serialNumber', device.serial_number, 'firmware', device.firmware,
         'location', device.location, 'version', device.version, 'updatedAt', device.updated_at,
         'machineId', device.machine_id, 'machineName', machine.name, 'siteId', machine.site_id, 'siteName', site.name,
         'ports', (SELECT json_group_array(json_object('id', port.id, 'name', port.name, 'settings', json(port.settings)) ORDER BY port.position, port.id)
                   FROM port WHERE port.device_id = device.id AND port.deleted_at IS NULL)
       ) ORDER BY page.k ${dir}, page.id)
       FROM page JOIN device ON device.id = page.id ${JOIN_MACHINE} ${JOIN_SITE}) AS items`);
  const raw = JSON.parse(row!.items) as (Omit<DeviceListItem, 'updatedAt' | 'ports'> & {
    updatedAt: number;
    ports: { id: string; name: string; settings: PortSettings }[];
  })[];
  const items: DeviceListItem[] = raw.map((d) => ({
    ...d,
    updatedAt: new Date(d.updatedAt),
    ports: d.ports.map((p) => ({ id: p.id, name: p.name, shorthand: shorthandOf(p.settings), interface: p.settings.interface })),
  }));
  return { items, page: opts.page, pageSize: opts.pageSize, total: Number(row!.total), sort: opts.sort, dir: opts.dir };
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
