/** Device profiles: the team's library of reusable device types (default ports and frame rules). */
import { and, eq, isNull, like, or, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { db } from '../../../db/client';
import { device, deviceProfile } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import type { profileCreateSchema, profileUpdateSchema } from '../../schemas/vault';
import { countWhere, findLive, likePattern, orderBy, recordCreated, updateVersioned, type Page } from './records';
import { deviceEntity, profileEntity, type ProfileRow } from '../records/entities';
import { livePorts } from './devices';
import { portShorthand } from '../../frame/port-text';
import { definedOnly } from '../records/diff';

export const PROFILE_SORTS = ['name', 'role', 'maker', 'model', 'updatedAt'] as const;

export type ProfileView = ProfileRow & { deviceCount: number; shorthands: string[] };

const deviceCount = sql<number>`(SELECT count(*) FROM device d WHERE d.profile_id = "device_profile"."id" AND d.deleted_at IS NULL)`;

function view(row: ProfileRow, count: number): ProfileView {
  return { ...row, deviceCount: count, shorthands: row.ports.map((p) => portShorthand(p.settings)) };
}

export async function listProfiles(
  ctx: TeamContext,
  opts: { page: number; pageSize: number; sort: string; dir: 'asc' | 'desc'; q?: string; role?: ProfileRow['role'] },
): Promise<Page<ProfileView>> {
  const p = deviceProfile;
  const where = and(
    eq(p.teamId, ctx.team.id),
    isNull(p.deletedAt),
    opts.role ? eq(p.role, opts.role) : undefined,
    opts.q ? or(like(p.name, likePattern(opts.q)), like(p.maker, likePattern(opts.q)), like(p.model, likePattern(opts.q))) : undefined,
  );
  const col = { name: p.name, role: p.role, maker: p.maker, model: p.model, updatedAt: p.updatedAt }[opts.sort as (typeof PROFILE_SORTS)[number]];
  const [rows, total] = await Promise.all([
    db.select({ p, deviceCount }).from(p).where(where).orderBy(...orderBy(col, opts.dir, p.id)).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize),
    countWhere(p, where),
  ]);
  return { items: rows.map((r) => view(r.p, Number(r.deviceCount))), page: opts.page, pageSize: opts.pageSize, total, sort: opts.sort, dir: opts.dir };
}

export async function getProfile(ctx: TeamContext, id: string): Promise<ProfileView> {
  const row = await findLive(db, ctx, profileEntity, id);
  const n = await countWhere(device, and(eq(device.profileId, id), isNull(device.deletedAt)));
  return view(row, n);
}

export async function createProfile(ctx: TeamContext, input: z.infer<typeof profileCreateSchema>): Promise<ProfileView> {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(deviceProfile).values({ id: newId('prof'), teamId: ctx.team.id, ...input, updatedBy: ctx.user.id }).returning();
    await recordCreated(tx, ctx, profileEntity, row!);
    return view(row!, 0);
  });
}

export async function updateProfile(ctx: TeamContext, id: string, input: z.infer<typeof profileUpdateSchema>): Promise<ProfileView> {
  const { version, ...values } = input;
  await db.transaction((tx) => updateVersioned(tx, ctx, profileEntity, id, version, definedOnly(values), { present: () => getProfile(ctx, id) }));
  return getProfile(ctx, id);
}

/** "Save as profile": the device's role, maker, model and ports (addresses cleared) become a new profile. */
export async function profileFromDevice(ctx: TeamContext, deviceId: string, name: string): Promise<ProfileView> {
  return db.transaction(async (tx) => {
    const dev = await findLive(tx, ctx, deviceEntity, deviceId);
    const ports = (await livePorts(tx, deviceId)).map((p) => ({
      name: p.name,
      settings: { ...p.settings, nodeAddress: null },
      wiring: p.wiring,
      notes: p.notes,
    }));
    const [row] = await tx
      .insert(deviceProfile)
      .values({ id: newId('prof'), teamId: ctx.team.id, name, role: dev.role, maker: dev.maker, model: dev.model, notes: '', ports, updatedBy: ctx.user.id })
      .returning();
    await recordCreated(tx, ctx, profileEntity, row!, `Saved ${dev.tag} as profile ${name}`);
    return view(row!, 0);
  });
}
