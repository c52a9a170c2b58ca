/** Sites and machines of the team as choices for the share and import forms. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import { db } from '../../../db/client';
import { machine, site } from '../../../db/schema';
import type { TeamContext } from '../guard';

export async function scopeOptions(ctx: TeamContext): Promise<{ sites: { id: string; label: string }[]; machines: { id: string; label: string }[] }> {
  const [sites, machines] = await Promise.all([
    db.select({ id: site.id, name: site.name }).from(site).where(and(eq(site.teamId, ctx.team.id), isNull(site.deletedAt))).orderBy(asc(site.name)).limit(2000),
    db.select({ id: machine.id, name: machine.name, siteName: site.name }).from(machine).innerJoin(site, eq(site.id, machine.siteId))
      .where(and(eq(machine.teamId, ctx.team.id), isNull(machine.deletedAt), isNull(site.deletedAt))).orderBy(asc(site.name), asc(machine.name)).limit(5000),
  ]);
  return { sites: sites.map((s) => ({ id: s.id, label: s.name })), machines: machines.map((m) => ({ id: m.id, label: `${m.siteName} › ${m.name}` })) };
}
