/** Links between ports (point-to-point or an RS-485 bus), checked on every save and every view. */
import { and, eq, inArray, isNull, like } from 'drizzle-orm';
import type { z } from 'zod';
import { db, type DbOrTx } from '../../../db/client';
import { link, linkMember, machine } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { linkCreateSchema, linkUpdateSchema } from '../../schemas/vault';
import { portShorthand } from '../../frame/port-text';
import { countWhere, findLive, likePattern, orderBy, recordCreated, updateVersioned, type Page } from './records';
import { linkEntity, machineEntity, type LinkRow } from '../records/entities';
import { assertMemberPorts, keepDrops, loadMembers, replaceMembers, storedMembers, type MemberView } from './link-members';
import { assertBusPlan } from './bus-plan';
import { reportFor, type VaultLinkReport } from './link-report';
import { definedOnly } from '../records/diff';

export const LINK_SORTS = ['name', 'kind', 'updatedAt'] as const;

export type LinkView = Omit<LinkRow, 'members'> & {
  machineName: string;
  members: (MemberView & { shorthand: string })[];
  report: VaultLinkReport;
};

function view(row: LinkRow, machineName: string, members: MemberView[]): LinkView {
  return {
    ...row,
    machineName,
    members: members.map((m) => ({ ...m, shorthand: portShorthand(m.settings) })),
    report: reportFor(row, members),
  };
}

export async function listLinks(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; machineId?: string; q?: string },
): Promise<Page<LinkView>> {
  const where = and(
    eq(link.teamId, ctx.team.id),
    isNull(link.deletedAt),
    opts.machineId ? eq(link.machineId, opts.machineId) : undefined,
    opts.q ? like(link.name, likePattern(opts.q)) : undefined,
  );
  const col = { name: link.name, kind: link.kind, updatedAt: link.updatedAt }[opts.sort as (typeof LINK_SORTS)[number]];
  const [rows, total] = await Promise.all([
    db
      .select({ link, machineName: machine.name })
      .from(link)
      .innerJoin(machine, eq(machine.id, link.machineId))
      .where(where)
      .orderBy(...orderBy(col, opts.dir, link.id))
      .limit(opts.pageSize)
      .offset((opts.page - 1) * opts.pageSize),
    countWhere(link, where),
  ]);
  const members = await loadMembers(db, rows.map((r) => r.link.id));
  const items = rows.map((r) => view(r.link, r.machineName, members.get(r.link.id) ?? []));
  return { items, page: opts.page, pageSize: opts.pageSize, total, sort: opts.sort, dir: opts.dir };
}

export async function getLink(ctx: TeamContext, id: string, q: DbOrTx = db): Promise<LinkView> {
  const row = await findLive(q, ctx, linkEntity, id);
  const m = await findLive(q, ctx, machineEntity, row.machineId);
  const members = await loadMembers(q, [id]);
  return view(row, m.name, members.get(id) ?? []);
}

export async function createLink(ctx: TeamContext, input: z.infer<typeof linkCreateSchema>): Promise<LinkView> {
  const { members, ...fields } = input;
  return db.transaction(async (tx) => {
    await findLive(tx, ctx, machineEntity, fields.machineId);
    await assertMemberPorts(tx, ctx, members);
    if (fields.busPlan) await assertBusPlan(tx, ctx, fields.busPlan, members);
    const [row] = await tx.insert(link).values({ id: newId('link'), teamId: ctx.team.id, ...fields, updatedBy: ctx.user.id }).returning();
    await replaceMembers(tx, ctx, row!.id, members);
    await recordCreated(tx, ctx, linkEntity, { ...row!, members: storedMembers(members) });
    return getLink(ctx, row!.id, tx);
  });
}

export async function updateLink(ctx: TeamContext, id: string, input: z.infer<typeof linkUpdateSchema>): Promise<LinkView> {
  const { version, ...values } = input;
  return db.transaction(async (tx) => {
    if (values.members) await assertMemberPorts(tx, ctx, values.members);
    const patch = definedOnly(values);
    if (patch.members || patch.busPlan) {
      const now = (await loadMembers(tx, [id])).get(id) ?? [];
      if (patch.members) patch.members = keepDrops(patch.members, now);
      if (patch.busPlan) await assertBusPlan(tx, ctx, patch.busPlan, patch.members ?? now);
    }
    await updateVersioned(tx, ctx, linkEntity, id, version, patch, { present: () => getLink(ctx, id, tx) });
    return getLink(ctx, id, tx);
  });
}
