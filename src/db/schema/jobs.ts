/**
 * Long jobs (imports) and the rows they stage. Progress lives here rather than in a process, so any app
 * server can report a job another one runs.
 */
import { sqliteTable, text, integer, index, primaryKey } from 'drizzle-orm/sqlite-core';
import { team } from './teams';
import { user } from './auth';

export const JOB_KINDS = ['csv-import', 'json-import'] as const;
/** checking: rows are read, checked and staged in short batches; applying: the one final transaction. */
export const JOB_STATES = ['checking', 'applying', 'done', 'failed'] as const;
export type JobKind = (typeof JOB_KINDS)[number];
export type JobState = (typeof JOB_STATES)[number];

export const job = sqliteTable(
  'job',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => team.id, { onDelete: 'cascade' }),
    userId: text('user_id').references(() => user.id, { onDelete: 'set null' }),
    userName: text('user_name').notNull().default(''),
    kind: text('kind', { enum: JOB_KINDS }).notNull(),
    state: text('state', { enum: JOB_STATES }).notNull(),
    /** Work done of `total`, in the job's own units (a CSV import counts each row checked, then staged). */
    done: integer('done').notNull().default(0),
    total: integer('total').notNull().default(0),
    /** Why a failed job failed, in words. */
    message: text('message').notNull().default(''),
    createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
    /** Touched by every batch: a job unheard of for long was interrupted (see ABANDONED_AFTER_MS). */
    updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull().$defaultFn(() => new Date()),
    finishedAt: integer('finished_at', { mode: 'timestamp_ms' }),
  },
  (t) => [index('job_team_idx').on(t.teamId, t.createdAt), index('job_state_idx').on(t.state, t.updatedAt)],
);

/**
 * A row waiting for its job's final transaction: one row of `target` (a table name), its column values in
 * the table's column order as a JSON array, already in the form the driver stores.
 */
export const jobRow = sqliteTable(
  'job_row',
  {
    jobId: text('job_id').notNull(),
    target: text('target').notNull(),
    seq: integer('seq').notNull(),
    data: text('data').notNull(),
  },
  (t) => [primaryKey({ columns: [t.jobId, t.target, t.seq] })],
);
