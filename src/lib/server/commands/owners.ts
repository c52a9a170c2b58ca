/** Where a command lives: a device or a device profile of the caller's team, with its ports. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import type { DbOrTx } from '../../../db/client';
import { deviceProfile, port } from '../../../db/schema';
import type { PortSettings } from '../../frame/port-settings';
import type { TeamContext } from '../guard';
import { findInTeam } from '../records/engine';
import { deviceEntity, profileEntity } from '../records/entities';

export type OwnerKind = 'device' | 'profile';

export interface CommandOwner {
  kind: OwnerKind;
  id: string;
  /** Tag and name of a device, or the profile's name. */
  label: string;
  /** A device's profile (whose commands it inherits); null for profiles. */
  profileId: string | null;
  ports: { name: string; settings: PortSettings }[];
}

export async function findOwner(q: DbOrTx, ctx: TeamContext, ref: { deviceId?: string | null; profileId?: string | null }): Promise<CommandOwner> {
  if (ref.deviceId) {
    const d = await findInTeam(q, ctx, deviceEntity, ref.deviceId);
    const ports = await q
      .select({ name: port.name, settings: port.settings })
      .from(port)
      .where(and(eq(port.deviceId, d.id), isNull(port.deletedAt)))
      .orderBy(asc(port.position), asc(port.name));
    return { kind: 'device', id: d.id, label: d.name ? `${d.tag} ${d.name}` : d.tag, profileId: d.profileId, ports };
  }
  const p = await findInTeam(q, ctx, profileEntity, ref.profileId ?? '');
  return { kind: 'profile', id: p.id, label: p.name, profileId: null, ports: p.ports.map((x) => ({ name: x.name, settings: x.settings })) };
}

/** The live profile a device inherits commands from, or null. */
export async function liveProfileId(q: DbOrTx, ctx: TeamContext, profileId: string | null): Promise<string | null> {
  if (!profileId) return null;
  const [p] = await q
    .select({ id: deviceProfile.id })
    .from(deviceProfile)
    .where(and(eq(deviceProfile.id, profileId), eq(deviceProfile.teamId, ctx.team.id), isNull(deviceProfile.deletedAt)));
  return p?.id ?? null;
}
