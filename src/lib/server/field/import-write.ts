/** Stages a checked import: new rows in parent-first order, their creation revisions and the import map. */
import { command, device, deviceProfile, importMap, link, linkMember, machine, port, revision, site } from '../../../db/schema';
import type { RecordType } from '../../../db/schema';
import type { TeamContext } from '../guard';
import { newId } from '../ids';
import { entityOf } from '../records/entities';
import { creationRevision, revisionRow } from '../records/engine';
import type { ExportDocument } from '../../schemas/field';
import type { Section } from './import';
import { sql } from 'drizzle-orm';
import { STAGE_BATCH as SLICE, type Stage } from '../jobs/stage';

const importId = (section: Section) => newId({ sites: 'site', machines: 'mach', profiles: 'prof', devices: 'dev', ports: 'port', links: 'link', commands: 'cmd' }[section]);

/** Creation revisions for imported rows, as the engine writes them one by one (snapshot keys from the entity). */
export function creationRevisions(ctx: TeamContext, type: RecordType, rows: ({ id: string } & Record<string, unknown>)[], summary: string) {
  const entity = entityOf(type);
  return rows.map((r) => revisionRow(ctx, creationRevision(entity, r, summary)));
}

/** Parent-first order of the tables an import fills. */
const ORDER = [site, machine, deviceProfile, device, port, link, linkMember, command, revision] as const;

export async function stageImport(stage: Stage, ctx: TeamContext, doc: ExportDocument, known: Record<Section, Map<string, string>>): Promise<void> {
  for (const t of ORDER) stage.target(t);
  // A source whose earlier copy was purged from the trash points at the new copy now.
  stage.target(importMap, { onConflict: sql`ON CONFLICT (team_id, entity_type, source_id) DO UPDATE SET target_id = excluded.target_id` });
  const team = ctx.team.id;
  const stamp = { teamId: team, updatedBy: ctx.user.id };
  const ids = Object.fromEntries(Object.entries(known).map(([k, m]) => [k, new Map(m)])) as Record<Section, Map<string, string>>;
  const mapRows: { teamId: string; entityType: string; sourceId: string; targetId: string }[] = [];
  const fresh = <T extends { id: string }>(section: Section, list: T[]) =>
    list.filter((r) => !known[section].has(r.id)).map((r) => {
      const target = importId(section);
      ids[section].set(r.id, target);
      mapRows.push({ teamId: team, entityType: section, sourceId: r.id, targetId: target });
      return { source: r, target };
    });
  const summary = `Imported from ${doc.source.team || 'an export'}`;
  const sites = fresh('sites', doc.sites).map(({ source: s, target }) => ({ ...s, ...stamp, id: target }));
  const machines = fresh('machines', doc.machines).map(({ source: m, target }) => ({ ...m, ...stamp, id: target, siteId: ids.sites.get(m.siteId)! }));
  const profiles = fresh('profiles', doc.profiles).map(({ source: f, target }) => ({ ...f, ...stamp, id: target }));
  const devices = fresh('devices', doc.devices).map(({ source: d, target }) => ({
    ...d, ...stamp, id: target, machineId: ids.machines.get(d.machineId)!, profileId: d.profileId ? ids.profiles.get(d.profileId)! : null,
  }));
  const ports = fresh('ports', doc.ports).map(({ source: p, target }) => ({ ...p, ...stamp, id: target, deviceId: ids.devices.get(p.deviceId)! }));
  // A converter's bridges name its ports, which have their new ids by now.
  for (const d of devices) d.bridges = d.bridges.map(([a, b]) => [ids.ports.get(a)!, ids.ports.get(b)!]);
  const links = fresh('links', doc.links).map(({ source: l, target }) => ({
    ...l, ...stamp, id: target, machineId: ids.machines.get(l.machineId)!,
    members: l.members.map((m) => ({ ...m, portId: ids.ports.get(m.portId)! })),
  }));
  const commands = fresh('commands', doc.commands).map(({ source: c, target }) => ({
    ...c, ...stamp, id: target, deviceId: c.deviceId ? ids.devices.get(c.deviceId)! : null, profileId: c.profileId ? ids.profiles.get(c.profileId)! : null,
  }));
  // Every command has its new id by now, so a step may refer to a command later in the file.
  for (const c of commands) {
    if (c.sequence) c.sequence = { ...c.sequence, steps: c.sequence.steps.map((s) => (s.commandId ? { ...s, commandId: ids.commands.get(s.commandId)! } : s)) };
  }
  // A bus plan names member ports and commands: mapped as the members are (commands are mapped by now).
  for (const l of links) {
    if (l.busPlan) l.busPlan = { ...l.busPlan, polls: l.busPlan.polls.map((p) => ({ ...p, portId: ids.ports.get(p.portId)!, ...(p.commandId ? { commandId: ids.commands.get(p.commandId)! } : {}) })) };
  }

  await stage.add(site, sites);
  await stage.add(machine, machines);
  await stage.add(deviceProfile, profiles);
  await stage.add(device, devices);
  await stage.add(port, ports);
  await stage.add(link, links.map(({ members: _m, ...l }) => l));
  await stage.add(linkMember, links.flatMap((l) => l.members.map((m) => ({ linkId: l.id, teamId: team, ...m }))));
  await stage.add(command, commands);
  // Revisions are built a slice at a time, so building them never holds up other requests for long.
  const revise = async (type: RecordType, rows: ({ id: string } & Record<string, unknown>)[]) => {
    for (let lo = 0; lo < rows.length; lo += SLICE) await stage.add(revision, creationRevisions(ctx, type, rows.slice(lo, lo + SLICE), summary));
  };
  await revise('site', sites);
  await revise('machine', machines);
  await revise('profile', profiles);
  await revise('device', devices);
  await revise('port', ports);
  await revise('link', links.map((l) => ({ ...l, members: l.members.map(({ position: _p, ...m }) => m) })));
  await revise('command', commands);
  await stage.add(importMap, mapRows);
}
