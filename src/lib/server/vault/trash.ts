/**
 * The trash: deleting moves a record (and everything inside it) out of sight; restoring brings
 * the same set back; purging (admins) removes it for good, with its history.
 */
import { and, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { db, type DbOrTx, type Tx } from '../../../db/client';
import { device, deviceProfile, link, machine, port, revision, site, type EntityType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';
import { findLive, now, staleError, writeRevision, type Page } from './records';
import { SPECS } from './specs';
import { findAny } from './revisions';
import { nextTurn } from '../jobs/turns';

/** Rows (or ids) per statement when purging. */
const PURGE_BATCH = 500;

const TABLES = [site, machine, device, port, link, deviceProfile] as const;

/** Parent that must be live for a record to come back from the trash. */
const PARENT: Partial<Record<EntityType, { type: EntityType; key: string }>> = {
  machine: { type: 'site', key: 'siteId' },
  device: { type: 'machine', key: 'machineId' },
  port: { type: 'device', key: 'deviceId' },
  link: { type: 'machine', key: 'machineId' },
};

async function cascade(tx: DbOrTx, ctx: TeamContext, type: EntityType, id: string, stamp: { deletedAt: Date; deletedBy: string; trashId: string }) {
  const team = ctx.team.id;
  const inTrash = <T extends typeof machine | typeof device>(t: T) => tx.select({ id: t.id }).from(t).where(and(eq(t.teamId, team), eq(t.trashId, id)));
  if (type === 'site') await tx.update(machine).set(stamp).where(and(eq(machine.teamId, team), eq(machine.siteId, id), isNull(machine.deletedAt)));
  if (type === 'site' || type === 'machine') {
    const machines = type === 'site' ? inTrash(machine) : [id];
    await tx.update(device).set(stamp).where(and(eq(device.teamId, team), inArray(device.machineId, machines), isNull(device.deletedAt)));
    await tx.update(link).set(stamp).where(and(eq(link.teamId, team), inArray(link.machineId, machines), isNull(link.deletedAt)));
  }
  if (type === 'site' || type === 'machine' || type === 'device') {
    const devices = type === 'device' ? [id] : inTrash(device);
    await tx.update(port).set(stamp).where(and(eq(port.teamId, team), inArray(port.deviceId, devices), isNull(port.deletedAt)));
  }
}

/** Moves a record and its contents to the trash. `version`, when given, must be current (else 409). */
export async function moveToTrash(ctx: TeamContext, type: EntityType, id: string, version?: number) {
  const spec = SPECS[type];
  return db.transaction(async (tx) => {
    const row = (await findLive(tx, ctx, spec as never, id)) as Record<string, unknown> & { version: number };
    if (version !== undefined && row.version !== version) throw staleError(spec as never, row, version);
    const stamp = { deletedAt: now(), deletedBy: ctx.user.id, trashId: id };
    const t = spec.table;
    const res = await tx
      .update(t)
      .set({ ...stamp, version: row.version + 1 })
      .where(and(eq(t.id, id), eq(t.teamId, ctx.team.id), eq(t.version, row.version), isNull(t.deletedAt)));
    if (res.rowsAffected === 0) throw staleError(spec as never, row, row.version);
    await cascade(tx, ctx, type, id, stamp);
    const snap = spec.snapshot((spec.hydrate ? await spec.hydrate(tx, row as never) : row) as never);
    await writeRevision(tx, ctx, { type, entityId: id, version: row.version + 1, action: 'delete', changes: [], snapshot: snap, summary: `Moved ${spec.noun} ${spec.describe(row as never)} to the trash` });
    return { type, id, trashed: true };
  });
}

export interface TrashItem {
  type: EntityType;
  id: string;
  label: string;
  deletedAt: number;
  deletedByName: string | null;
  /** Records moved with it (a site's machines, devices, ports and links). */
  contents: number;
}

export async function listTrash(ctx: TeamContext, opts: { page: number; pageSize: number; type?: EntityType }): Promise<Page<TrashItem>> {
  const team = ctx.team.id;
  const contents = (table: string, alias: string) => sql.raw(`(SELECT count(*) FROM ${table} c WHERE c.trash_id = ${alias}.id AND c.id <> ${alias}.id)`);
  const union = sql`
    SELECT 'site' AS type, s.id, s.name AS label, s.deleted_at, s.deleted_by,
      ${contents('machine', 's')} + (SELECT count(*) FROM device c WHERE c.trash_id = s.id) AS contents FROM site s WHERE s.team_id = ${team} AND s.deleted_at IS NOT NULL AND s.trash_id = s.id
    UNION ALL SELECT 'machine', m.id, m.name, m.deleted_at, m.deleted_by, ${contents('device', 'm')} FROM machine m WHERE m.team_id = ${team} AND m.deleted_at IS NOT NULL AND m.trash_id = m.id
    UNION ALL SELECT 'device', d.id, d.tag || CASE WHEN d.name <> '' THEN ' ' || d.name ELSE '' END, d.deleted_at, d.deleted_by, ${contents('port', 'd')} FROM device d WHERE d.team_id = ${team} AND d.deleted_at IS NOT NULL AND d.trash_id = d.id
    UNION ALL SELECT 'port', p.id, d.tag || ' ' || p.name, p.deleted_at, p.deleted_by, 0 FROM port p JOIN device d ON d.id = p.device_id WHERE p.team_id = ${team} AND p.deleted_at IS NOT NULL AND p.trash_id = p.id
    UNION ALL SELECT 'link', l.id, l.name, l.deleted_at, l.deleted_by, 0 FROM link l WHERE l.team_id = ${team} AND l.deleted_at IS NOT NULL AND l.trash_id = l.id
    UNION ALL SELECT 'profile', f.id, f.name, f.deleted_at, f.deleted_by, 0 FROM device_profile f WHERE f.team_id = ${team} AND f.deleted_at IS NOT NULL AND f.trash_id = f.id`;
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

async function trashedRoot(q: DbOrTx, ctx: TeamContext, type: EntityType, id: string) {
  const row = await findAny(q, ctx, type, id);
  if (!row.deletedAt || row.trashId !== id) throw new HttpError(404, `No ${SPECS[type].noun} with that id in the trash.`);
  return row;
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
    throw new HttpError(409, `Machine ${tag.machine} now has a device tagged "${tag.taken}", the same tag as "${tag.tag}" (letter case aside); change one of the tags first.`, {
      clash: { tag: tag.tag, taken: tag.taken, machine: tag.machine },
    });
  }
  const [clash] = await tx.all<{ name: string; taken: string; tag: string }>(sql`
    SELECT r.name, l.name AS taken, d.tag FROM port r
    JOIN port l ON l.device_id = r.device_id AND l.deleted_at IS NULL AND l.name = r.name COLLATE NOCASE
    JOIN device d ON d.id = r.device_id
    WHERE r.team_id = ${ctx.team.id} AND r.trash_id = ${trashId} LIMIT 1`);
  if (clash) {
    throw new HttpError(409, `Device ${clash.tag} now has a port named "${clash.taken}", the same name as "${clash.name}" (letter case aside); rename one of them first.`, {
      clash: { port: clash.name, taken: clash.taken, deviceTag: clash.tag },
    });
  }
}

export async function restoreFromTrash(ctx: TeamContext, type: EntityType, id: string) {
  const spec = SPECS[type];
  return db.transaction(async (tx) => {
    const row = await trashedRoot(tx, ctx, type, id);
    const parent = PARENT[type];
    if (parent) {
      const p = await findAny(tx, ctx, parent.type, String(row[parent.key]));
      if (p.deletedAt) throw new HttpError(409, `Its ${SPECS[parent.type].noun} is in the trash too; restore that first.`, { parent: { type: parent.type, id: p.id } });
    }
    await refuseNameClashes(tx, ctx, id);
    const clear = { deletedAt: null, deletedBy: null, trashId: null };
    for (const t of TABLES) await tx.update(t).set(clear).where(and(eq(t.teamId, ctx.team.id), eq(t.trashId, id)));
    const t = spec.table;
    await tx.update(t).set({ version: row.version + 1, updatedAt: now(), updatedBy: ctx.user.id }).where(eq(t.id, id));
    const live = (await findLive(tx, ctx, spec as never, id)) as Record<string, unknown>;
    const snap = spec.snapshot((spec.hydrate ? await spec.hydrate(tx, live as never) : live) as never);
    await writeRevision(tx, ctx, { type, entityId: id, version: row.version + 1, action: 'restore', changes: [], snapshot: snap, summary: `Restored ${spec.noun} ${spec.describe(live as never)} from the trash` });
    return { type, id, restored: true };
  });
}

/**
 * Removes a trashed record, everything moved with it, and their history. `beforeDelete` runs in the same
 * transaction with the ids about to go, so records kept elsewhere about them (attachments) go too.
 */
export async function purge(
  ctx: TeamContext,
  type: EntityType,
  id: string,
  hooks: { beforeDelete?: (tx: Tx, ids: string[]) => Promise<void> } = {},
) {
  const team = ctx.team.id;
  // One transaction (a half-purged tree must never be restorable), in short statements that let other
  // requests run between them; the write gate keeps other writes waiting until it commits.
  return db.transaction(async (tx) => {
    await trashedRoot(tx, ctx, type, id);
    const ids: string[] = [];
    for (const t of TABLES) {
      const rows = await tx.select({ id: t.id }).from(t).where(and(eq(t.teamId, team), eq(t.trashId, id), isNotNull(t.deletedAt)));
      ids.push(...rows.map((r) => r.id));
    }
    await hooks.beforeDelete?.(tx, ids);
    for (let lo = 0; lo < ids.length; lo += PURGE_BATCH) {
      await tx.delete(revision).where(and(eq(revision.teamId, team), inArray(revision.entityId, ids.slice(lo, lo + PURGE_BATCH))));
      await nextTurn();
    }
    // Children first, so no single statement cascades through a whole tree; the root goes with its own table.
    for (const t of [port, link, device, machine, site, deviceProfile] as const) {
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
