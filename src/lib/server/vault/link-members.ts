/** Link members: which ports a link joins, with their roles; loaded for many links in one query. */
import { and, asc, eq, inArray, isNull, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../../db/client';
import { device, link, linkMember, port } from '../../../db/schema';
import type { PortSettings } from '../../frame/port-settings';
import type { TeamContext } from '../guard';
import type { LinkMemberInput } from '../../schemas/vault';
import { NotFound } from '../errors';

export interface StoredMember {
  portId: string;
  role: 'master' | 'slave' | 'peer';
  isEnd: boolean | null;
  unitLoads: number | null;
  /** Drop (stub) cable, m, and ports on its tap (the bus planner); null when not recorded. */
  dropM: number | null;
  tapPorts: number | null;
}

export interface MemberView extends StoredMember {
  portName: string;
  deviceId: string;
  deviceTag: string;
  deviceName: string;
  settings: PortSettings;
  /** The port or its device is in the trash: shown, but left out of the link check. */
  inTrash: boolean;
  /** The port is one side of a converter: its port on the other side and what is linked there (one step deep). */
  bridge?: MemberBridge;
}

/** Across a converter: its bridged port on the other side, and the live ports on that port's links. */
export interface MemberBridge {
  deviceId: string;
  deviceTag: string;
  other: { portId: string; portName: string; settings: PortSettings };
  beyond: MemberView[];
}

interface Loaded extends MemberView {
  linkId: string;
  bridges: [string, string][] | null;
}

async function loadRows(q: DbOrTx, where: SQL): Promise<Loaded[]> {
  const rows = await q
    .select({
      linkId: linkMember.linkId, portId: linkMember.portId, role: linkMember.role, isEnd: linkMember.isEnd, unitLoads: linkMember.unitLoads,
      dropM: linkMember.dropM, tapPorts: linkMember.tapPorts,
      portName: port.name, settings: port.settings, portDeleted: port.deletedAt,
      deviceId: device.id, deviceTag: device.tag, deviceName: device.name, deviceDeleted: device.deletedAt, deviceRole: device.role, bridges: device.bridges,
    })
    .from(linkMember)
    .innerJoin(port, eq(port.id, linkMember.portId))
    .innerJoin(device, eq(device.id, port.deviceId))
    .where(where)
    .orderBy(asc(linkMember.linkId), asc(linkMember.position));
  return rows.map((r) => ({
    linkId: r.linkId, portId: r.portId, role: r.role, isEnd: r.isEnd, unitLoads: r.unitLoads, dropM: r.dropM, tapPorts: r.tapPorts, portName: r.portName, deviceId: r.deviceId,
    deviceTag: r.deviceTag, deviceName: r.deviceName, settings: r.settings, inTrash: !!(r.portDeleted || r.deviceDeleted),
    bridges: r.deviceRole === 'converter' && !r.deviceDeleted && r.bridges.length > 0 ? r.bridges : null,
  }));
}

const plain = ({ linkId: _l, bridges: _b, ...m }: Loaded): MemberView => m;

/**
 * The members of each link, in their order; a converter's port carries what lies across its bridge (the bridged
 * port, and the other members of the live links that port is on). One step: a second converter beyond is shown
 * as a port, its own bridge not followed (its own links check what lies beyond it).
 */
export async function loadMembers(q: DbOrTx, linkIds: string[]): Promise<Map<string, MemberView[]>> {
  const out = new Map<string, MemberView[]>();
  if (linkIds.length === 0) return out;
  const rows = await loadRows(q, inArray(linkMember.linkId, linkIds));
  const partnerOf = new Map<string, string>();
  for (const r of rows) {
    for (const [a, b] of r.bridges ?? []) {
      if (a === r.portId) partnerOf.set(r.portId, b);
      if (b === r.portId) partnerOf.set(r.portId, a);
    }
  }
  const across = partnerOf.size ? await loadAcross(q, [...new Set(partnerOf.values())]) : new Map<string, Across>();
  for (const r of rows) {
    const list = out.get(r.linkId) ?? [];
    const m = plain(r);
    const far = !r.inTrash ? across.get(partnerOf.get(r.portId) ?? '') : undefined;
    if (far) {
      const beyond = far.beyond.filter((b) => b.linkId !== r.linkId && b.portId !== r.portId).map(plain);
      list.push({ ...m, bridge: { deviceId: r.deviceId, deviceTag: r.deviceTag, other: far.other, beyond } });
    } else list.push(m);
    out.set(r.linkId, list);
  }
  return out;
}

interface Across {
  other: MemberBridge['other'];
  beyond: Loaded[];
}

/** For each live bridged port: itself, and the live members (other than it) of the live links it is on. */
async function loadAcross(q: DbOrTx, portIds: string[]): Promise<Map<string, Across>> {
  const out = new Map<string, Across>();
  const ports = await q
    .select({ id: port.id, name: port.name, settings: port.settings })
    .from(port)
    .where(and(inArray(port.id, portIds), isNull(port.deletedAt)));
  if (ports.length === 0) return out;
  const on = await q
    .select({ linkId: linkMember.linkId, portId: linkMember.portId })
    .from(linkMember)
    .innerJoin(link, eq(link.id, linkMember.linkId))
    .where(and(inArray(linkMember.portId, ports.map((p) => p.id)), isNull(link.deletedAt)));
  const rows = on.length ? await loadRows(q, inArray(linkMember.linkId, [...new Set(on.map((o) => o.linkId))])) : [];
  for (const p of ports) {
    const links = new Set(on.filter((o) => o.portId === p.id).map((o) => o.linkId));
    const beyond = rows.filter((r) => links.has(r.linkId) && r.portId !== p.id && !r.inTrash);
    out.set(p.id, { other: { portId: p.id, portName: p.name, settings: p.settings }, beyond });
  }
  return out;
}

/** Members as a link keeps them; a field left out is null (not recorded). */
export function storedMembers(members: (Pick<StoredMember, 'portId' | 'role'> & Partial<StoredMember>)[]): StoredMember[] {
  return members.map((m) => ({ portId: m.portId, role: m.role, isEnd: m.isEnd ?? null, unitLoads: m.unitLoads ?? null, dropM: m.dropM ?? null, tapPorts: m.tapPorts ?? null }));
}

/** An update's members: a drop or tap size left out keeps the one the port has as a member now (the members table does not edit them). */
export function keepDrops(members: LinkMemberInput[], now: StoredMember[]): StoredMember[] {
  const before = new Map(now.map((m) => [m.portId, m]));
  return storedMembers(members.map((m) => ({
    ...m,
    dropM: m.dropM !== undefined ? m.dropM : (before.get(m.portId)?.dropM ?? null),
    tapPorts: m.tapPorts !== undefined ? m.tapPorts : (before.get(m.portId)?.tapPorts ?? null),
  })));
}

/** 404-style field errors for ports that are not live ports of the caller's team. */
export async function assertMemberPorts(q: DbOrTx, ctx: TeamContext, members: LinkMemberInput[]): Promise<void> {
  if (members.length === 0) return;
  const ids = members.map((m) => m.portId);
  const found = await q
    .select({ id: port.id })
    .from(port)
    .innerJoin(device, eq(device.id, port.deviceId))
    .where(and(inArray(port.id, ids), eq(port.teamId, ctx.team.id), isNull(port.deletedAt), isNull(device.deletedAt)));
  const ok = new Set(found.map((f) => f.id));
  const fields: Record<string, string> = {};
  members.forEach((m, i) => {
    if (!ok.has(m.portId)) fields[`members.${i}.portId`] = 'No port with that id in this team.';
  });
  const keys = Object.keys(fields);
  if (keys.length) throw new NotFound(`${keys[0]}: no port with that id in this team`, { fields });
}

export async function replaceMembers(q: DbOrTx, ctx: TeamContext, linkId: string, members: StoredMember[] | LinkMemberInput[]): Promise<void> {
  await q.delete(linkMember).where(eq(linkMember.linkId, linkId));
  if (members.length === 0) return;
  await q.insert(linkMember).values(
    members.map((m, i) => ({
      linkId, portId: m.portId, teamId: ctx.team.id, role: m.role, position: i, isEnd: m.isEnd ?? null, unitLoads: m.unitLoads ?? null, dropM: m.dropM ?? null, tapPorts: m.tapPorts ?? null,
    })),
  );
}

export function hydrateLink<T extends { id: string }>(q: DbOrTx, row: T): Promise<T & { members: StoredMember[] }> {
  return loadMembers(q, [row.id]).then((m) => ({ ...row, members: storedMembers(m.get(row.id) ?? []) }));
}

