/** Devices and their ports: one transaction writes a device, its ports and their revisions. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import type { z } from 'zod';
import { client, db, type DbOrTx } from '../../../db/client';
import { device, machine, port, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { deviceCreateSchema, deviceUpdateSchema, PortInput } from '../../schemas/vault';
import { findLive, recordCreated, updateVersioned, type Page } from './records';
import { deviceEntity, machineEntity, portEntity, profileEntity, type DeviceRow, type PortRow } from '../records/entities';
import { presentPort, type PortView } from './present';
import { definedOnly } from '../records/diff';
import { deviceListQuery, type DeviceListOptions } from './device-list-sql';
import { duplicateFrom, Invalid, notFound } from '../errors';
import type { BridgePair } from '../../../db/schema';
import { formerSerialsAfter } from '../../field/serials';

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

/**
 * One page of the team's devices, with the total and each device's port shorthand, as the JSON text
 * the API sends: one statement, in which the page's ids come straight off a list-order index and
 * SQLite assembles the page (device, machine, site and ports). One round trip, and no row mapping,
 * parsing or serialising in JavaScript (docs/vault.md, "Performance").
 */
export async function listDevicesJson(ctx: TeamContext, opts: DeviceListOptions): Promise<string> {
  const { rows } = await client.execute(deviceListQuery(ctx.team.id, opts));
  return rows[0]!.page as string;
}

/** What the device list says beside `Page`: whether `total` stopped at the cap, and the cursor of the next page. */
export interface DeviceListExtras { totalCapped: boolean; next: string | null }

/** The same page as objects, for pages and exports that read it on the server. */
export async function listDevices(ctx: TeamContext, opts: DeviceListOptions): Promise<Page<DeviceListItem> & DeviceListExtras> {
  const page = JSON.parse(await listDevicesJson(ctx, opts)) as Page<Omit<DeviceListItem, 'updatedAt'> & { updatedAt: string }> & DeviceListExtras;
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
  if (!row) throw notFound('device');
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
    await recordCreated(tx, ctx, portEntity, row!);
    out.push(row!);
  }
  return out;
}

export async function createDevice(ctx: TeamContext, input: z.infer<typeof deviceCreateSchema>): Promise<DeviceView> {
  const { ports, profileId, ...fields } = input;
  return db.transaction(async (tx) => {
    await findLive(tx, ctx, machineEntity, fields.machineId);
    const profile = profileId ? await findLive(tx, ctx, profileEntity, profileId) : null;
    const values = {
      ...fields,
      role: fields.role ?? profile?.role ?? 'other',
      maker: fields.maker || profile?.maker || '',
      model: fields.model || profile?.model || '',
    };
    let row: DeviceRow | undefined;
    try {
      [row] = await tx
        .insert(device)
        .values({ id: newId('dev'), teamId: ctx.team.id, profileId: profile?.id ?? null, ...values, updatedBy: ctx.user.id })
        .returning();
    } catch (err) {
      throw uniqueTag(err);
    }
    await recordCreated(tx, ctx, deviceEntity, row!, profile ? `Created device ${row!.tag} from profile ${profile.name}` : undefined);
    await insertPorts(tx, ctx, row!.id, ports ?? profile?.ports ?? []);
    return getDevice(ctx, row!.id, tx);
  });
}

export async function updateDevice(ctx: TeamContext, id: string, input: z.infer<typeof deviceUpdateSchema>): Promise<DeviceView> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => {
    if (values.machineId) await findLive(tx, ctx, machineEntity, values.machineId);
    const now = await findLive(tx, ctx, deviceEntity, id);
    const former = values.serialNumber === undefined ? null : formerSerialsAfter(now, values.serialNumber);
    await assertBridges(tx, id, values.role ?? now.role, values.bridges ?? now.bridges, values.bridges !== undefined);
    try {
      await updateVersioned(tx, ctx, deviceEntity, id, version, { ...definedOnly(values), ...(former ? { formerSerials: former } : {}) }, { present: () => getDevice(ctx, id, tx) });
    } catch (err) {
      throw uniqueTag(err);
    }
    return getDevice(ctx, id, tx);
  });
}

/**
 * Maps a unique-index failure of a device write to a field message (the only unique index on devices is the one
 * on (machine, tag ignoring case)); other errors pass through.
 */
export function uniqueTag(err: unknown, field = 'tag'): unknown {
  return duplicateFrom(err, field, `${field}: another device on this machine already has this tag (letter case aside)`, 'Another device on this machine already has this tag (letter case aside).');
}

/**
 * Maps a unique-index failure of a port write to a field message (the only unique index on ports is the one
 * on (device, name ignoring case)); other errors pass through.
 */
export function uniqueName(err: unknown, field: string): unknown {
  return duplicateFrom(err, field, `${field}: another port on this device already has this name (letter case aside)`, 'Another port on this device already has this name (letter case aside).');
}

/**
 * A device's bridges after an update: only a converter has any, and each pair joins two of its live ports.
 * `sent`: the update sets the bridges (a role change alone checks only the role). Answers 422, writing nothing.
 */
async function assertBridges(q: DbOrTx, deviceId: string, role: DeviceRow['role'], bridges: BridgePair[], sent: boolean): Promise<void> {
  if (bridges.length === 0) return;
  if (role !== 'converter') {
    const message = sent
      ? 'Only a converter bridges its ports; set the role to Converter first (or send no bridges).'
      : 'This device bridges its ports; remove its bridges before changing its role from Converter.';
    throw new Invalid(message, { fields: { [sent ? 'bridges' : 'role']: message } });
  }
  if (!sent) return;
  const own = new Set((await livePorts(q, deviceId)).map((p) => p.id));
  const fields: Record<string, string> = {};
  bridges.forEach((pair, i) => pair.forEach((portId, j) => {
    if (!own.has(portId)) fields[`bridges.${i}.${j}`] = 'No live port with that id on this device; bridge two of its own ports.';
  }));
  const keys = Object.keys(fields);
  if (keys.length) throw new Invalid(`${keys[0]}: ${fields[keys[0]!]}`, { fields });
}
