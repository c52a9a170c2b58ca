/** Sites: a customer's plant, holding machines. */
import { and, eq, isNull, like, or, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db } from '../../../db/client';
import { site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { siteCreateSchema, siteUpdateSchema } from '../../schemas/vault';
import { countWhere, findLive, likePattern, orderBy, recordCreated, updateVersioned, type Page } from './records';
import { siteEntity, type SiteRow } from '../records/entities';
import { definedOnly } from '../records/diff';

export const SITE_SORTS = ['name', 'customer', 'updatedAt'] as const;

export interface SiteListItem extends SiteRow {
  machineCount: number;
  deviceCount: number;
}

// Correlated subqueries name the outer table explicitly: drizzle leaves single-table columns unqualified.
const machineCount = sql<number>`(SELECT count(*) FROM machine m WHERE m.site_id = "site"."id" AND m.deleted_at IS NULL)`;
const deviceCount = sql<number>`(SELECT count(*) FROM device d JOIN machine m ON m.id = d.machine_id WHERE m.site_id = "site"."id" AND d.deleted_at IS NULL)`;

export async function listSites(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; q?: string },
): Promise<Page<SiteListItem>> {
  const where = and(
    eq(site.teamId, ctx.team.id),
    isNull(site.deletedAt),
    opts.q ? or(like(site.name, likePattern(opts.q)), like(site.customer, likePattern(opts.q))) : undefined,
  );
  const col = { name: site.name, customer: site.customer, updatedAt: site.updatedAt }[opts.sort as (typeof SITE_SORTS)[number]];
  const [rows, total] = await Promise.all([
    db
      .select({ site, machineCount, deviceCount })
      .from(site)
      .where(where)
      .orderBy(...orderBy(col, opts.dir, site.id))
      .limit(opts.pageSize)
      .offset((opts.page - 1) * opts.pageSize),
    countWhere(site, where),
  ]);
  const items = rows.map((r) => ({ ...r.site, machineCount: Number(r.machineCount), deviceCount: Number(r.deviceCount) }));
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: opts.sort, dir: opts.dir };
}

export function getSite(ctx: TeamContext, id: string): Promise<SiteRow> {
  return findLive(db, ctx, siteEntity, id);
}

export async function createSite(ctx: TeamContext, input: z.infer<typeof siteCreateSchema>): Promise<SiteRow> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(site)
      .values({ id: newId('site'), teamId: ctx.team.id, ...input, updatedBy: ctx.user.id })
      .returning();
    await recordCreated(tx, ctx, siteEntity, row!);
    return row!;
  });
}

export async function updateSite(ctx: TeamContext, id: string, input: z.infer<typeof siteUpdateSchema>): Promise<SiteRow> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => (await updateVersioned(tx, ctx, siteEntity, id, version, definedOnly(values))).row);
}
