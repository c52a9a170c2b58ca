/** What each vault record keeps in its revisions, and how it is named in lists. */
import { device, deviceProfile, link, machine, port, site } from '../../../db/schema';
import type { EntitySpec } from './records';
import { hydrateLink, replaceMembers, type StoredMember } from './link-members';

type SiteRow = typeof site.$inferSelect;
type MachineRow = typeof machine.$inferSelect;
type DeviceRow = typeof device.$inferSelect;
type PortRow = typeof port.$inferSelect;
type LinkRow = typeof link.$inferSelect & { members?: StoredMember[] };
type ProfileRow = typeof deviceProfile.$inferSelect;
export type { SiteRow, MachineRow, DeviceRow, PortRow, LinkRow, ProfileRow };

export const siteSpec: EntitySpec<SiteRow> = {
  type: 'site',
  noun: 'site',
  table: site,
  snapshot: (r) => ({ name: r.name, customer: r.customer, address: r.address, notes: r.notes }),
  describe: (r) => r.name,
};

export const machineSpec: EntitySpec<MachineRow> = {
  type: 'machine',
  noun: 'machine',
  table: machine,
  snapshot: (r) => ({ siteId: r.siteId, name: r.name, code: r.code, notes: r.notes }),
  describe: (r) => r.name,
};

export const DEVICE_FIELDS = ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'firmware', 'location', 'notes'] as const;

export const deviceSpec: EntitySpec<DeviceRow> = {
  type: 'device',
  noun: 'device',
  table: device,
  snapshot: (r) => ({
    machineId: r.machineId,
    profileId: r.profileId,
    ...Object.fromEntries(DEVICE_FIELDS.map((f) => [f, r[f]])),
  }),
  describe: (r) => (r.name ? `${r.tag} ${r.name}` : r.tag),
};

export const portSpec: EntitySpec<PortRow> = {
  type: 'port',
  noun: 'port',
  table: port,
  snapshot: (r) => ({ name: r.name, position: r.position, settings: r.settings, wiring: r.wiring, notes: r.notes }),
  describe: (r) => r.name,
};

export const linkSpec: EntitySpec<LinkRow> = {
  type: 'link',
  noun: 'link',
  table: link,
  snapshot: (r) => ({
    name: r.name,
    kind: r.kind,
    cableType: r.cableType,
    cableLengthM: r.cableLengthM,
    notes: r.notes,
    members: r.members ?? [],
  }),
  describe: (r) => r.name,
  hydrate: (q, row) => hydrateLink(q, row),
  extraKeys: ['members'],
  writeExtra: async (q, ctx, id, values) => {
    if (values.members) await replaceMembers(q, ctx, id, values.members as StoredMember[]);
  },
};

export const profileSpec: EntitySpec<ProfileRow> = {
  type: 'profile',
  noun: 'profile',
  table: deviceProfile,
  snapshot: (r) => ({ name: r.name, role: r.role, maker: r.maker, model: r.model, notes: r.notes, ports: r.ports }),
  describe: (r) => r.name,
};

export const SPECS = { site: siteSpec, machine: machineSpec, device: deviceSpec, port: portSpec, link: linkSpec, profile: profileSpec } as const;
