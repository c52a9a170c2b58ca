/** What the library and composer pages need, loaded in one place (pages call services directly). */
import { and, eq } from 'drizzle-orm';
import { db } from '../../../db/client';
import { device, machine } from '../../../db/schema';
import { can } from '../../permissions';
import { starterTemplate } from '../../composer/segments';
import type { TeamContext } from '../guard';
import { getCommand, getCommandForDevice } from './commands';
import { findOwner, type OwnerKind } from './owners';
import { Forbidden, NotFound } from '../errors';

export const ownerPath = (kind: OwnerKind, id: string) => `/vault/${kind === 'device' ? 'devices' : 'profiles'}/${id}/commands`;

export async function libraryPage(ctx: TeamContext, kind: OwnerKind, id: string) {
  const owner = await findOwner(db, ctx, kind === 'device' ? { deviceId: id } : { profileId: id });
  return { owner: { kind, id, label: owner.label }, basePath: ownerPath(kind, id), canEdit: can(ctx.role, 'command:update'), ports: owner.ports };
}

/** A device's commands are measured against its machine's PLC STRING, when the machine records its length. */
async function plcStringCapacity(ctx: TeamContext, kind: OwnerKind, id: string): Promise<number | null> {
  if (kind !== 'device') return null;
  const [m] = await db.select({ capacity: machine.plcStringCapacity }).from(device).innerJoin(machine, eq(machine.id, device.machineId))
    .where(and(eq(device.id, id), eq(device.teamId, ctx.team.id)));
  return m?.capacity ?? null;
}

/**
 * Props for the composer island; `commandId` "new" gives an unsaved command started from the first port's frame
 * rules, or with `newSequence` an unsaved sequence without steps.
 */
export async function composerPage(ctx: TeamContext, kind: OwnerKind, id: string, commandId: string, opts: { newSequence?: boolean } = {}) {
  const lib = { ...(await libraryPage(ctx, kind, id)), plcStringCapacity: await plcStringCapacity(ctx, kind, id) };
  if (commandId === 'new') {
    if (!can(ctx.role, 'command:create')) throw new Forbidden(`Your role (${ctx.role}) does not allow command create.`);
    const rules = lib.ports[0]?.settings.frameRules ?? {};
    const template = starterTemplate(rules, lib.ports[0]?.settings.protocol);
    const sequence = opts.newSequence ? { mode: 'one-string' as const, delayMs: 0, steps: [] } : null;
    const command = { name: sequence ? 'New sequence' : 'New command', purpose: '', notes: '', movesMachinery: false, safeToRepeat: false, setsUpDevice: false, template: sequence ? { version: 1 as const, segments: [] } : template, fieldValues: {}, replyTemplate: null, portName: lib.ports[0]?.name ?? '', rawUnits: {}, presets: [], sequence };
    return { ...lib, command, inheritedFrom: undefined };
  }
  const c = kind === 'device' ? await getCommandForDevice(ctx, id, commandId) : await getCommand(ctx, commandId);
  if (kind === 'profile' && c.profileId !== id) throw new NotFound('No command with that id in this profile.');
  const inheritedFrom = c.inherited && c.profileId ? { profileId: c.profileId, label: c.owner.label } : undefined;
  const command = { id: c.id, version: c.version, name: c.name, purpose: c.purpose, notes: c.notes, movesMachinery: c.movesMachinery, safeToRepeat: c.safeToRepeat, setsUpDevice: c.setsUpDevice, template: c.template, fieldValues: c.fieldValues, replyTemplate: c.replyTemplate, portName: c.portName, rawUnits: c.rawUnits, presets: c.presets, sequence: c.sequence };
  return { ...lib, command, inheritedFrom };
}
