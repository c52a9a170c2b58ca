/** Field cards: a device's ports, wiring and key commands with the card's revision, for one device, a machine or a site. */
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { db } from '../../../db/client';
import { command, device, link, linkMember, machine, port } from '../../../db/schema';
import { loadMembers } from '../vault/link-members';
import { portRoutes, type ChainLink } from '../../field/chains';
import type { TeamScope } from '../guard';
import { cardCommand, cardPort, type CardCommand, type CardPort } from '../../field/card';
import { liveDevice, liveMachine, liveSite } from './scope';
import { referencedIds } from '../../composer/saved-sequence';
import { stepCommands } from '../commands/sequences';
import { shownRevisionAs } from '../records/engine';

type DeviceRow = typeof device.$inferSelect;

export interface DeviceCard {
  device: Pick<DeviceRow, 'id' | 'tag' | 'name' | 'role' | 'maker' | 'model' | 'serialNumber' | 'firmware' | 'location' | 'version' | 'machineId'>;
  /** `wiredTo`: what the port is wired to on each of its links, through which converter (`portRoutes`). */
  ports: (CardPort & { version: number; wiredTo: string[] })[];
  commands: CardCommand[];
  /** Changes recorded to the device and its ports (the number printed on the card), and when the last one was. */
  revision: { number: number; date: Date | null };
}

export interface MachineCards {
  machine: { id: string; name: string; code: string; siteId: string };
  site: { id: string; name: string; customer: string };
  cards: DeviceCard[];
}

/** Revision count and latest date per device, over the device's own revisions and its ports' (live or trashed). */
async function revisions(teamId: string, deviceIds: string[]): Promise<Map<string, { number: number; date: Date | null }>> {
  if (!deviceIds.length) return new Map();
  const list = sql.join(deviceIds.map((d) => sql`${d}`), sql`, `);
  const rows = await db.all<{ deviceId: string; n: number; last: number | null }>(sql`
    SELECT x.device_id AS deviceId, count(*) AS n, max(r.created_at) AS last FROM (
      SELECT id AS entity_id, id AS device_id, 'device' AS t FROM device WHERE id IN (${list})
      UNION ALL SELECT id, device_id, 'port' FROM port WHERE device_id IN (${list})
    ) x JOIN revision r ON r.team_id = ${teamId} AND r.entity_id = x.entity_id AND r.entity_type = x.t AND ${shownRevisionAs('r')}
    GROUP BY x.device_id`);
  return new Map(rows.map((r) => [r.deviceId, { number: Number(r.n), date: r.last === null ? null : new Date(Number(r.last)) }]));
}

async function buildCards(ctx: TeamScope, devices: DeviceRow[], heading: (d: DeviceRow) => string): Promise<DeviceCard[]> {
  if (!devices.length) return [];
  const ids = devices.map((d) => d.id);
  const profileIds = devices.map((d) => d.profileId).filter((p): p is string => !!p);
  const [ports, cmds, revs, links] = await Promise.all([
    db.select().from(port).where(and(inArray(port.deviceId, ids), isNull(port.deletedAt))).orderBy(asc(port.position), asc(port.name)),
    db.select().from(command).where(and(
      eq(command.teamId, ctx.team.id), isNull(command.deletedAt),
      profileIds.length ? sql`(${inArray(command.deviceId, ids)} OR ${inArray(command.profileId, profileIds)})` : inArray(command.deviceId, ids),
    )).orderBy(asc(command.name)),
    revisions(ctx.team.id, ids),
    linksOfDevices(ids),
  ]);
  // The commands sequences use as steps, also those in the trash (the card names the gap).
  const steps = await stepCommands(db, ctx, cmds.flatMap((c) => referencedIds(c.sequence)));
  return devices.map((d) => {
    const own = cmds.filter((c) => c.deviceId === d.id);
    const names = new Set(own.map((c) => c.name.toLowerCase()));
    const inherited = d.profileId ? cmds.filter((c) => c.profileId === d.profileId && !names.has(c.name.toLowerCase())) : [];
    const mine = ports.filter((p) => p.deviceId === d.id);
    return {
      device: { id: d.id, tag: d.tag, name: d.name, role: d.role, maker: d.maker, model: d.model, serialNumber: d.serialNumber, firmware: d.firmware, location: d.location, version: d.version, machineId: d.machineId },
      ports: mine.map((p) => ({ ...cardPort(p, heading(d)), version: p.version, wiredTo: portRoutes(p.id, links) })),
      commands: [...own, ...inherited].map((c) => cardCommand(c, mine, (id) => steps.get(id))),
      revision: revs.get(d.id) ?? { number: 0, date: null },
    };
  });
}

/** The live links the devices' live ports are on, with their members (and what lies across a converter). */
async function linksOfDevices(deviceIds: string[]): Promise<ChainLink[]> {
  const rows = await db.selectDistinct({ id: link.id, name: link.name }).from(linkMember)
    .innerJoin(link, eq(link.id, linkMember.linkId))
    .innerJoin(port, eq(port.id, linkMember.portId))
    .where(and(inArray(port.deviceId, deviceIds), isNull(link.deletedAt), isNull(port.deletedAt)))
    .orderBy(asc(link.name));
  if (!rows.length) return [];
  const members = await loadMembers(db, rows.map((r) => r.id));
  // The route names live ports only; the state is not shown on a card.
  return rows.map((r) => ({ ...r, report: { state: 'ok' as const }, members: (members.get(r.id) ?? []).filter((m) => !m.inTrash) }));
}

const label = (d: DeviceRow) => (d.name ? `${d.tag} ${d.name}` : d.tag);

export async function deviceCard(ctx: TeamScope, deviceId: string): Promise<DeviceCard & { machine: MachineCards['machine']; site: MachineCards['site'] }> {
  const d = await liveDevice(ctx, deviceId);
  const m = await liveMachine(ctx, d.machineId);
  const s = await liveSite(ctx, m.siteId);
  const [card] = await buildCards(ctx, [d], label);
  return { ...card!, machine: { id: m.id, name: m.name, code: m.code, siteId: m.siteId }, site: { id: s.id, name: s.name, customer: s.customer } };
}

export async function machineCards(ctx: TeamScope, machineId: string): Promise<MachineCards> {
  const m = await liveMachine(ctx, machineId);
  const s = await liveSite(ctx, m.siteId);
  const devices = await db.select().from(device).where(and(eq(device.machineId, m.id), eq(device.teamId, ctx.team.id), isNull(device.deletedAt))).orderBy(asc(device.tag));
  return {
    machine: { id: m.id, name: m.name, code: m.code, siteId: m.siteId },
    site: { id: s.id, name: s.name, customer: s.customer },
    cards: await buildCards(ctx, devices, label),
  };
}

/** Every live machine of a site with its cards, in name order. */
export async function siteCards(ctx: TeamScope, siteId: string): Promise<{ site: MachineCards['site']; machines: MachineCards[] }> {
  const s = await liveSite(ctx, siteId);
  const machines = await db.select({ id: machine.id }).from(machine).where(and(eq(machine.siteId, s.id), eq(machine.teamId, ctx.team.id), isNull(machine.deletedAt))).orderBy(asc(machine.name));
  const out: MachineCards[] = [];
  for (const m of machines) out.push(await machineCards(ctx, m.id));
  return { site: { id: s.id, name: s.name, customer: s.customer }, machines: out };
}

/** The current card revision of one device (for validating "settings applied from revision N"). */
export async function cardRevision(ctx: TeamScope, deviceId: string) {
  return (await revisions(ctx.team.id, [deviceId])).get(deviceId) ?? { number: 0, date: null };
}
