/** Checks on an export document that a schema cannot express, and the id-free form used to compare two exports. */
import { nameKey } from '../schemas/vault';

interface Doc {
  sites: { id: string }[];
  machines: { id: string; siteId: string }[];
  profiles: { id: string }[];
  devices: { id: string; machineId: string; profileId: string | null; tag: string; role?: string; bridges?: [string, string][] }[];
  ports: { id: string; deviceId: string; name: string }[];
  links: { id: string; machineId: string; name: string; members: { portId: string }[]; busPlan?: { polls: { portId: string; commandId?: string }[] } | null }[];
  commands: { id: string; deviceId: string | null; profileId: string | null; name: string; sequence?: { steps: { commandId?: string }[] } }[];
}

/** Every reference resolves inside the document, ids are unique, tags are unique per machine and port names per device (`nameKey`). Answers problems in words. */
export function documentProblems(doc: Doc, max = 20): string[] {
  const out: string[] = [];
  const add = (msg: string) => out.length < max && out.push(msg);
  const ids = new Set<string>();
  const unique = (list: { id: string }[], what: string) => {
    for (const r of list) {
      if (ids.has(r.id)) add(`${what} ${r.id}: the id is used twice in the document`);
      ids.add(r.id);
    }
    return new Set(list.map((r) => r.id));
  };
  const sites = unique(doc.sites, 'site');
  const machines = unique(doc.machines, 'machine');
  const profiles = unique(doc.profiles, 'profile');
  const devices = unique(doc.devices, 'device');
  unique(doc.ports, 'port');
  unique(doc.links, 'link');
  unique(doc.commands, 'command');
  for (const m of doc.machines) if (!sites.has(m.siteId)) add(`machine ${m.id}: its site ${m.siteId} is not in the document`);
  const tags = new Set<string>();
  for (const d of doc.devices) {
    const key = `${d.machineId}\u0000${nameKey(d.tag)}`;
    if (tags.has(key)) add(`device ${d.tag}: two devices of machine ${d.machineId} have this tag`);
    tags.add(key);
    if (!machines.has(d.machineId)) add(`device ${d.tag}: its machine ${d.machineId} is not in the document`);
    if (d.profileId && !profiles.has(d.profileId)) add(`device ${d.tag}: its profile ${d.profileId} is not in the document`);
  }
  const portDevice = new Map<string, string>();
  const names = new Set<string>();
  for (const p of doc.ports) {
    if (!devices.has(p.deviceId)) add(`port ${p.name}: its device ${p.deviceId} is not in the document`);
    const key = `${p.deviceId}\u0000${nameKey(p.name)}`;
    if (names.has(key)) add(`port ${p.name}: two ports of device ${p.deviceId} have this name`);
    names.add(key);
    portDevice.set(p.id, p.deviceId);
  }
  for (const d of doc.devices) {
    const bridges = d.bridges ?? [];
    if (bridges.length && d.role !== 'converter') add(`device ${d.tag}: only a converter bridges its ports, and its role is ${d.role}`);
    for (const id of bridges.flat()) if (portDevice.get(id) !== d.id) add(`device ${d.tag}: bridged port ${id} is not one of its ports in the document`);
  }
  const deviceMachine = new Map(doc.devices.map((d) => [d.id, d.machineId]));
  const deviceProfile = new Map(doc.devices.map((d) => [d.id, d.profileId]));
  const commandOwner = new Map(doc.commands.map((c) => [c.id, c]));
  /** A command of the device, or of the device's profile. */
  const inLibrary = (commandId: string, deviceId: string | undefined) => {
    const c = commandOwner.get(commandId);
    return !!c && !!deviceId && (c.deviceId === deviceId || (c.profileId !== null && c.profileId === deviceProfile.get(deviceId)));
  };
  for (const l of doc.links) {
    if (!machines.has(l.machineId)) add(`link ${l.name}: its machine ${l.machineId} is not in the document`);
    for (const m of l.members) {
      const dev = portDevice.get(m.portId);
      if (!dev) add(`link ${l.name}: member port ${m.portId} is not in the document`);
      else if (deviceMachine.get(dev) !== l.machineId) add(`link ${l.name}: member port ${m.portId} is on another machine`);
    }
    const members = new Set(l.members.map((m) => m.portId));
    l.busPlan?.polls.forEach((p, i) => {
      if (!members.has(p.portId)) add(`link ${l.name}: poll ${i + 1} asks port ${p.portId}, which is not a member of the link`);
      else if (p.commandId && !inLibrary(p.commandId, portDevice.get(p.portId))) add(`link ${l.name}: poll ${i + 1} sends command ${p.commandId}, which is not in the library of its member's device`);
    });
  }
  for (const c of doc.commands) {
    if ((c.deviceId === null) === (c.profileId === null)) add(`command ${c.name}: give exactly one of deviceId and profileId`);
    else if (c.deviceId && !devices.has(c.deviceId)) add(`command ${c.name}: its device ${c.deviceId} is not in the document`);
    else if (c.profileId && !profiles.has(c.profileId)) add(`command ${c.name}: its profile ${c.profileId} is not in the document`);
  }
  const commands = new Map(doc.commands.map((c) => [c.id, c]));
  for (const c of doc.commands) {
    (c.sequence?.steps ?? []).forEach((s, i) => {
      if (!s.commandId) return;
      const to = commands.get(s.commandId);
      const at = `command ${c.name}: step ${i + 1}`;
      if (!to) add(`${at} refers to command ${s.commandId}, which is not in the document (it was in the trash or purged when exported?); replace the step or remove the sequence from the file`);
      else if (to.id === c.id) add(`${at} refers to the sequence itself`);
      else if (to.deviceId !== c.deviceId || to.profileId !== c.profileId) add(`${at} refers to command ${to.name} of another device or profile`);
      else if (to.sequence) add(`${at} refers to ${to.name}, which is itself a sequence`);
    });
  }
  return out;
}

const REF_KEYS = ['id', 'siteId', 'machineId', 'deviceId', 'profileId', 'portId', 'commandId'] as const;

/**
 * The document with every id replaced by its record's position (`#3`) and the header (team, time)
 * left out: two exports of the same data compare equal whatever ids the records have.
 */
export function withoutIds(doc: Doc & Record<string, unknown>): Record<string, unknown> {
  const ordinal = new Map<string, string>();
  for (const section of ['sites', 'machines', 'profiles', 'devices', 'ports', 'links', 'commands'] as const) {
    (doc[section] as { id: string }[]).forEach((r, i) => ordinal.set(r.id, `${section}#${i}`));
  }
  const strip = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(strip);
    if (v && typeof v === 'object') {
      return Object.fromEntries(Object.entries(v).map(([k, x]) =>
        [k, (REF_KEYS as readonly string[]).includes(k) && typeof x === 'string' ? (ordinal.get(x) ?? `?${x}`)
          : k === 'bridges' && Array.isArray(x) ? x.map((pair: string[]) => pair.map((id) => ordinal.get(id) ?? `?${id}`)) : strip(x)]));
    }
    return v;
  };
  const { format, version, sites, machines, profiles, devices, ports, links, commands } = doc;
  return { format, version, ...(strip({ sites, machines, profiles, devices, ports, links, commands }) as object) };
}
