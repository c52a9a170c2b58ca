/**
 * How a versioned record is declared to the record engine (./engine.ts): its table, the columns its
 * revisions keep, the parent it lives under, the records it points at, and how it is named in words.
 * Everything is typed against the Drizzle table: a renamed column fails to compile here.
 */
import type { InferSelectModel } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import type { DbOrTx } from '../../../db/client';
import type { EntityType, RecordType } from '../../../db/schema';
import type { TeamContext } from '../guard';

/** The bookkeeping columns the engine reads and writes on every versioned record (`versionedColumns()` and `trash_id`). */
export type VersionedTable = SQLiteTable & {
  id: SQLiteColumn;
  teamId: SQLiteColumn;
  version: SQLiteColumn;
  updatedAt: SQLiteColumn;
  updatedBy: SQLiteColumn;
  deletedAt: SQLiteColumn;
  deletedBy: SQLiteColumn;
  trashId: SQLiteColumn;
};

/** The same columns as values, as every row of such a table has them. */
export interface VersionedRow {
  id: string;
  teamId: string;
  version: number;
  updatedAt: Date;
  updatedBy: string | null;
  deletedAt: Date | null;
  deletedBy: string | null;
  trashId: string | null;
}

/** A field of the record that holds the id of another record. */
export interface ReferenceField<Row> {
  field: keyof Row & string;
  type: EntityType;
}

export interface Entity<T extends VersionedTable = VersionedTable, Row extends VersionedRow = VersionedRow> {
  type: RecordType;
  /** Used in messages: "No device with that id in this team." */
  noun: string;
  table: T;
  /** The editable state kept in revisions and put back by a restore, in this order. */
  snapshotKeys: readonly (keyof Row & string)[];
  /** The record it lives under, which must be live for it to come back from the trash. */
  parent?: ReferenceField<Row>;
  /** Other records it points at (besides the parent) that a restore must not leave dangling. */
  references?: readonly ReferenceField<Row>[];
  /** References computed from the state rather than held in one field (a link's member ports). */
  pointsAt?(state: Record<string, unknown>): { type: EntityType; id: string; field: string }[];
  /** Short label for history and trash lists (a tag, a name). */
  describe(row: Row): string;
  /** Adds state kept outside the main row (a link's members) before snapshots are taken. */
  hydrate?(q: DbOrTx, row: Row): Promise<Row>;
  /** Keys of an update kept outside the main row, and how to write them. */
  extraKeys?: readonly string[];
  writeExtra?(q: DbOrTx, ctx: TeamContext, id: string, values: Record<string, unknown>): Promise<void>;
}

/** Any declared entity, as code that works on every kind of record sees it. */
export type AnyEntity = Entity<VersionedTable, VersionedRow & Record<string, unknown>>;

/** Declares an entity; the row type is the table's own unless the entity keeps extra state (`hydrate`). */
export function defineEntity<T extends VersionedTable, Row extends VersionedRow = InferSelectModel<T> & VersionedRow>(e: Entity<T, NoInfer<Row>>): Entity<T, Row> {
  return e;
}

/** The state a revision keeps: the declared snapshot keys of the row, in order. */
export function snapshotOf<K extends string>(entity: { snapshotKeys: readonly K[] }, row: Partial<Record<K, unknown>>): Record<string, unknown> {
  return Object.fromEntries(entity.snapshotKeys.map((k) => [k, row[k]]));
}

/** Only the snapshot keys of `values` (what a restore may write back). */
export function snapshotValues<K extends string>(entity: { snapshotKeys: readonly K[] }, values: Record<string, unknown>): Partial<Record<K, unknown>> {
  return Object.fromEntries(entity.snapshotKeys.filter((k) => k in values).map((k) => [k, values[k]])) as Partial<Record<K, unknown>>;
}
