/**
 * What the bus page's poll cycle panel starts from (`BusPlan`, src/lib/composer/bus-plan.ts): the master's port
 * settings and, per other member, its port settings and the byte counts of its device's library commands. The
 * saved plan itself is the link's `busPlan` (checked here on every save: `assertBusPlan`).
 */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import type { DbOrTx } from '../../../db/client';
import { command, device, port } from '../../../db/schema';
import type { StoredBusPlan } from '../../schemas/bus-plan';
import { Invalid } from '../errors';
import { assembleFrame } from '../../frame/assemble';
import type { BusPlan, PlanCommand, PlanMember } from '../../composer/bus-plan';
import { decodeReplyLength } from '../../composer/reply-length';
import type { TeamContext } from '../guard';
import { listCommands } from '../commands/commands';
import { memberLabel } from './link-report';
import type { LinkView } from './links';

/** Bytes of a command as its saved values assemble it; null when its values do not assemble. */
function bytesOf(run: () => number): number | null {
  try {
    return run();
  } catch {
    return null;
  }
}

/** The plan's starting point for an RS-485 bus with a master and at least one other live member; else null. */
export async function busPlan(ctx: TeamContext, link: LinkView): Promise<BusPlan | null> {
  if (link.kind !== 'rs485-bus') return null;
  const live = link.members.filter((m) => !m.inTrash);
  const master = live.find((m) => m.role === 'master');
  const others = live.filter((m) => m !== master);
  if (!master || others.length === 0) return null;
  const byDevice = new Map<string, PlanCommand[]>();
  for (const deviceId of new Set(others.map((m) => m.deviceId))) {
    const { items } = await listCommands(ctx, { deviceId });
    const commands: PlanCommand[] = [];
    for (const c of items) {
      const requestBytes = bytesOf(() => assembleFrame(c.template, c.fieldValues).byteCount);
      if (requestBytes === null || requestBytes === 0) continue;
      commands.push({ id: c.id, name: c.name, requestBytes, replyBytes: c.replyTemplate ? bytesOf(() => decodeReplyLength(c.replyTemplate!)) : null });
    }
    byDevice.set(deviceId, commands);
  }
  const member = (m: (typeof live)[number]): PlanMember => ({
    portId: m.portId, label: memberLabel(m), role: m.role, settings: m.settings, commands: byDevice.get(m.deviceId) ?? [],
  });
  return { master: member(master), members: others.map(member), trunkM: link.cableLengthM, linkCodes: link.report.findings.map((f) => f.code) };
}

/**
 * 422 unless every poll asks a member of the link (`members`: the members the link has after this save) and every
 * command it names is in that member's library: a live command of the member's device or of the device's profile.
 */
export async function assertBusPlan(q: DbOrTx, ctx: TeamContext, plan: StoredBusPlan, members: { portId: string }[]): Promise<void> {
  const fields: Record<string, string> = {};
  const memberIds = new Set(members.map((m) => m.portId));
  plan.polls.forEach((p, i) => {
    if (!memberIds.has(p.portId)) fields[`busPlan.polls.${i}.portId`] = 'That port is not a member of this link; add it to the members first.';
  });
  const commandIds = [...new Set(plan.polls.flatMap((p) => (p.commandId && memberIds.has(p.portId) ? [p.commandId] : [])))];
  if (commandIds.length) {
    const ports = await q.select({ id: port.id, deviceId: port.deviceId, profileId: device.profileId }).from(port)
      .innerJoin(device, eq(device.id, port.deviceId))
      .where(and(eq(port.teamId, ctx.team.id), inArray(port.id, [...memberIds])));
    const commands = await q.select({ id: command.id, deviceId: command.deviceId, profileId: command.profileId }).from(command)
      .where(and(eq(command.teamId, ctx.team.id), inArray(command.id, commandIds), isNull(command.deletedAt)));
    const portOf = new Map(ports.map((p) => [p.id, p]));
    const commandOf = new Map(commands.map((c) => [c.id, c]));
    plan.polls.forEach((p, i) => {
      if (!p.commandId || !memberIds.has(p.portId)) return;
      const c = commandOf.get(p.commandId);
      const at = portOf.get(p.portId);
      const ok = c && at && (c.deviceId === at.deviceId || (c.profileId !== null && c.profileId === at.profileId));
      if (!ok) fields[`busPlan.polls.${i}.commandId`] = "That command is not in the library of this member's device; choose one of its commands or type the byte counts.";
    });
  }
  const keys = Object.keys(fields);
  if (keys.length) throw new Invalid(`${keys[0]}: ${fields[keys[0]!]}`, { fields });
}
