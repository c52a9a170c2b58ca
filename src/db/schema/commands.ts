/**
 * The command library: command templates kept on a device or on a device profile (exactly one of
 * the two). Versioning, the trash columns and the history work as for vault records: `version` for
 * optimistic concurrency, `deletedAt` / `trashId` = in the trash, revisions in the one `revision` table
 * (entity type `command`).
 */
import { sql } from 'drizzle-orm';
import { sqliteTable, text, integer, index, check } from 'drizzle-orm/sqlite-core';
import { team } from './teams';
import { device, deviceProfile, trashIndex, versionedColumns } from './vault';
import type { FieldValues, Template } from '../../lib/frame/template';
import type { CommandPreset } from '../../lib/composer/presets';
import type { SavedSequence } from '../../lib/composer/saved-sequence';


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
    /** Named value sets ("index one station", "jog 1° one way"), each over the saved values (src/lib/composer/presets.ts). */
    presets: text('presets', { mode: 'json' }).$type<CommandPreset[]>().notNull().default([]),
    notes: text('notes').notNull().default(''),
    /** The command moves machinery: the composer shows the safety caution above it. */
    movesMachinery: integer('moves_machinery', { mode: 'boolean' }).notNull().default(false),
    /** An engineer marked it safe to repeat (it only reads): the live link's framing search may send it dozens of times. */
    safeToRepeat: integer('safe_to_repeat', { mode: 'boolean' }).notNull().default(false),
    /** A setup command (writes the device's settings): offered after a framing search, in library order, to bring a replacement to the stored settings. */
    setsUpDevice: integer('sets_up_device', { mode: 'boolean' }).notNull().default(false),
    /**
     * Set when the command is a sequence of steps (library commands of the same owner by id, or inline
     * templates; src/lib/composer/saved-sequence.ts); its own template is then empty. Null = a single command.
     */
    sequence: text('sequence', { mode: 'json' }).$type<SavedSequence | null>(),
    ...versionedColumns(),
    trashId: text('trash_id'),
  },
  (t) => [
    index('command_device_idx').on(t.deviceId, t.deletedAt, t.name),
    index('command_profile_idx').on(t.profileId, t.deletedAt, t.name),
    index('command_team_idx').on(t.teamId, t.deletedAt),
    trashIndex('command_trash_idx', t.trashId),
    check('command_one_owner', sql`(${t.deviceId} IS NULL) <> (${t.profileId} IS NULL)`),
  ],
);
