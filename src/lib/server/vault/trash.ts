/**
 * The trash: deleting moves a record (and everything inside it) out of sight; restoring brings
 * the same set back; purging (admins) removes it for good, with its history. What lives inside what
 * comes from the entity declarations (`parent`); the record mechanics from the record engine.
 * Commands trashed on their own are listed, restored and purged here too (they hold nothing inside).
 */
import { and, eq, getTableColumns, inArray, or, sql } from 'drizzle-orm';
import { db, type DbOrTx, type Tx } from '../../../db/client';
import { command, type EntityType, type RecordType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { Conflict, NotFound } from '../errors';
import { clearTrash, findInTeam, idsInTrash, purgeRevisions, recordRestored, stampTrash, trashRecord, type TrashStamp } from '../records/engine';
import { ENTITIES, childrenOf, entityOf } from '../records/entities';
import type { AnyEntity } from '../records/entity';
import type { Page } from './records';
import { nextTurn } from '../jobs/turns';
import { restoreCommandFromTrash } from '../commands/revisions';

/** Rows (or ids) per statement when purging. */
const PURGE_BATCH = 500;

/** Every entity, children before parents (the order a purge deletes in, so no statement cascades far). */
const CHILDREN_FIRST = (Object.keys(ENTITIES) as EntityType[]).map(entityOf).reverse();

/** The tables a purge of `type` deletes from: a command is purged alone (nothing is moved with it). */
const purgeOrder = (type: RecordType): AnyEntity[] => (type === 'command' ? [entityOf('command')] : CHILDREN_FIRST);

/**
 * Moves what lives inside `entity`'s rows `ids` (a site's machines, their devices and links, the devices'
 * ports) to the trash with the same stamp, a level at a time.
 */
async function cascade(tx: DbOrTx, ctx: TeamContext, entity: AnyEntity, ids: string[] | 'root', stamp: TrashStamp) {
  for (const child of childrenOf(entity.type)) {
    const parentCol = getTableColumns(child.table)[child.parent!.field]!;
    const parents = ids === 'root' ? [stamp.trashId] : ids;
    if (parents.length === 0) continue;
    await stampTrash(tx, ctx, child, inArray(parentCol, parents), stamp);
    if (childrenOf(child.type).length) await cascade(tx, ctx, child, await idsInTrash(tx, ctx, child, stamp.trashId), stamp);
  }
}

/** Whether `id` is this team's record of `type` and in the trash (moved on its own or along with what holds it). */
export async function isInTrash(ctx: TeamContext, type: EntityType, id: string): Promise<boolean> {
  try {
    return (await findInTeam(db, ctx, entityOf(type), id, 'any')).deletedAt != null;
  } catch (err) {
    if (err instanceof NotFound) return false;
    throw err;
  }
}

/** Moves a record and its contents to the trash. `version`, when given, must be current (else 409). */
export async function moveToTrash(ctx: TeamContext, type: EntityType, id: string, version?: number) {
  const entity = entityOf(type);
  return db.transaction(async (tx) => {
    await trashRecord(tx, ctx, entity, id, version, (stamp) => cascade(tx, ctx, entity, 'root', stamp));
    return { type, id, trashed: true };
  });
}

export interface TrashItem {
  type: RecordType;
  id: string;
  label: string;
  deletedAt: number;
  deletedByName: string | null;
  /** Records moved with it (a site's machines, devices, ports and links). */
  contents: number;
}

export async function listTrash(ctx: TeamContext, opts: { page: number; pageSize: number; type?: RecordType }): Promise<Page<TrashItem>> {
  const team = ctx.team.id;
  const contents = (table: string, alias: string) => sql.raw(`(SELECT count(*) FROM ${table} c WHERE c.trash_id = ${alias}.id AND c.id <> ${alias}.id)`);
  const union = sql`
    SELECT 'site' AS type, s.id, s.name AS label, s.deleted_at, s.deleted_by,
      ${contents('machine', 's')} + (SELECT count(*) FROM device c WHERE c.trash_id = s.id) AS contents FROM site s WHERE s.team_id = ${team} AND s.deleted_at IS NOT NULL AND s.trash_id = s.id
    UNION ALL SELECT 'machine', m.id, m.name, m.deleted_at, m.deleted_by, ${contents('device', 'm')} FROM machine m WHERE m.team_id = ${team} AND m.deleted_at IS NOT NULL AND m.trash_id = m.id
    UNION ALL SELECT 'device', d.id, d.tag || CASE WHEN d.name <> '' THEN ' ' || d.name ELSE '' END, d.deleted_at, d.deleted_by, ${contents('port', 'd')} FROM device d WHERE d.team_id = ${team} AND d.deleted_at IS NOT NULL AND d.trash_id = d.id
    UNION ALL SELECT 'port', p.id, d.tag || ' ' || p.name, p.deleted_at, p.deleted_by, 0 FROM port p JOIN device d ON d.id = p.device_id WHERE p.team_id = ${team} AND p.deleted_at IS NOT NULL AND p.trash_id = p.id
    UNION ALL SELECT 'link', l.id, l.name, l.deleted_at, l.deleted_by, 0 FROM link l WHERE l.team_id = ${team} AND l.deleted_at IS NOT NULL AND l.trash_id = l.id
    UNION ALL SELECT 'profile', f.id, f.name, f.deleted_at, f.deleted_by, 0 FROM device_profile f WHERE f.team_id = ${team} AND f.deleted_at IS NOT NULL AND f.trash_id = f.id
    UNION ALL SELECT 'command', c.id, c.name || ' on ' || COALESCE(d.tag, 'profile ' || f.name), c.deleted_at, c.deleted_by, 0
      FROM command c LEFT JOIN device d ON d.id = c.device_id LEFT JOIN device_profile f ON f.id = c.profile_id
      WHERE c.team_id = ${team} AND c.deleted_at IS NOT NULL AND c.trash_id = c.id`;
  const filter = opts.type ? sql`WHERE t.type = ${opts.type}` : sql``;
  const [items, totals] = await Promise.all([
    db.all<Record<string, unknown>>(sql`
      SELECT t.type, t.id, t.label, t.deleted_at AS deletedAt, u.name AS deletedByName, t.contents
      FROM (${union}) t LEFT JOIN user u ON u.id = t.deleted_by ${filter}
      ORDER BY t.deleted_at DESC, t.id LIMIT ${opts.pageSize} OFFSET ${(opts.page - 1) * opts.pageSize}`),
    db.all<{ n: number }>(sql`SELECT count(*) AS n FROM (${union}) t ${filter}`),
  ]);
  return {
    items: items.map((r) => ({ ...(r as unknown as TrashItem), deletedAt: Number(r.deletedAt), contents: Number(r.contents) })),
    page: opts.page, pageSize: opts.pageSize, total: Number(totals[0]?.n ?? 0), sort: 'deletedAt', dir: 'desc',
  };
}

/**
 * 409 when a device coming back would share its tag with a live device of its machine, or a port its name
 * with a live port of its device (letter case aside, as the unique indexes compare them).
 */
async function refuseNameClashes(tx: DbOrTx, ctx: TeamContext, trashId: string) {
  const [tag] = await tx.all<{ tag: string; taken: string; machine: string }>(sql`
    SELECT r.tag, l.tag AS taken, m.name AS machine FROM device r
    JOIN device l ON l.machine_id = r.machine_id AND l.deleted_at IS NULL AND l.tag = r.tag COLLATE NOCASE
    JOIN machine m ON m.id = r.machine_id
    WHERE r.team_id = ${ctx.team.id} AND r.trash_id = ${trashId} LIMIT 1`);
  if (tag) {
    throw new Conflict(`Machine ${tag.machine} now has a device tagged "${tag.taken}", the same tag as "${tag.tag}" (letter case aside); change one of the tags first.`, {
      clash: { tag: tag.tag, taken: tag.taken, machine: tag.machine },
    });
  }
  const [clash] = await tx.all<{ name: string; taken: string; tag: string }>(sql`
    SELECT r.name, l.name AS taken, d.tag FROM port r
    JOIN port l ON l.device_id = r.device_id AND l.deleted_at IS NULL AND l.name = r.name COLLATE NOCASE
    JOIN device d ON d.id = r.device_id
    WHERE r.team_id = ${ctx.team.id} AND r.trash_id = ${trashId} LIMIT 1`);
  if (clash) {
    throw new Conflict(`Device ${clash.tag} now has a port named "${clash.taken}", the same name as "${clash.name}" (letter case aside); rename one of them first.`, {
      clash: { port: clash.name, taken: clash.taken, deviceTag: clash.tag },
    });
  }
}

export async function restoreFromTrash(ctx: TeamContext, type: RecordType, id: string) {
  if (type === 'command') return restoreCommandFromTrash(ctx, id);
  const entity = entityOf(type);
  return db.transaction(async (tx) => {
    const row = await findInTeam(tx, ctx, entity, id, 'trash');
    const parent = entity.parent;
    if (parent) {
      const p = await findInTeam(tx, ctx, entityOf(parent.type), String(row[parent.field]), 'any');
      if (p.deletedAt) throw new Conflict(`Its ${entityOf(parent.type).noun} is in the trash too; restore that first.`, { parent: { type: parent.type, id: p.id } });
    }
    await refuseNameClashes(tx, ctx, id);
    for (const e of CHILDREN_FIRST) await clearTrash(tx, ctx, e, id);
    await recordRestored(tx, ctx, entity, row);
    return { type, id, restored: true };
  });
}

/**
 * Removes a trashed record, everything moved with it, and their history. `beforeDelete` runs in the same
 * transaction with the ids about to go, so records kept elsewhere about them (attachments) go too.
 */
export async function purge(
  ctx: TeamContext,
  type: RecordType,
  id: string,
  hooks: { beforeDelete?: (tx: Tx, ids: string[]) => Promise<void> } = {},
) {
  const team = ctx.team.id;
  // One transaction (a half-purged tree must never be restorable), in short statements that let other
  // requests run between them; the write gate keeps other writes waiting until it commits.
  return db.transaction(async (tx) => {
    await findInTeam(tx, ctx, entityOf(type), id, 'trash');
    const ids: string[] = [];
    for (const e of purgeOrder(type)) ids.push(...(await idsInTrash(tx, ctx, e, id)));
    await hooks.beforeDelete?.(tx, ids);
    // Commands kept on purged devices and profiles go with them (foreign key), and so does their history.
    const commands: string[] = [];
    for (let lo = 0; lo < ids.length; lo += PURGE_BATCH) {
      const slice = ids.slice(lo, lo + PURGE_BATCH);
      const rows = await tx.select({ id: command.id }).from(command).where(and(eq(command.teamId, team), or(inArray(command.deviceId, slice), inArray(command.profileId, slice))));
      commands.push(...rows.map((r) => r.id));
    }
    await purgeRevisions(tx, ctx, [...ids, ...commands], PURGE_BATCH, nextTurn);
    // Children first, so no single statement cascades through a whole tree; the root goes with its own table.
    for (const { table: t } of purgeOrder(type)) {
      const where = and(eq(t.teamId, team), eq(t.trashId, id));
      for (;;) {
        const res = await tx.run(sql`DELETE FROM ${t} WHERE rowid IN (SELECT rowid FROM ${t} WHERE ${where} LIMIT ${PURGE_BATCH})`);
        if (res.rowsAffected < PURGE_BATCH) break;
        await nextTurn();
      }
    }
    return { type, id, purged: ids.length };
  });
}
