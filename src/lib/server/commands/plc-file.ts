/** Structured Text files of a device's or a machine's whole command library (`.st` downloads). */
import { and, asc, eq, isNull } from 'drizzle-orm';
import { db } from '../../../db/client';
import { device } from '../../../db/schema';
import { sequenceInputs, type StepCommand } from '../../composer/saved-sequence';
import { plcFileForCommands, plcFileForDevices, prefixProblem, type PlcFileCommand } from '../../frame/plc-code';
import { Invalid } from '../errors';
import type { TeamContext } from '../guard';
import { getMachine } from '../vault/machines';
import { listCommands, type CommandView } from './commands';

/** The `?prefix=` of a download, refused with a message when it cannot start an IEC identifier. */
export function checkedPrefix(prefix: string | null): string {
  const p = prefix ?? '';
  const bad = p.length > 32 ? 'The prefix is at most 32 characters' : prefixProblem(p);
  if (bad) throw new Invalid(bad);
  return p;
}

/** The library as the file generator takes it: a sequence's steps resolved against the same library. */
function fileCommands(items: readonly CommandView[]): PlcFileCommand[] {
  const byId = new Map<string, StepCommand>(items.map((c) => [c.id, { ...c, isSequence: !!c.sequence, trashed: false }]));
  return items.map((c) => {
    const base = { name: c.name, template: c.template, presets: c.presets ?? [] };
    if (!c.sequence) return base;
    const gap = c.steps?.find((s) => s.gap)?.gap;
    if (gap) return { ...base, sequence: { gap } };
    const steps = sequenceInputs(c.sequence, (id) => byId.get(id)).map((s) => ({ template: s.template, values: s.values ?? {} }));
    return { ...base, sequence: { mode: c.sequence.mode, delayMs: c.sequence.delayMs, steps } };
  });
}

const fileName = (label: string, fallback: string) => (label.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || fallback) + '.st';

/** One device's commands (own and inherited), presets and sequences. */
export async function devicePlcFile(ctx: TeamContext, deviceId: string, prefix: string): Promise<{ name: string; text: string }> {
  const { owner, items } = await listCommands(ctx, { deviceId });
  return { name: fileName(owner.label, 'device'), text: plcFileForCommands(owner.label, fileCommands(items), prefix) };
}

/** Every device of a machine (by tag), each device's POUs named after its tag. */
export async function machinePlcFile(ctx: TeamContext, machineId: string, prefix: string): Promise<{ name: string; text: string }> {
  const m = await getMachine(ctx, machineId);
  const devices = await db.select({ id: device.id, tag: device.tag }).from(device)
    .where(and(eq(device.teamId, ctx.team.id), eq(device.machineId, m.id), isNull(device.deletedAt)))
    .orderBy(asc(device.tag), asc(device.id));
  const withCommands = [];
  for (const d of devices) withCommands.push({ tag: d.tag, commands: fileCommands((await listCommands(ctx, { deviceId: d.id })).items) });
  const title = `${m.name}${m.code ? ` (${m.code})` : ''}, ${m.siteName}`;
  return { name: fileName(m.name, 'machine'), text: plcFileForDevices(title, withCommands, prefix) };
}
