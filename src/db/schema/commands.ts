/**
 * The command library: command templates kept on a device or on a device profile (exactly one of
 * the two), with their own revision history. Versioning and the trash columns work as in the vault
 * (`version` for optimistic concurrency, `deletedAt` = in the trash).
 */
import { sql } from 'drizzle-orm';
import { sqliteTable, text, integer, index, check } from 'drizzle-orm/sqlite-core';
import { team } from './teams';
import { user } from './auth';
import { device, deviceProfile, versionedColumns, type FieldChange } from './vault';
import type { FieldValues, Template } from '../../lib/frame/template';

export const COMMAND_ACTIONS = ['create', 'update', 'delete', 'revert', 'copy'] as const;
export type CommandAction = (typeof COMMAND_ACTIONS)[number];

export const command = sqliteTable(
  'command',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => team.id, { onDelete: 'cascade' }),
    deviceId: text('device_id').references(() => device.id, { onDelete: 'cascade' }),
    profileId: text('profile_id').references(() => deviceProfile.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    purpose: text('purpose').notNull().default(''),
    /** Frame engine template (segments); bytes inside are hex text. */
    template: text('template', { mode: 'json' }).$type<Template>().notNull(),
    /** Default field values keyed by field name (engineering units). */
    fieldValues: text('field_values', { mode: 'json' }).$type<FieldValues>().notNull(),
    /** What the device answers, as a template for the reply decoder; null = no reply expected. */
    replyTemplate: text('reply_template', { mode: 'json' }).$type<Template | null>(),
    /** Name of the device/profile port the command is sent on (timing and frame rules); '' = first port. */
    portName: text('port_name').notNull().default(''),
    /** Name of the raw unit per scaled field, e.g. `{ angle: 'steps' }`, shown beside the sent value. */
    rawUnits: text('raw_units', { mode: 'json' }).$type<Record<string, string>>().notNull(),
    notes: text('notes').notNull().default(''),
    /** The command moves machinery: the composer shows the safety caution above it. */
    movesMachinery: integer('moves_machinery', { mode: 'boolean' }).notNull().default(false),
    ...versionedColumns(),
  },
  (t) => [
    index('command_device_idx').on(t.deviceId, t.deletedAt, t.name),
    index('command_profile_idx').on(t.profileId, t.deletedAt, t.name),
    index('command_team_idx').on(t.teamId, t.deletedAt),
    check('command_one_owner', sql`(${t.deviceId} IS NULL) <> (${t.profileId} IS NULL)`),
  ],
);

/** One row per change of a command: who, when, what changed, and the command as it stood after. */
export const commandRevision = sqliteTable(
  'command_revision',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => team.id, { onDelete: 'cascade' }),
    commandId: text('command_id')
      .notNull()
      .references(() => command.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    action: text('action', { enum: COMMAND_ACTIONS }).notNull(),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    summary: text('summary').notNull().default(''),
    changes: text('changes', { mode: 'json' }).$type<FieldChange[]>().notNull(),
    snapshot: text('snapshot', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
  },
  (t) => [index('command_revision_idx').on(t.teamId, t.commandId, t.version)],
);
