/** Team-scoped lookups of the vault records field work hangs off (404 for other teams and the trash). */
import { db, type DbOrTx } from '../../../db/client';
import type { TeamScope } from '../guard';
import { findInTeam } from '../records/engine';
import { deviceEntity, machineEntity, siteEntity } from '../records/entities';

export function liveDevice(ctx: TeamScope, id: string, q: DbOrTx = db) {
  return findInTeam(q, ctx, deviceEntity, id);
}

export function liveMachine(ctx: TeamScope, id: string, q: DbOrTx = db) {
  return findInTeam(q, ctx, machineEntity, id);
}

export function liveSite(ctx: TeamScope, id: string, q: DbOrTx = db) {
  return findInTeam(q, ctx, siteEntity, id);
}

export function liveOwner(ctx: TeamScope, ownerType: 'device' | 'machine', id: string, q: DbOrTx = db) {
  return ownerType === 'device' ? liveDevice(ctx, id, q) : liveMachine(ctx, id, q);
}
