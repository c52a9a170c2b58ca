/**
 * What the bus page's poll cycle panel starts from (`BusPlan`, src/lib/composer/bus-plan.ts): the master's port
 * settings and, per other member, its port settings and the byte counts of its device's library commands. The poll
 * list itself is not stored (no column holds it yet); the panel keeps it in the page.
 */
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
