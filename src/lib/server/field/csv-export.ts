/** CSV export of a vault list with the same filters and sort as its list endpoint (all pages). */
import Papa from 'papaparse';
import { and, asc, desc, eq, isNull } from 'drizzle-orm';
import { db } from '../../../db/client';
import { device, machine, port } from '../../../db/schema';
import type { TeamContext } from '../guard';
import type { Page } from '../vault/records';
import { deviceListParams, linkListParams, machineListParams, portExportParams, profileListParams, siteListParams } from '../vault/list-params';
import { listSites } from '../vault/sites';
import { listMachines } from '../vault/machines';
import { listDevices } from '../vault/devices';
import { parseDeviceCursor } from '../vault/device-list-sql';
import { listLinks } from '../vault/links';
import { listProfiles } from '../vault/profiles';
import { portShorthand } from '../../frame/port-text';
import { guardCell } from '../../field/csv';
import { nextTurn } from '../jobs/turns';
import { Invalid } from '../errors';

export const CSV_TABLES = ['sites', 'machines', 'devices', 'ports', 'links', 'profiles'] as const;
export type CsvTable = (typeof CSV_TABLES)[number];
const MAX_ROWS = 100_000;

async function allPages<T>(fetch: (page: number) => Promise<Page<T>>): Promise<T[]> {
  const out: T[] = [];
  for (let page = 1; ; page++) {
    if (page > 1) await nextTurn();
    const p = await fetch(page);
    out.push(...p.items);
    if (out.length >= p.total || p.items.length === 0 || out.length >= MAX_ROWS) return out;
  }
}

type Rows = { columns: string[]; rows: unknown[][] };

async function tableRows(ctx: TeamContext, table: CsvTable, url: URL): Promise<Rows> {
  const u = new URL(url);
  u.searchParams.delete('table');
  u.searchParams.delete('page');
  u.searchParams.set('pageSize', '200');
  if (table === 'sites') {
    const o = siteListParams(u);
    const items = await allPages((page) => listSites(ctx, { ...o, page }));
    return { columns: ['id', 'name', 'customer', 'address', 'machines', 'devices', 'version', 'updatedAt'], rows: items.map((s) => [s.id, s.name, s.customer, s.address, s.machineCount, s.deviceCount, s.version, s.updatedAt]) };
  }
  if (table === 'machines') {
    const o = machineListParams(u);
    const items = await allPages((page) => listMachines(ctx, { ...o, page }));
    return { columns: ['id', 'site', 'name', 'code', 'devices', 'links', 'version', 'updatedAt'], rows: items.map((m) => [m.id, m.siteName, m.name, m.code, m.deviceCount, m.linkCount, m.version, m.updatedAt]) };
  }
  if (table === 'devices') {
    const o = deviceListParams(u);
    const items: Awaited<ReturnType<typeof listDevices>>['items'] = [];
    // Page after page by the list's cursor (an offset would read every earlier row again on each page).
    for (let after = o.after; ;) {
      if (items.length) await nextTurn();
      const p = await listDevices(ctx, { ...o, page: 1, after });
      items.push(...p.items);
      if (!p.next || p.items.length === 0 || items.length >= MAX_ROWS) break;
      after = parseDeviceCursor(p.next)!;
    }
    return {
      columns: ['id', 'site', 'machine', 'tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'firmware', 'location', 'ports', 'version', 'updatedAt'],
      rows: items.map((d) => [d.id, d.siteName, d.machineName, d.tag, d.name, d.role, d.maker, d.model, d.serialNumber, d.firmware, d.location, d.ports.map((p) => `${p.name}: ${p.shorthand}`).join('; '), d.version, d.updatedAt]),
    };
  }
  if (table === 'links') {
    const o = linkListParams(u);
    const items = await allPages((page) => listLinks(ctx, { ...o, page }));
    return { columns: ['id', 'name', 'kind', 'cableType', 'cableLengthM', 'members', 'version', 'updatedAt'], rows: items.map((l) => [l.id, l.name, l.kind, l.cableType, l.cableLengthM, l.members.length, l.version, l.updatedAt]) };
  }
  if (table === 'profiles') {
    const o = profileListParams(u);
    const items = await allPages((page) => listProfiles(ctx, { ...o, page }));
    return { columns: ['id', 'name', 'role', 'maker', 'model', 'ports', 'devices', 'version', 'updatedAt'], rows: items.map((f) => [f.id, f.name, f.role, f.maker, f.model, f.shorthands.join('; '), f.deviceCount, f.version, f.updatedAt]) };
  }
  // Ports have no list endpoint of their own: every live port of the team, or of one device or machine.
  const o = portExportParams(u);
  const rows = await db.select({ port, tag: device.tag, machineName: machine.name, bridges: device.bridges }).from(port)
    .innerJoin(device, eq(device.id, port.deviceId)).innerJoin(machine, eq(machine.id, device.machineId))
    .where(and(eq(port.teamId, ctx.team.id), isNull(port.deletedAt), isNull(device.deletedAt), o.deviceId ? eq(port.deviceId, o.deviceId) : undefined, o.machineId ? eq(device.machineId, o.machineId) : undefined))
    .orderBy(o.dir === 'desc' ? desc(device.tag) : asc(device.tag), asc(port.position)).limit(MAX_ROWS);
  return {
    columns: ['id', 'machine', 'deviceTag', 'portName', 'shorthand', 'interface', 'baud', 'dataBits', 'parity', 'stopBits', 'handshake', 'rtsMode', 'ctsMode', 'dtrMode', 'rtsLeadMs', 'rtsTailMs', 'echo', 'nodeAddress', 'termination', 'protocol', 'bridgedTo', 'version'],
    rows: rows.map(({ port: p, tag, machineName, bridges }) => {
      const s = p.settings;
      const pair = bridges.find((b) => b.includes(p.id));
      const other = pair ? rows.find((r) => r.port.id === (pair[0] === p.id ? pair[1] : pair[0])) : undefined;
      return [p.id, machineName, tag, p.name, portShorthand(s), s.interface, s.baud, s.dataBits, s.parity, s.stopBits, s.handshake, s.rtsMode, s.ctsMode, s.dtrMode, s.rtsLeadMs, s.rtsTailMs, s.echo ? 'yes' : 'no', s.nodeAddress, s.termination ? 'yes' : 'no', s.protocol, other?.port.name ?? '', p.version];
    }),
  };
}

export async function exportCsv(ctx: TeamContext, url: URL): Promise<{ filename: string; csv: string }> {
  const table = url.searchParams.get('table');
  if (!table || !(CSV_TABLES as readonly string[]).includes(table)) {
    throw new Invalid(`table: choose one of ${CSV_TABLES.join(', ')}`, { fields: { table: `One of ${CSV_TABLES.join(', ')}.` } });
  }
  const { columns, rows } = await tableRows(ctx, table as CsvTable, url);
  const csv = Papa.unparse({ fields: columns, data: rows.map((r) => r.map(guardCell)) }, { newline: '\r\n' });
  return { filename: `${table}-${new Date().toISOString().slice(0, 10)}.csv`, csv: `\ufeff${csv}` };
}
