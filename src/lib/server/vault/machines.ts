/** Machines: a line, cell or machine on a site, holding devices and the links between their ports. */
import { and, eq, isNull, like, or, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db } from '../../../db/client';
import { machine, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { machineCreateSchema, machineUpdateSchema } from '../../schemas/vault';
import { countWhere, findLive, likePattern, orderBy, recordCreated, updateVersioned, type Page } from './records';
import { machineEntity, siteEntity, type MachineRow } from '../records/entities';
import { definedOnly } from '../records/diff';

export const MACHINE_SORTS = ['name', 'code', 'siteName', 'updatedAt'] as const;

export interface MachineListItem extends MachineRow {
  siteName: string;
  deviceCount: number;
  linkCount: number;
}

const deviceCount = sql<number>`(SELECT count(*) FROM device d WHERE d.machine_id = "machine"."id" AND d.deleted_at IS NULL)`;
const linkCount = sql<number>`(SELECT count(*) FROM link l WHERE l.machine_id = "machine"."id" AND l.deleted_at IS NULL)`;

export async function listMachines(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; siteId?: string; q?: string },
): Promise<Page<MachineListItem>> {
  const where = and(
    eq(machine.teamId, ctx.team.id),
    isNull(machine.deletedAt),
    opts.siteId ? eq(machine.siteId, opts.siteId) : undefined,
    opts.q ? or(like(machine.name, likePattern(opts.q)), like(machine.code, likePattern(opts.q))) : undefined,
  );
  const col = { name: machine.name, code: machine.code, siteName: site.name, updatedAt: machine.updatedAt }[opts.sort as (typeof MACHINE_SORTS)[number]];
  const [rows, total] = await Promise.all([
    db
      .select({ machine, siteName: site.name, deviceCount, linkCount })
      .from(machine)
      .innerJoin(site, eq(site.id, machine.siteId))
      .where(where)
      .orderBy(...orderBy(col, opts.dir, machine.id))
      .limit(opts.pageSize)
      .offset((opts.page - 1) * opts.pageSize),
    countWhere(machine, where),
  ]);
  const items = rows.map((r) => ({ ...r.machine, siteName: r.siteName, deviceCount: Number(r.deviceCount), linkCount: Number(r.linkCount) }));
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: opts.sort, dir: opts.dir };
}

export async function getMachine(ctx: TeamContext, id: string): Promise<MachineRow & { siteName: string }> {
  const row = await findLive(db, ctx, machineEntity, id);
  const s = await findLive(db, ctx, siteEntity, row.siteId);
  return { ...row, siteName: s.name };
}

export async function createMachine(ctx: TeamContext, input: z.infer<typeof machineCreateSchema>): Promise<MachineRow> {
  return db.transaction(async (tx) => {
    await findLive(tx, ctx, siteEntity, input.siteId);
    const [row] = await tx
      .insert(machine)
      .values({ id: newId('mach'), teamId: ctx.team.id, ...input, updatedBy: ctx.user.id })
      .returning();
    await recordCreated(tx, ctx, machineEntity, row!);
    return row!;
  });
}

export async function updateMachine(ctx: TeamContext, id: string, input: z.infer<typeof machineUpdateSchema>): Promise<MachineRow> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => {
    if (values.siteId) await findLive(tx, ctx, siteEntity, values.siteId);
    return (await updateVersioned(tx, ctx, machineEntity, id, version, definedOnly(values))).row;
  });
}
