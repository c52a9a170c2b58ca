/**
 * Every versioned record, declared once: its table, what its revisions keep, the record it lives under,
 * what else it points at, and how it is named in words. The engine (./engine.ts), the trash, history,
 * imports and the seed all read these declarations.
 */
import type { InferSelectModel } from 'drizzle-orm';
import { command, device, deviceProfile, link, machine, port, site, type EntityType, type RecordType } from '../../../db/schema';
import { hydrateLink, replaceMembers, type StoredMember } from '../vault/link-members';
import { defineEntity, type AnyEntity } from './entity';

export type SiteRow = InferSelectModel<typeof site>;
export type MachineRow = InferSelectModel<typeof machine>;
export type DeviceRow = InferSelectModel<typeof device>;
export type PortRow = InferSelectModel<typeof port>;
export type LinkRow = InferSelectModel<typeof link> & { members?: StoredMember[] };
export type ProfileRow = InferSelectModel<typeof deviceProfile>;
export type CommandRow = InferSelectModel<typeof command>;

export const siteEntity = defineEntity({
  type: 'site',
  noun: 'site',
  table: site,
  snapshotKeys: ['name', 'customer', 'address', 'notes'],
  describe: (r) => r.name,
});

export const machineEntity = defineEntity({
  type: 'machine',
  noun: 'machine',
  table: machine,
  snapshotKeys: ['siteId', 'name', 'code', 'notes', 'plcStringCapacity'],
  parent: { field: 'siteId', type: 'site' },
  describe: (r) => r.name,
});

export const DEVICE_FIELDS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'firmware', 'location', 'notes'] as const;

export const deviceEntity = defineEntity({
  type: 'device',
  noun: 'device',
  table: device,
  snapshotKeys: ['machineId', 'profileId', ...DEVICE_FIELDS, 'bridges'],
  parent: { field: 'machineId', type: 'machine' },
  references: [{ field: 'profileId', type: 'profile' }],
  describe: (r) => (r.name ? `${r.tag} ${r.name}` : r.tag),
});

export const portEntity = defineEntity({
  type: 'port',
  noun: 'port',
  table: port,
  snapshotKeys: ['name', 'position', 'settings', 'wiring', 'notes'],
  parent: { field: 'deviceId', type: 'device' },
  describe: (r) => r.name,
});

export const linkEntity = defineEntity<typeof link, LinkRow>({
  type: 'link',
  noun: 'link',
  table: link,
  snapshotKeys: ['name', 'kind', 'cableType', 'cableLengthM', 'notes', 'members', 'busPlan'],
  parent: { field: 'machineId', type: 'machine' },
  describe: (r) => r.name,
  pointsAt: (state) => (Array.isArray(state.members) ? (state.members as StoredMember[]).map((m) => ({ type: 'port' as const, id: m.portId, field: 'members' })) : []),
  hydrate: (q, row) => hydrateLink(q, row),
  extraKeys: ['members'],
  writeExtra: async (q, ctx, id, values) => {
    if (values.members) await replaceMembers(q, ctx, id, values.members as StoredMember[]);
  },
});

export const profileEntity = defineEntity({
  type: 'profile',
  noun: 'profile',
  table: deviceProfile,
  snapshotKeys: ['name', 'role', 'maker', 'model', 'notes', 'ports'],
  describe: (r) => r.name,
});

/**
 * A command of the library, kept on a device or on a profile (exactly one of the two). It is not moved to the
 * trash with its owner, and leaves the trash by restoring one of its revisions, so its owner is a reference
 * (checked on restore), not a parent.
 */
export const commandEntity = defineEntity({
  type: 'command',
  noun: 'command',
  table: command,
  snapshotKeys: ['name', 'purpose', 'template', 'fieldValues', 'presets', 'replyTemplate', 'portName', 'rawUnits', 'notes', 'movesMachinery', 'safeToRepeat', 'setsUpDevice', 'sequence'],
  references: [{ field: 'deviceId', type: 'device' }, { field: 'profileId', type: 'profile' }],
  describe: (r) => r.name,
});

/** Every vault entity by its type, parents before children (the order imports fill tables in). */
export const ENTITIES = {
  site: siteEntity,
  machine: machineEntity,
  profile: profileEntity,
  device: deviceEntity,
  port: portEntity,
  link: linkEntity,
} as const satisfies Record<EntityType, unknown>;

/**
 * The entity of `type`, as code that works on every kind of record sees it (trash, history, references): rows
 * as records of unknown values. The one widening of a declaration; each was checked against its table above.
 */
export function entityOf(type: RecordType): AnyEntity {
  return (type === 'command' ? commandEntity : ENTITIES[type]) as unknown as AnyEntity;
}

/** The entities that live directly under `type` (a site's machines, a machine's devices and links, …). */
export function childrenOf(type: RecordType): AnyEntity[] {
  return (Object.keys(ENTITIES) as EntityType[]).map(entityOf).filter((e) => e.parent?.type === type);
}
