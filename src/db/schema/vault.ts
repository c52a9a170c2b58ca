/**
 * The settings vault: site → machine → device → port, links joining ports, device profiles,
 * and one revision table for the history of all of them.
 *
 * Every record carries `version` (optimistic concurrency: updates are `WHERE id=? AND version=?`)
 * and the trash columns: `deletedAt` set means "in the trash"; `trashId` is the id of the record
 * the user deleted, so a site and everything moved with it are restored or purged together.
 */
import { sql } from 'drizzle-orm';
import { sqliteTable, text, integer, real, index, primaryKey, uniqueIndex, type AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { team } from './teams';
import { user } from './auth';
import type { PortSettings } from '../../lib/frame/port-settings';
import type { StoredBusPlan } from '../../lib/schemas/bus-plan';

export const DEVICE_ROLES = ['plc', 'drive', 'scale', 'reader', 'printer', 'sensor', 'hmi', 'converter', 'other'] as const;
export const LINK_KINDS = ['point-to-point', 'rs485-bus'] as const;
export const MEMBER_ROLES = ['master', 'slave', 'peer'] as const;
/** The vault's records (trash, vault history, `/api/vault/…/:type/…`). */
export const ENTITY_TYPES = ['site', 'machine', 'device', 'port', 'link', 'profile'] as const;
/** Every versioned record kept in the one `revision` table: the vault's, and commands. */
export const RECORD_TYPES = [...ENTITY_TYPES, 'command'] as const;
export type DeviceRole = (typeof DEVICE_ROLES)[number];
export type EntityType = (typeof ENTITY_TYPES)[number];
export type RecordType = (typeof RECORD_TYPES)[number];

/** Two port ids of one converter whose signals it carries across. */
export type BridgePair = [string, string];

/** One row of a connector's pin-out. */
export interface WiringRow {
  pin: string;
  signal: string;
  colour: string;
}

/** A default port kept in a device profile. */
export interface ProfilePort {
  name: string;
  settings: PortSettings;
  wiring: WiringRow[];
  notes: string;
}

const teamId = () =>
  text('team_id')
    .notNull()
    .references(() => team.id, { onDelete: 'cascade' });

/** Version, timestamps and trash columns shared by every versioned record (vault records, commands). */
export const versionedColumns = () => ({
  version: integer('version').notNull().default(1),
  createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  updatedBy: text('updated_by').references(() => user.id, { onDelete: 'set null' }),
  deletedAt: integer('deleted_at', { mode: 'timestamp_ms' }),
  deletedBy: text('deleted_by').references(() => user.id, { onDelete: 'set null' }),
});

const bookkeeping = () => ({ ...versionedColumns(), trashId: text('trash_id') });

/**
 * Rows by trash stamp: what a restore or purge moves, and the rows a long job writes out of sight before its
 * final transaction shows them (their `trash_id` is the job's id, see src/lib/server/jobs/stage.ts).
 */
export const trashIndex = (name: string, trashId: AnySQLiteColumn) => index(name).on(trashId).where(sql`trash_id IS NOT NULL`);

export const site = sqliteTable(
  'site',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    name: text('name').notNull(),
    customer: text('customer').notNull().default(''),
    address: text('address').notNull().default(''),
    notes: text('notes').notNull().default(''),
    ...bookkeeping(),
  },
  (t) => [index('site_team_idx').on(t.teamId, t.deletedAt, t.name), trashIndex('site_trash_idx', t.trashId)],
);

export const machine = sqliteTable(
  'machine',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    siteId: text('site_id')
      .notNull()
      .references(() => site.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    /** The customer's own line, cell or asset number. */
    code: text('code').notNull().default(''),
    notes: text('notes').notNull().default(''),
    /**
     * Characters a STRING of the machine's PLC holds (its declared length; the limit is set by the PLC, not by
     * a standard). Null = not recorded. The composer measures command strings against it.
     */
    plcStringCapacity: integer('plc_string_capacity'),
    ...bookkeeping(),
  },
  (t) => [index('machine_site_idx').on(t.siteId, t.deletedAt, t.name), index('machine_team_idx').on(t.teamId, t.deletedAt, t.name), trashIndex('machine_trash_idx', t.trashId)],
);

export const deviceProfile = sqliteTable(
  'device_profile',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    name: text('name').notNull(),
    role: text('role', { enum: DEVICE_ROLES }).notNull().default('other'),
    maker: text('maker').notNull().default(''),
    model: text('model').notNull().default(''),
    notes: text('notes').notNull().default(''),
    ports: text('ports', { mode: 'json' }).$type<ProfilePort[]>().notNull(),
    ...bookkeeping(),
  },
  (t) => [index('profile_team_idx').on(t.teamId, t.deletedAt, t.name), trashIndex('profile_trash_idx', t.trashId)],
);

export const device = sqliteTable(
  'device',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    machineId: text('machine_id')
      .notNull()
      .references(() => machine.id, { onDelete: 'cascade' }),
    profileId: text('profile_id').references(() => deviceProfile.id, { onDelete: 'set null' }),
    tag: text('tag').notNull(),
    name: text('name').notNull().default(''),
    role: text('role', { enum: DEVICE_ROLES }).notNull().default('other'),
    maker: text('maker').notNull().default(''),
    model: text('model').notNull().default(''),
    serialNumber: text('serial_number').notNull().default(''),
    /**
     * Serial numbers this device's record held before, oldest first (kept when the serial changes, so a unit's
     * earlier numbers still find it in search). Not part of its revisions: restoring a revision keeps them.
     */
    formerSerials: text('former_serials', { mode: 'json' }).$type<string[]>().notNull().default([]),
    firmware: text('firmware').notNull().default(''),
    location: text('location').notNull().default(''),
    notes: text('notes').notNull().default(''),
    /**
     * A converter's bridged ports: pairs of its own port ids whose signals it carries across (an RS-232 side and
     * its RS-485 side, a device server's network side and its serial port). Only role `converter` has any; the link
     * check follows a bridge from one link into the next (docs/vault.md, Converters).
     */
    bridges: text('bridges', { mode: 'json' }).$type<BridgePair[]>().notNull().default([]),
    ...bookkeeping(),
  },
  (t) => [
    // `id` breaks ties in every list order, so the page can be read straight off the index. `deleted_at` comes
    // last (lists and counts still read it off the index, skipping the few trashed rows), so moving a row in or out
    // of the trash, or a long job's rows into sight, moves its entries only within their own page
    // (docs/decisions/008-long-jobs-in-batches.md).
    index('device_team_tag_idx').on(t.teamId, t.tag, t.id, t.deletedAt),
    index('device_team_updated_idx').on(t.teamId, t.updatedAt, t.id, t.deletedAt),
    index('device_machine_idx').on(t.machineId, t.tag, t.id, t.deletedAt),
    // The other list orders on the device's own columns, read off an index too (a page costs the same in a team of
    // any size). Without `deleted_at`: showing or trashing a device leaves these entries alone; the list looks it up
    // in the row for the page's rows only.
    index('device_team_name_idx').on(t.teamId, t.name, t.id),
    index('device_team_role_idx').on(t.teamId, t.role, t.id),
    index('device_team_maker_idx').on(t.teamId, t.maker, t.id),
    index('device_team_model_idx').on(t.teamId, t.model, t.id),
    index('device_team_serial_idx').on(t.teamId, t.serialNumber, t.id),
    // Two live devices of one machine never share a tag, letter case of A–Z aside (as port names on a device).
    uniqueIndex('device_machine_tag_nocase_uq').on(t.machineId, sql`${t.tag} COLLATE NOCASE`).where(sql`deleted_at IS NULL`),
    trashIndex('device_trash_idx', t.trashId),
  ],
);

export const port = sqliteTable(
  'port',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    deviceId: text('device_id')
      .notNull()
      .references(() => device.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    position: integer('position').notNull().default(0),
    settings: text('settings', { mode: 'json' }).$type<PortSettings>().notNull(),
    wiring: text('wiring', { mode: 'json' }).$type<WiringRow[]>().notNull(),
    notes: text('notes').notNull().default(''),
    ...bookkeeping(),
  },
  (t) => [
    // Without `deleted_at`: showing or trashing a port leaves this entry alone (a device's ports are read with their rows).
    index('port_device_idx').on(t.deviceId, t.position),
    // Two live ports of one device never share a name, letter case of A–Z aside (`nameKey` in
    // src/lib/schemas/vault.ts is the same rule for imports); the trash may hold an old one.
    uniqueIndex('port_device_name_nocase_uq').on(t.deviceId, sql`${t.name} COLLATE NOCASE`).where(sql`deleted_at IS NULL`),
    trashIndex('port_trash_idx', t.trashId),
  ],
);

export const link = sqliteTable(
  'link',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    machineId: text('machine_id')
      .notNull()
      .references(() => machine.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    kind: text('kind', { enum: LINK_KINDS }).notNull(),
    cableType: text('cable_type').notNull().default(''),
    cableLengthM: real('cable_length_m'),
    notes: text('notes').notNull().default(''),
    /** What the master polls on a bus, and its timing overrides (docs/vault.md, bus planner); null when not planned. */
    busPlan: text('bus_plan', { mode: 'json' }).$type<StoredBusPlan>(),
    ...bookkeeping(),
  },
  (t) => [index('link_machine_idx').on(t.machineId, t.deletedAt, t.name), index('link_team_idx').on(t.teamId, t.deletedAt, t.name), trashIndex('link_trash_idx', t.trashId)],
);

export const linkMember = sqliteTable(
  'link_member',
  {
    linkId: text('link_id')
      .notNull()
      .references(() => link.id, { onDelete: 'cascade' }),
    portId: text('port_id')
      .notNull()
      .references(() => port.id, { onDelete: 'cascade' }),
    teamId: teamId(),
    role: text('role', { enum: MEMBER_ROLES }).notNull(),
    position: integer('position').notNull().default(0),
    /** Physically at one end of the cable (for the termination check); null when not recorded. */
    isEnd: integer('is_end', { mode: 'boolean' }),
    /** RS-485 receiver load in unit loads; null means 1. */
    unitLoads: real('unit_loads'),
    /** Length of its drop (stub) cable from the trunk, m; null when not recorded, 0 when the trunk runs through it. */
    dropM: real('drop_m'),
    /** Drops sharing its tap (a multi-port tap); null when not recorded. */
    tapPorts: integer('tap_ports'),
  },
  (t) => [primaryKey({ columns: [t.linkId, t.portId] }), index('link_member_port_idx').on(t.portId)],
);

/** One row per change of any versioned record (vault records and commands): who, when, which fields went from what to what, and the record as it stood after. */
export const revision = sqliteTable(
  'revision',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    entityType: text('entity_type', { enum: RECORD_TYPES }).notNull(),
    entityId: text('entity_id').notNull(),
    /** The record's version after this change. */
    version: integer('version').notNull(),
    action: text('action', { enum: ['create', 'update', 'delete', 'restore', 'revert', 'copy'] }).notNull(),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    summary: text('summary').notNull().default(''),
    changes: text('changes', { mode: 'json' }).$type<FieldChange[]>().notNull(),
    snapshot: text('snapshot', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
    /**
     * The long job that wrote it with its new records, before its final transaction: out of sight while that job
     * is not done, shown by its commit (docs/decisions/008-long-jobs-in-batches.md). Null for every other revision.
     */
    jobId: text('job_id'),
  },
  (t) => [
    index('revision_entity_idx').on(t.teamId, t.entityId, t.version),
    index('revision_team_idx').on(t.teamId, t.createdAt),
  ],
);

export interface FieldChange {
  field: string;
  from: unknown;
  to: unknown;
}
