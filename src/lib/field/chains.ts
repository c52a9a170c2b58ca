/**
 * Where a port is wired, in words, and the chains converters make of a machine's links: the machine page draws
 * each chain, the field card and its print say what a port is wired to and through which converter.
 */

export interface ChainMember {
  portId: string;
  deviceTag: string;
  portName: string;
  role?: 'master' | 'slave' | 'peer';
  /** The port is one side of a converter: its port on the other side and what is linked there. */
  bridge?: { deviceTag: string; other: { portId: string; portName: string }; beyond: { deviceTag: string; portName: string }[] };
}

export interface ChainLink {
  id: string;
  name: string;
  report: { state: 'ok' | 'warning' | 'error' };
  members: ChainMember[];
}

const end = (m: { deviceTag: string; portName: string }) => `${m.deviceTag} ${m.portName}`;
const list = (names: string[]) => (names.length ? names.join(', ') : 'nothing linked yet');

/**
 * One line per link the port is on: "Wired to CV-430 RS-232, through CV-430 to DRV-440 RS-485 (PLC to converter)".
 * A converter's own port says what it is carried across to.
 */
export function portRoutes(portId: string, links: readonly ChainLink[]): string[] {
  const out: string[] = [];
  for (const l of links) {
    const me = l.members.find((m) => m.portId === portId);
    if (!me) continue;
    const others = l.members.filter((m) => m !== me);
    const parts = others.map((o) => (o.bridge ? `${end(o)}, through ${o.bridge.deviceTag} to ${list(o.bridge.beyond.map(end))}` : end(o)));
    let line = `Wired to ${list(parts)} (${l.name})`;
    if (me.bridge) line += `; carried across ${me.bridge.deviceTag} to its ${me.bridge.other.portName}, wired to ${list(me.bridge.beyond.map(end))}`;
    out.push(line);
  }
  return out;
}

export interface ChainSide {
  /** The converter's port on this side. */
  portName: string;
  link: { id: string; name: string; state: 'ok' | 'warning' | 'error' } | null;
  /** The ports on this side's link, apart from the converter's. */
  ends: string[];
}

export interface ConverterChain {
  converter: string;
  sides: [ChainSide, ChainSide];
}

/**
 * Each bridged pair of a converter seen on these links, once, with the link and the ports on either side. A side
 * whose link is not among `links` (another machine's) shows the ports the bridge reaches there, without a link.
 */
export function converterChains(links: readonly ChainLink[]): ConverterChain[] {
  const out: ConverterChain[] = [];
  const seen = new Set<string>();
  const linkOf = (portId: string) => links.find((l) => l.members.some((m) => m.portId === portId));
  for (const l of links) {
    for (const m of l.members) {
      if (!m.bridge) continue;
      const key = [m.portId, m.bridge.other.portId].sort().join(' ');
      if (seen.has(key)) continue;
      seen.add(key);
      const far = linkOf(m.bridge.other.portId);
      const side = (lk: ChainLink, portId: string, portName: string): ChainSide => ({
        portName, link: { id: lk.id, name: lk.name, state: lk.report.state }, ends: lk.members.filter((x) => x.portId !== portId).map(end),
      });
      const near = side(l, m.portId, m.portName);
      const other: ChainSide = far ? side(far, m.bridge.other.portId, m.bridge.other.portName) : { portName: m.bridge.other.portName, link: null, ends: m.bridge.beyond.map(end) };
      // The side the requests come from first: where the converter's port is the bus master, it is the far side.
      out.push({ converter: m.bridge.deviceTag, sides: m.role === 'master' ? [other, near] : [near, other] });
    }
  }
  return out;
}
