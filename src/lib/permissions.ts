/**
 * The one permission table: resource → action → roles allowed.
 * Used by the server guard (which enforces) and by the UI (which only hides).
 */
export const ROLES = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  admin: 'Admin',
  engineer: 'Engineer',
  technician: 'Technician',
  viewer: 'Viewer',
};

export const ROLE_SUMMARIES: Record<Role, string> = {
  owner: 'Everything, including deleting the team and handing over ownership.',
  admin: 'Manages members and invitations, and everything an engineer can.',
  engineer: 'Creates, edits and deletes sites, machines, devices, ports and commands.',
  technician: 'Reads everything, copies settings, adds field-log entries and photos.',
  viewer: 'Reads only.',
};

const ALL: readonly Role[] = ROLES;
const STAFF: readonly Role[] = ['owner', 'admin'];
const EDITORS: readonly Role[] = ['owner', 'admin', 'engineer'];
const FIELD: readonly Role[] = ['owner', 'admin', 'engineer', 'technician'];
const OWNER: readonly Role[] = ['owner'];

const vaultRecord = { read: ALL, create: EDITORS, update: EDITORS, delete: EDITORS } as const;

export const PERMISSIONS = {
  team: { read: ALL, update: STAFF, delete: OWNER, transfer: OWNER },
  member: { read: ALL, invite: STAFF, update: STAFF, remove: STAFF },
  site: vaultRecord,
  machine: vaultRecord,
  device: { ...vaultRecord, copy: FIELD },
  port: vaultRecord,
  link: vaultRecord,
  profile: vaultRecord,
  command: vaultRecord,
  revision: { read: ALL, restore: EDITORS },
  trash: { read: EDITORS, restore: EDITORS, purge: STAFF },
  fieldLog: { read: ALL, create: FIELD, annotate: FIELD },
  /** What a replacement or finding on site proposes for the record: engineers and above accept or decline it. */
  proposal: { read: ALL, decide: EDITORS },
  attachment: { read: ALL, create: FIELD, delete: EDITORS },
  share: { read: EDITORS, create: EDITORS, revoke: EDITORS },
  transfer: { export: EDITORS, import: EDITORS },
} as const satisfies Record<string, Record<string, readonly Role[]>>;

export type Resource = keyof typeof PERMISSIONS;
export type Action<R extends Resource> = keyof (typeof PERMISSIONS)[R] & string;
/** `resource:action`, e.g. `device:update`. */
export type Permission = { [R in Resource]: `${R}:${Action<R>}` }[Resource];

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  const [resource, action] = permission.split(':') as [Resource, string];
  const allowed = (PERMISSIONS[resource] as Record<string, readonly Role[]>)[action];
  return allowed?.includes(role) ?? false;
}

/** Roles a member with `role` may hand out when inviting or changing roles (never owner). */
export function assignableRoles(role: Role): Role[] {
  if (role === 'owner' || role === 'admin') return ['admin', 'engineer', 'technician', 'viewer'];
  return [];
}
