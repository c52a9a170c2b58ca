/** Team-scoped lookups of the vault records field work hangs off (404 for other teams and the trash). */
import { and, eq, isNull } from 'drizzle-orm';
import { db, type DbOrTx } from '../../../db/client';
import { device, machine, site } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { HttpError } from '../http';

type TeamRef = Pick<TeamContext, 'team'>;

export async function liveDevice(ctx: TeamRef, id: string, q: DbOrTx = db) {
  const [row] = await q.select().from(device).where(and(eq(device.id, id), eq(device.teamId, ctx.team.id), isNull(device.deletedAt)));
  if (!row) throw new HttpError(404, 'No device with that id in this team.');
  return row;
}

export async function liveMachine(ctx: TeamRef, id: string, q: DbOrTx = db) {
  const [row] = await q.select().from(machine).where(and(eq(machine.id, id), eq(machine.teamId, ctx.team.id), isNull(machine.deletedAt)));
  if (!row) throw new HttpError(404, 'No machine with that id in this team.');
  return row;
}

export async function liveSite(ctx: TeamRef, id: string, q: DbOrTx = db) {
  const [row] = await q.select().from(site).where(and(eq(site.id, id), eq(site.teamId, ctx.team.id), isNull(site.deletedAt)));
  if (!row) throw new HttpError(404, 'No site with that id in this team.');
  return row;
}

export function liveOwner(ctx: TeamRef, ownerType: 'device' | 'machine', id: string, q: DbOrTx = db) {
  return ownerType === 'device' ? liveDevice(ctx, id, q) : liveMachine(ctx, id, q);
}
