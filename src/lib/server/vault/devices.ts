/** Devices and their ports: one transaction writes a device, its ports and their revisions. */
import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { device, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { newId } from '../ids';
import type { deviceCreateSchema, deviceUpdateSchema, PortInput } from '../../schemas/vault';
import type { PortSettings } from '../../frame/port-settings';
import { countWhere, findLive, orderBy, recordCreated, updateVersioned, type Page } from './records';
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

const listColumns = {
  id: device.id, tag: device.tag, name: device.name, role: device.role, maker: device.maker, model: device.model,
  serialNumber: device.serialNumber, firmware: device.firmware, location: device.location, version: device.version,
  updatedAt: device.updatedAt, machineId: device.machineId, machineName: machine.name, siteId: machine.siteId, siteName: site.name,
};

export async function listDevices(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; siteId?: string; role?: DeviceRow['role']; q?: string },
): Promise<Page<DeviceListItem>> {
  const match = opts.q ? ftsQuery(opts.q) : null;
  const where = and(
    eq(device.teamId, ctx.team.id),
    isNull(device.deletedAt),
    opts.machineId ? eq(device.machineId, opts.machineId) : undefined,
    opts.siteId ? eq(machine.siteId, opts.siteId) : undefined,
    opts.role ? eq(device.role, opts.role) : undefined,
    match ? sql`${device.id} IN (SELECT device_id FROM device_search WHERE device_search MATCH ${match} AND team_id = ${ctx.team.id})` : undefined,
  );
  const col = { ...listColumns }[opts.sort as (typeof DEVICE_SORTS)[number]];
  const joined = (fields: Record<string, unknown>) =>
    db.select(fields as typeof listColumns).from(device).innerJoin(machine, eq(machine.id, device.machineId)).innerJoin(site, eq(site.id, machine.siteId));
  const needsJoinForCount = !!opts.siteId;
  const [rows, total] = await Promise.all([
    joined(listColumns).where(where).orderBy(...orderBy(col, opts.dir, device.id)).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize),
    needsJoinForCount
      ? db.select({ n: sql<number>`count(*)` }).from(device).innerJoin(machine, eq(machine.id, device.machineId)).where(where).then((r) => Number(r[0]?.n ?? 0))
      : countWhere(device, where),
  ]);
  const ports = rows.length ? await portSummaries(rows.map((r) => r.id)) : new Map();
  const items = rows.map((r) => ({ ...r, ports: ports.get(r.id) ?? [] }));
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: opts.sort, dir: opts.dir };
}

/** Name and shorthand of every live port of `deviceIds`, in one query. */
export async function portSummaries(deviceIds: string[]): Promise<Map<string, DeviceListItem['ports']>> {
  // Parsing the settings JSON here is cheaper than six json_extract calls per port in SQL.
  const rows = await db.all<{ id: string; deviceId: string; name: string; settings: string }>(sql`
    SELECT id, device_id AS deviceId, name, settings
    FROM port WHERE device_id IN (${sql.join(deviceIds.map((id) => sql`${id}`), sql`, `)}) AND deleted_at IS NULL
    ORDER BY device_id, position`);
  const out = new Map<string, DeviceListItem['ports']>();
  for (const r of rows) {
    const settings = JSON.parse(r.settings) as PortSettings;
    const list = out.get(r.deviceId) ?? [];
    list.push({ id: r.id, name: r.name, shorthand: shorthandOf(settings), interface: settings.interface });
    out.set(r.deviceId, list);
  }
  return out;
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
