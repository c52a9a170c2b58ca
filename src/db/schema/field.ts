/**
 * Field work and sharing: the append-only field log (entries and their annotations), files attached
 * to devices and machines, read-only share links, and the import map that keeps imports idempotent.
 */
import { sqliteTable, text, integer, index, primaryKey, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { team } from './teams';
import { user } from './auth';
import { device, port } from './vault';
import type { PortSettings } from '../../lib/frame/port-settings';

export const FIELD_LOG_KINDS = ['replacement', 'verified', 'found-different'] as const;
export const ATTACHMENT_KINDS = ['manual', 'photo', 'config'] as const;
export const ATTACHMENT_OWNERS = ['device', 'machine'] as const;
export const SHARE_SCOPES = ['machine', 'site'] as const;
/** Field-log kinds that propose a change to the record, and where a proposal stands. */
export const PROPOSAL_KINDS = ['replacement', 'found-different'] as const;
export const PROPOSAL_STATUSES = ['pending', 'accepted', 'declined'] as const;
export type ProposalStatus = (typeof PROPOSAL_STATUSES)[number];
export type FieldLogKind = (typeof FIELD_LOG_KINDS)[number];
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];

const teamId = () =>
  text('team_id')
    .notNull()
    .references(() => team.id, { onDelete: 'cascade' });
const createdAt = () => integer('created_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date());

/** One thing a technician did or saw at the device. Never updated or deleted by the app. */
export const fieldLogEntry = sqliteTable(
  'field_log_entry',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    deviceId: text('device_id')
      .notNull()
      .references(() => device.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: FIELD_LOG_KINDS }).notNull(),
    note: text('note').notNull().default(''),
    /** Replacement: serial number of the unit fitted. */
    newSerialNumber: text('new_serial_number').notNull().default(''),
    /** Replacement: the device's record version whose settings were loaded into the new unit. */
    appliedVersion: integer('applied_version'),
    /** Found different: what the technician found set on site. */
    foundSettings: text('found_settings').notNull().default(''),
    /** The device's record version when the entry was written. */
    deviceVersion: integer('device_version').notNull(),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    /** When the server received the entry. */
    createdAt: createdAt(),
    /**
     * When the work was done, as the technician's phone recorded it: differs from `createdAt` for an entry written
     * offline and sent later (docs/decisions/017-offline-cards.md). Null on entries written before it existed.
     */
    doneAt: integer('done_at', { mode: 'timestamp_ms' }),
    /** The phone's own key for the entry, so a resend after a lost answer writes nothing twice. */
    clientKey: text('client_key'),
  },
  (t) => [index('field_log_device_idx').on(t.teamId, t.deviceId, t.createdAt), uniqueIndex('field_log_client_key_idx').on(t.teamId, t.clientKey)],
);

/** Later remarks on an entry; also append-only. */
export const fieldLogAnnotation = sqliteTable(
  'field_log_annotation',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    entryId: text('entry_id')
      .notNull()
      .references(() => fieldLogEntry.id, { onDelete: 'cascade' }),
    note: text('note').notNull(),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [index('field_annotation_entry_idx').on(t.entryId, t.createdAt)],
);

/**
 * What a replacement or found-different entry says the record should become, for an engineer to accept or
 * decline (docs/decisions/014-field-proposals.md). The entry stays as written; only the proposal's decision
 * columns change, once, from pending.
 */
export const fieldProposal = sqliteTable(
  'field_proposal',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    deviceId: text('device_id')
      .notNull()
      .references(() => device.id, { onDelete: 'cascade' }),
    entryId: text('entry_id')
      .notNull()
      .unique()
      .references(() => fieldLogEntry.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: PROPOSAL_KINDS }).notNull(),
    /** Serial number and firmware of the unit on site; '' = not reported (the record's stays). */
    serialNumber: text('serial_number').notNull().default(''),
    firmware: text('firmware').notNull().default(''),
    /** The port whose settings were found different, and those settings (only the ones reported). */
    portId: text('port_id').references(() => port.id, { onDelete: 'set null' }),
    portName: text('port_name').notNull().default(''),
    portSettings: text('port_settings', { mode: 'json' }).$type<Partial<PortSettings>>(),
    /** The record when the entry was written: serial number, firmware, record version, the named port's settings. */
    recordSerialNumber: text('record_serial_number').notNull().default(''),
    recordFirmware: text('record_firmware').notNull().default(''),
    recordVersion: integer('record_version').notNull(),
    recordPortSettings: text('record_port_settings', { mode: 'json' }).$type<PortSettings>(),
    status: text('status', { enum: PROPOSAL_STATUSES }).notNull().default('pending'),
    decisionNote: text('decision_note').notNull().default(''),
    decidedBy: text('decided_by').references(() => user.id, { onDelete: 'set null' }),
    decidedByName: text('decided_by_name').notNull().default(''),
    decidedAt: integer('decided_at', { mode: 'timestamp_ms' }),
    /** Accepted: the device's and the port's versions the acceptance wrote (null when it changed nothing there). */
    acceptedVersion: integer('accepted_version'),
    acceptedPortVersion: integer('accepted_port_version'),
    createdAt: createdAt(),
  },
  // `port_id`: purging a port sets it to null here, which finds the rows by this index.
  (t) => [index('proposal_team_status_idx').on(t.teamId, t.status, t.createdAt), index('proposal_device_idx').on(t.deviceId, t.createdAt), index('proposal_port_idx').on(t.portId)],
);

/** A stored file: its bytes live in the storage backend under `storageKey`. */
export const attachment = sqliteTable(
  'attachment',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    ownerType: text('owner_type', { enum: ATTACHMENT_OWNERS }).notNull(),
    ownerId: text('owner_id').notNull(),
    /** Photos sent with a field-log entry belong to it (and cannot be removed on their own). */
    entryId: text('entry_id').references(() => fieldLogEntry.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ATTACHMENT_KINDS }).notNull(),
    fileName: text('file_name').notNull(),
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    sha256: text('sha256').notNull(),
    storageKey: text('storage_key').notNull(),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [index('attachment_owner_idx').on(t.teamId, t.ownerType, t.ownerId, t.createdAt), index('attachment_entry_idx').on(t.entryId)],
);

/** A read-only link for people without an account; only the SHA-256 of its token is kept. */
export const shareLink = sqliteTable(
  'share_link',
  {
    id: text('id').primaryKey(),
    teamId: teamId(),
    scopeType: text('scope_type', { enum: SHARE_SCOPES }).notNull(),
    scopeId: text('scope_id').notNull(),
    label: text('label').notNull().default(''),
    tokenHash: text('token_hash').notNull().unique(),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdByName: text('created_by_name').notNull().default(''),
    createdAt: createdAt(),
    expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
    revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
    accessCount: integer('access_count').notNull().default(0),
    lastAccessAt: integer('last_access_at', { mode: 'timestamp_ms' }),
    /** The link this one was e-mailed from (null for a link created directly); revoking a link revokes its copies. */
    parentId: text('parent_id'),
  },
  (t) => [index('share_team_idx').on(t.teamId, t.createdAt), index('share_parent_idx').on(t.parentId)],
);

/** Which record an imported record became in this team, so importing the same file twice adds nothing. */
export const importMap = sqliteTable(
  'import_map',
  {
    teamId: teamId(),
    entityType: text('entity_type').notNull(),
    sourceId: text('source_id').notNull(),
    targetId: text('target_id').notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.teamId, t.entityType, t.sourceId] })],
);
