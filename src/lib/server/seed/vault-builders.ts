/** Fixed-id insert helpers for the demo vault: every call is idempotent (onConflictDoNothing). */
import { db } from '../../../db/client';
import { device, deviceProfile, link, linkMember, machine, port, revision, site, type ProfilePort, type WiringRow } from '../../../db/schema';
import { portSettingsSchema, type PortSettingsInput } from '../../frame/port-settings';
import type { DeviceRole, RecordType } from '../../../db/schema';
import { creationRevision, revisionRow } from '../records/engine';
import { entityOf } from '../records/entities';
import { storedMembers } from '../vault/link-members';
import { busPlanSchema, type StoredBusPlan } from '../../schemas/bus-plan';

export interface SeedCtx {
  teamId: string;
  userId: string;
  userName: string;
}

const settings = (s: PortSettingsInput) => portSettingsSchema.parse(s);

/** The creation revision of a seeded record, as the record engine writes it (snapshot keys from the entity declaration). */
export async function created(c: SeedCtx, type: RecordType, entityId: string, row: Record<string, unknown>, summary: string, revisionId = `rev_${entityId}_1`) {
  const rev = creationRevision(entityOf(type), { ...row, id: entityId }, summary);
  await db.insert(revision).values(revisionRow({ team: { id: c.teamId }, user: { id: c.userId, name: c.userName } }, rev, revisionId)).onConflictDoNothing();
}

export async function addSite(c: SeedCtx, id: string, name: string, customer: string, address: string, notes = '') {
  await db.insert(site).values({ id, teamId: c.teamId, name, customer, address, notes, updatedBy: c.userId }).onConflictDoNothing();
  await created(c, 'site', id, { name, customer, address, notes }, `Created site ${name}`);
}

export async function addMachine(c: SeedCtx, id: string, siteId: string, name: string, code: string, notes = '', plcStringCapacity: number | null = null) {
  await db.insert(machine).values({ id, teamId: c.teamId, siteId, name, code, notes, plcStringCapacity, updatedBy: c.userId }).onConflictDoNothing();
  await created(c, 'machine', id, { siteId, name, code, notes, plcStringCapacity }, `Created machine ${name}`);
}

export interface SeedPort {
  id: string;
  name: string;
  settings: PortSettingsInput;
  wiring?: WiringRow[];
  notes?: string;
}

export interface SeedDevice {
  id: string;
  machineId: string;
  tag: string;
  name: string;
  role: DeviceRole;
  maker: string;
  model: string;
  serialNumber?: string;
  firmware?: string;
  location?: string;
  notes?: string;
  profileId?: string;
  ports: SeedPort[];
  /** A converter's bridged ports, by the seed's port ids. */
  bridges?: [string, string][];
}

export async function addDevice(c: SeedCtx, d: SeedDevice) {
  const { ports, ...fields } = d;
  const row = { serialNumber: '', firmware: '', location: '', notes: '', profileId: null, bridges: [] as [string, string][], ...fields };
  await db.insert(device).values({ ...row, teamId: c.teamId, updatedBy: c.userId }).onConflictDoNothing();
  const { id: _id, ...snap } = row;
  await created(c, 'device', d.id, snap, `Created device ${d.tag}`);
  for (const [i, p] of ports.entries()) {
    const values = { name: p.name, position: i, settings: settings(p.settings), wiring: p.wiring ?? [], notes: p.notes ?? '' };
    await db.insert(port).values({ id: p.id, teamId: c.teamId, deviceId: d.id, ...values, updatedBy: c.userId }).onConflictDoNothing();
    await created(c, 'port', p.id, values, `Created port ${p.name}`);
  }
}

export interface SeedMember {
  portId: string;
  role: 'master' | 'slave' | 'peer';
  isEnd?: boolean;
  dropM?: number;
  tapPorts?: number;
}

export async function addLink(
  c: SeedCtx,
  l: { id: string; machineId: string; name: string; kind: 'point-to-point' | 'rs485-bus'; cableType: string; cableLengthM: number; notes?: string; members: SeedMember[]; busPlan?: StoredBusPlan },
) {
  const { members, ...fields } = l;
  const stored = storedMembers(members);
  const busPlan = l.busPlan ? busPlanSchema.parse(l.busPlan) : null;
  await db.insert(link).values({ notes: '', ...fields, busPlan, teamId: c.teamId, updatedBy: c.userId }).onConflictDoNothing();
  await db
    .insert(linkMember)
    .values(stored.map((m, i) => ({ ...m, linkId: l.id, teamId: c.teamId, position: i })))
    .onConflictDoNothing();
  await created(c, 'link', l.id, { name: l.name, kind: l.kind, cableType: l.cableType, cableLengthM: l.cableLengthM, notes: l.notes ?? '', members: stored, busPlan }, `Created link ${l.name}`);
}

export async function addProfile(c: SeedCtx, id: string, name: string, role: DeviceRole, maker: string, model: string, notes: string, ports: { name: string; settings: PortSettingsInput; wiring?: WiringRow[] }[]) {
  const full: ProfilePort[] = ports.map((p) => ({ name: p.name, settings: settings(p.settings), wiring: p.wiring ?? [], notes: '' }));
  await db.insert(deviceProfile).values({ id, teamId: c.teamId, name, role, maker, model, notes, ports: full, updatedBy: c.userId }).onConflictDoNothing();
  await created(c, 'profile', id, { name, role, maker, model, notes, ports: full }, `Created profile ${name}`);
}
