/** Checks that the devices sharing one serial link agree and that an RS-485 bus is built correctly. */
import { overallState, type Severity } from './findings';
import type { PortInterface, PortSettings } from './port-settings';
import { CTS_MODE_LABELS, RTS_MODE_LABELS, lineShorthand } from './port-text';
import { bitsPerChar, charTimeMs } from './timing';

export interface LinkMember {
  id: string;
  label: string;
  role: 'master' | 'slave' | 'peer';
  settings: PortSettings;
  /** Receiver load in RS-485 unit loads (default 1; 1/8-load receivers count 0.125). */
  unitLoads?: number;
  /** Physically at one end of the cable. */
  isEnd?: boolean;
  /** This port is one side of a converter that carries its signals to another port (see `LinkBridge`). */
  bridge?: LinkBridge;
}

/**
 * What lies beyond a converter's port: the converter, its bridged port on the other side, and the ports linked to
 * that one (its link's other members). The check compares their line settings with this link's across the
 * converter, and takes the RTS of the sender beyond as the converter's direction control.
 */
export interface LinkBridge {
  /** The converter as shown, e.g. "CV-430". */
  via: string;
  /** The converter's port on the other side. */
  other: LinkMember;
  /** The ports linked to `other`, without `other` itself. */
  beyond: LinkMember[];
}

export interface Link {
  kind: 'point-to-point' | 'rs485-bus';
  cableLengthM?: number;
}

export const LINK_CODES = [
  'baud-mismatch', 'data-bits-mismatch', 'parity-mismatch', 'stop-bits-mismatch', 'handshake-mismatch', 'protocol-mismatch',
  'interface-mismatch', 'address-missing', 'address-duplicate', 'address-out-of-range', 'no-direction-control',
  'termination-missing', 'termination-in-middle', 'termination-count', 'bias-missing', 'too-many-unit-loads',
  'cable-too-long', 'multiple-masters', 'no-master', 'too-many-members', 'flow-one-end', 'cts-never-raised', 'rts-tail-short',
] as const;
export type LinkCode = (typeof LINK_CODES)[number];

export interface LinkFinding {
  severity: Severity;
  code: LinkCode;
  /** The member whose setting should change; absent for findings about the whole link. */
  memberId?: string;
  message: string;
}

export interface LinkReport {
  state: 'ok' | 'warning' | 'error';
  findings: LinkFinding[];
}

/** TIA-485-A: one driver drives at most 32 unit loads. */
export const MAX_UNIT_LOADS = 32;
/** Rule of thumb for RS-485 cable: length (m) × bit rate (bit/s) ≤ 10^8. */
export const LENGTH_RATE_LIMIT = 1e8;

type Family = 'rs232' | 'ttl' | 'diff-4w' | 'diff-2w';
function family(i: PortInterface): Family | undefined {
  if (i === 'rs232' || i === 'ttl') return i;
  if (i === 'rs422' || i === 'rs485-4w') return 'diff-4w';
  if (i === 'rs485-2w') return 'diff-2w';
  return undefined; // a USB or TCP port: the line side is the converter's, not known here
}
/** RTS/CTS hardware flow control: RTS says "ready to receive" and sending waits for CTS. */
const rtsCtsFlow = (s: PortSettings) => s.rtsMode === 'flow' && s.ctsMode === 'gate';
const dtrFlow = (s: PortSettings) => s.dtrMode === 'flow';
/** Interfaces whose control lines run in the cable from one end to the other. */
const hasLinesInCable = (i: PortInterface) => i === 'rs232' || i === 'ttl';
/** Whether a 2-wire RS-485 transmitter is switched off after sending: by RTS, or by the port itself. */
export const hasDirectionControl = (s: PortSettings) => s.rtsMode === 'transmit' || s.rs485Direction === 'auto';

const FAMILY_TEXT: Record<Family, string> = { rs232: 'RS-232', ttl: 'TTL serial', 'diff-4w': 'RS-422 / 4-wire RS-485', 'diff-2w': '2-wire RS-485' };

export function checkLink(members: readonly LinkMember[], link: Link): LinkReport {
  const findings: LinkFinding[] = [];
  const add = (severity: Severity, code: LinkCode, message: string, memberId?: string) =>
    findings.push(memberId === undefined ? { severity, code, message } : { severity, code, memberId, message });
  const bus = link.kind === 'rs485-bus';
  const masters = members.filter((m) => m.role === 'master');
  if (bus && masters.length > 1) for (const m of masters.slice(1)) add('error', 'multiple-masters', `${m.label} is a second master; a serial bus has one master. Make it a slave or move it to its own line.`, m.id);
  if (bus && masters.length === 0 && members.length > 0) add('warning', 'no-master', 'No member is the master; mark the device that sends the requests as master.');
  if (!bus && members.length > 2) add('error', 'too-many-members', `A point-to-point link joins two devices, not ${members.length}; use an RS-485 bus or separate ports.`);

  const ref = masters[0] ?? members[0];
  if (ref) {
    const r = ref.settings;
    const compareLine = (m: LinkMember) => {
      const s = m.settings;
      const fix = (what: string, want: string | number) => `${m.label}: set ${what} to ${want} to match ${ref.label} (${lineShorthand(r)}).`;
      if (s.baud !== r.baud) add('error', 'baud-mismatch', fix('the baud rate', r.baud), m.id);
      if (s.dataBits !== r.dataBits) add('error', 'data-bits-mismatch', fix('data bits', r.dataBits), m.id);
      if (s.parity !== r.parity) add('error', 'parity-mismatch', fix('parity', r.parity), m.id);
      if (s.stopBits !== r.stopBits) add('error', 'stop-bits-mismatch', fix('stop bits', r.stopBits), m.id);
      return fix;
    };
    for (const m of members) {
      if (m === ref) continue;
      const s = m.settings;
      const fix = compareLine(m);
      const flowOneEnd = rtsCtsFlow(s) !== rtsCtsFlow(r) || dtrFlow(s) !== dtrFlow(r);
      if (flowOneEnd) {
        const rtsDiffers = rtsCtsFlow(s) !== rtsCtsFlow(r);
        const [on, off] = (rtsDiffers ? rtsCtsFlow(s) : dtrFlow(s)) ? [m, ref] : [ref, m];
        const kind = rtsDiffers ? 'RTS/CTS' : 'DTR/DSR';
        add('error', 'flow-one-end', `${on.label} uses ${kind} hardware flow control but ${off.label} does not; one end then waits for a line the other never raises. Set both ends the same.`, m.id);
      } else if (s.handshake !== r.handshake) add('error', 'handshake-mismatch', fix('handshaking', r.handshake), m.id);
      if (s.protocol !== r.protocol) add('error', 'protocol-mismatch', fix('the protocol', r.protocol), m.id);
      const a = family(r.interface);
      const b = family(s.interface);
      if (!bus && a && b && a !== b) {
        add('error', 'interface-mismatch', `${m.label} is ${FAMILY_TEXT[b]} but ${ref.label} is ${FAMILY_TEXT[a]}; put a ${FAMILY_TEXT[a]} to ${FAMILY_TEXT[b]} converter between them.`, m.id);
      }
    }
    // Across a converter only the character format and the protocol must agree end to end: the interface, the
    // control lines and the addresses are each side's own, checked on the link that side is on.
    const here = new Set(members.map((m) => m.id));
    for (const m of members) {
      for (const b of m.bridge?.beyond ?? []) {
        if (here.has(b.id)) continue;
        here.add(b.id);
        const far = { ...b, label: `${b.label} (through ${m.bridge!.via})` };
        const fix = compareLine(far);
        if (b.settings.protocol !== r.protocol) add('error', 'protocol-mismatch', fix('the protocol', r.protocol), b.id);
      }
    }
  }

  if (bus) {
    const busFamily = members.map((m) => family(m.settings.interface)).find((f) => f === 'diff-2w' || f === 'diff-4w') ?? 'diff-2w';
    for (const m of members) {
      const f = family(m.settings.interface);
      if (f && f !== busFamily) {
        add('error', 'interface-mismatch', `${m.label} is ${FAMILY_TEXT[f]} but the bus is ${FAMILY_TEXT[busFamily]}; connect it through a ${FAMILY_TEXT[f]} to ${FAMILY_TEXT[busFamily]} converter.`, m.id);
      }
    }
  }

  const seen = new Map<number, LinkMember>();
  for (const m of members) {
    // A converter's port answers to no address of its own: the devices beyond it do, on their own link.
    if (m.role === 'master' || m.bridge) continue;
    const addr = m.settings.nodeAddress;
    const modbus = m.settings.protocol === 'modbus-rtu' || m.settings.protocol === 'modbus-ascii';
    if (addr === null) {
      if (bus || modbus) add('warning', 'address-missing', `${m.label} has no node address; give every device on the bus its own address.`, m.id);
      continue;
    }
    const first = seen.get(addr);
    if (first) add('error', 'address-duplicate', `${m.label} has address ${addr}, the same as ${first.label}; give it an unused address.`, m.id);
    else seen.set(addr, m);
    if (modbus) {
      if (addr === 0) add('error', 'address-out-of-range', `${m.label} has address 0, the Modbus broadcast address; set an address from 1 to 247.`, m.id);
      else if (addr > 247) add('error', 'address-out-of-range', `${m.label} has address ${addr}; Modbus device addresses are 1 to 247 (248-255 are reserved). Set one in that range.`, m.id);
    }
  }

  if (!bus && members.length === 2) {
    const [a, b] = members as [LinkMember, LinkMember];
    const flowOneEnd = rtsCtsFlow(a.settings) !== rtsCtsFlow(b.settings);
    for (const [x, y] of [[a, b], [b, a]] as const) {
      const rts = y.settings.rtsMode;
      if (flowOneEnd || !hasLinesInCable(x.settings.interface) || !hasLinesInCable(y.settings.interface)) continue;
      if (x.settings.ctsMode === 'gate' && rts !== 'on' && rts !== 'flow') {
        const why = rts === 'transmit' ? 'raises RTS only while it is sending itself' : 'never raises RTS';
        add('error', 'cts-never-raised', `${x.label} sends only while CTS is on, but ${y.label} ${why} (RTS: ${RTS_MODE_LABELS[rts]}), so ${x.label} waits to send. Set ${x.label}'s CTS to "${CTS_MODE_LABELS.ignore}", or ${y.label}'s RTS to flow control or always on.`, x.id);
      }
    }
  }

  for (const m of members) {
    const s = m.settings;
    if (s.interface === 'rs485-2w' && !hasDirectionControl(s)) {
      add('error', 'no-direction-control', `${m.label} is on 2-wire RS-485 with no direction control and no automatic direction switching; set its RTS to on while sending (or RS-485 direction to automatic, or fit a converter that switches by itself) so its transmitter turns off after sending.`, m.id);
    }
    const senders = m.bridge?.beyond.filter((b) => hasLinesInCable(b.settings.interface)) ?? [];
    if (s.interface === 'rs485-2w' && s.rtsMode === 'transmit' && senders.length > 0 && !senders.some((b) => b.settings.rtsMode === 'transmit')) {
      // A converter switched by RTS takes the line from the device on its other side; nothing else raises it.
      const names = senders.map((b) => b.label).join(', ');
      add('error', 'no-direction-control', `${m.label} switches its transmitter by RTS from the other side of ${m.bridge!.via}, but ${names} does not raise RTS while sending (RTS: ${senders.map((b) => RTS_MODE_LABELS[b.settings.rtsMode]).join(', ')}), so the converter never sends or never lets go of the bus. Set ${names}'s RTS to "${RTS_MODE_LABELS.transmit}", or set ${m.bridge!.via} to switch direction automatically.`, m.id);
    }
    // A converter's port does not drop RTS itself: the tail that matters is the sender's, checked on its own link.
    if (s.rtsMode === 'transmit' && s.interface !== 'tcp' && !m.bridge) {
      const charMs = charTimeMs(s);
      if (s.rtsTailMs < charMs) {
        add('warning', 'rts-tail-short', `${m.label} drops RTS ${s.rtsTailMs} ms after its transmit buffer empties, but the last character takes ${charMs.toFixed(2)} ms to leave the line (${bitsPerChar(s)} bits at ${s.baud} bit/s); a converter switched by RTS may cut off its last stop bit. Set the RTS tail to at least ${Math.ceil(charMs * 100) / 100} ms. (Assumes the tail counts from when the transmit buffer empties; if the port counts it from the end of the stop bit, this does not apply.)`, m.id);
      }
    }
  }

  if (bus) {
    const terminated = members.filter((m) => m.settings.termination);
    if (members.some((m) => m.isEnd !== undefined)) {
      for (const m of members) {
        if (m.isEnd && !m.settings.termination) add('warning', 'termination-missing', `${m.label} is at a cable end; switch its termination on (typically 120 Ω).`, m.id);
        if (!m.isEnd && m.settings.termination) add('warning', 'termination-in-middle', `${m.label} is not at a cable end; switch its termination off. Only the two ends are terminated.`, m.id);
      }
    } else if (terminated.length > 2) {
      add('error', 'termination-count', `${terminated.length} devices have termination on; only the two devices at the cable ends should. Switch it off on the others.`);
    } else if (terminated.length < 2 && members.length >= 2) {
      add('warning', 'termination-count', `${terminated.length} of the two cable ends are terminated; switch termination on at the device at each end of the cable.`);
    }
    if (members.length >= 2 && !members.some((m) => m.settings.bias)) {
      add('warning', 'bias-missing', 'No device biases the bus; switch bias on at one device (usually the master) so the idle line reads as a defined level.');
    }
    const loads = members.reduce((sum, m) => sum + (m.unitLoads ?? 1), 0);
    if (loads > MAX_UNIT_LOADS) {
      add('error', 'too-many-unit-loads', `The bus carries ${loads} unit loads; one driver handles ${MAX_UNIT_LOADS}. Use fractional-load devices or add a repeater.`);
    }
  }

  if (link.cableLengthM !== undefined && ref) {
    const product = link.cableLengthM * ref.settings.baud;
    if (product > LENGTH_RATE_LIMIT) {
      const maxM = Math.floor(LENGTH_RATE_LIMIT / ref.settings.baud);
      add('warning', 'cable-too-long', `${link.cableLengthM} m at ${ref.settings.baud} bit/s is beyond the usual limit (length × rate ≤ 10^8); keep the cable under about ${maxM} m or lower the baud rate.`);
    }
  }
  return { state: overallState(findings), findings };
}
