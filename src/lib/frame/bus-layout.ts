/**
 * The physical layout of an RS-485 bus: one trunk cable, each device on it directly (daisy chain) or on a short
 * drop (stub) cable (Modbus over Serial Line V1.02 §3.4.2). Kept apart from `checkLink` (./link-check.ts), which
 * checks the settings the members agree on; this checks where the cable runs.
 */
import type { Severity } from './findings';

/** Modbus over Serial Line V1.02 §3.4.2: a drop is never longer than 20 m. */
export const MAX_DROP_M = 20;
/** Modbus over Serial Line V1.02 §3.4.2: on a multi-port tap with n drops, each is at most 40 m ÷ n. */
export const MULTI_PORT_TAP_M = 40;

export const BUS_TOPOLOGIES = ['daisy-chain', 'trunk-and-drops', 'star'] as const;
export type BusTopology = (typeof BUS_TOPOLOGIES)[number];

export interface BusLayoutMember {
  id: string;
  label: string;
  /** Length of its drop cable from the trunk, m (0 or absent: on the trunk itself). */
  dropM?: number;
  /** Drops sharing its tap (a multi-port tap); 1 or absent: a tap of its own. */
  tapPorts?: number;
  termination?: boolean;
  bias?: boolean;
}

export interface BusLayout {
  /** Trunk length, m (the link's cable length). */
  trunkM?: number;
  /** As drawn by the user; absent: worked out from the drops. */
  topology?: BusTopology;
}

export const BUS_LAYOUT_CODES = ['drop-too-long', 'bias-multiple', 'termination-too-many', 'star-layout'] as const;
export type BusLayoutCode = (typeof BUS_LAYOUT_CODES)[number];

export interface BusLayoutFinding {
  severity: Severity;
  code: BusLayoutCode;
  memberId?: string;
  message: string;
}

/** Longest drop allowed for a member on a tap of `tapPorts` ports, m. */
export function maxDropM(tapPorts = 1): number {
  return tapPorts > 1 ? MULTI_PORT_TAP_M / tapPorts : MAX_DROP_M;
}

/**
 * A star: the user says so, or three or more devices hang on drops with no trunk longer than the longest drop
 * (every run then starts from one point, and the two far ends a terminated bus needs are not there).
 */
function looksLikeStar(members: readonly BusLayoutMember[], layout: BusLayout): boolean {
  if (layout.topology) return layout.topology === 'star';
  const drops = members.map((m) => m.dropM ?? 0).filter((d) => d > 0);
  if (drops.length < 3) return false;
  return (layout.trunkM ?? 0) <= Math.max(...drops);
}

export function checkBusLayout(members: readonly BusLayoutMember[], layout: BusLayout = {}): BusLayoutFinding[] {
  const findings: BusLayoutFinding[] = [];
  for (const m of members) {
    const drop = m.dropM ?? 0;
    const ports = m.tapPorts ?? 1;
    const max = maxDropM(ports);
    if (drop > max) {
      const rule = ports > 1 ? `${Math.round(max * 100) / 100} m on a ${ports}-port tap (40 m ÷ ${ports})` : `${MAX_DROP_M} m`;
      findings.push({ severity: 'warning', code: 'drop-too-long', memberId: m.id, message: `${m.label} hangs on a ${drop} m drop; keep drops under ${rule}, or run the trunk past the device and connect it directly.` });
    }
  }
  const biased = members.filter((m) => m.bias);
  if (biased.length > 1) {
    findings.push({ severity: 'warning', code: 'bias-multiple', message: `${biased.length} devices bias the bus (${biased.map((m) => m.label).join(', ')}); bias it at one point only, usually the master, and switch the others off.` });
  }
  const terminated = members.filter((m) => m.termination);
  if (terminated.length > 2) {
    findings.push({ severity: 'warning', code: 'termination-too-many', message: `${terminated.length} devices terminate the bus (${terminated.map((m) => m.label).join(', ')}); only the two at the ends of the trunk should.` });
  }
  if (looksLikeStar(members, layout)) {
    findings.push({ severity: 'warning', code: 'star-layout', message: 'The bus is wired as a star: RS-485 wants one trunk with the devices along it and a terminator at each end. Rewire as a daisy chain or a trunk with short drops.' });
  }
  return findings;
}
