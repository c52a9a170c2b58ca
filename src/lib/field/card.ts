/** The content of a field card, built from vault records: what a technician reads at the cabinet. */
import { portSettingsText, type PortSettings, type Template, type FieldValues } from '../frame';
import { renderCommandVariants, type CommandPreset, type CommandRendering } from '../composer/presets';

export { MACHINERY_CAUTION as CAUTION } from '../caution';

const PARITY_TEXT = { none: 'None', even: 'Even', odd: 'Odd', mark: 'Mark', space: 'Space' } as const;
const INTERFACE_TEXT: Record<PortSettings['interface'], string> = {
  rs232: 'RS-232', rs422: 'RS-422', 'rs485-2w': 'RS-485 2-wire', 'rs485-4w': 'RS-485 4-wire', ttl: 'TTL', 'usb-vcp': 'USB COM', tcp: 'TCP',
};
const PROTOCOL_TEXT = { ascii: 'ASCII', 'modbus-rtu': 'Modbus RTU', 'modbus-ascii': 'Modbus ASCII', other: 'Other' } as const;
const HANDSHAKE_TEXT = { none: 'None', 'rts-cts': 'RTS/CTS', 'xon-xoff': 'XON/XOFF', 'dtr-dsr': 'DTR/DSR' } as const;

export interface CardPortInput {
  id: string;
  name: string;
  settings: PortSettings;
  wiring: { pin: string; signal: string; colour: string }[];
  notes: string;
}

export interface CardCommandInput {
  id: string;
  name: string;
  purpose: string;
  template: Template;
  fieldValues: FieldValues;
  presets: CommandPreset[];
  portName: string;
  movesMachinery: boolean;
}

export interface CardPort {
  id: string;
  name: string;
  shorthand: string;
  facts: { label: string; value: string }[];
  wiring: CardPortInput['wiring'];
  notes: string;
  /** Plain text for the copy button. */
  copyText: string;
}

export interface CardCommand {
  id: string;
  name: string;
  purpose: string;
  movesMachinery: boolean;
  /** The saved values first (`preset` null), then every preset: PLC literal, hex, bytes and time on the wire. */
  sends: CommandRendering[];
  /** The port the times are for, e.g. `Service RS-232, 9600 8-N-1`; null when the device has no serial port. */
  line: string | null;
}

export function cardShorthand(s: PortSettings): string {
  if (s.interface === 'tcp') return `TCP ${s.tcpHost ?? ''}:${s.tcpPort ?? ''}`;
  const p = { none: 'N', even: 'E', odd: 'O', mark: 'M', space: 'S' }[s.parity];
  return `${s.baud} ${s.dataBits}-${p}-${s.stopBits}`;
}

export function cardPort(p: CardPortInput, heading: string): CardPort {
  const s = p.settings;
  const rs485 = s.interface.startsWith('rs485');
  const facts = [
    { label: 'Interface', value: INTERFACE_TEXT[s.interface] },
    ...(s.interface === 'tcp' ? [] : [
      { label: 'Baud', value: String(s.baud) },
      { label: 'Data bits', value: String(s.dataBits) },
      { label: 'Parity', value: PARITY_TEXT[s.parity] },
      { label: 'Stop bits', value: String(s.stopBits) },
      { label: 'Handshake', value: HANDSHAKE_TEXT[s.handshake] },
    ]),
    { label: 'Node address', value: s.nodeAddress === null ? '—' : String(s.nodeAddress) },
    { label: 'Termination', value: rs485 ? (s.termination ? 'ON' : 'off') : 'n/a' },
    ...(rs485 ? [{ label: 'Bias', value: s.bias ? 'ON' : 'off' }] : []),
    { label: 'Protocol', value: PROTOCOL_TEXT[s.protocol] },
  ];
  const wiring = p.wiring.length ? ['Wiring:', ...p.wiring.map((w) => `  pin ${w.pin || '-'}  ${w.signal || '-'}  ${w.colour}`.trimEnd())] : [];
  const copyText = [`${heading} — ${p.name}`, portSettingsText(s), ...wiring].join('\n');
  return { id: p.id, name: p.name, shorthand: cardShorthand(s), facts, wiring: p.wiring, notes: p.notes, copyText };
}

/**
 * The command's bytes as a PLC string literal and as hex, with its saved values and with each preset, timed on
 * its port (the one it names, else the device's first serial port).
 */
export function cardCommand(c: CardCommandInput, ports: { name: string; settings: PortSettings }[] = []): CardCommand {
  const serial = ports.filter((p) => p.settings.interface !== 'tcp');
  const port = serial.find((p) => p.name === c.portName) ?? serial[0] ?? null;
  return {
    id: c.id, name: c.name, purpose: c.purpose, movesMachinery: c.movesMachinery,
    sends: renderCommandVariants(c, port ? port.settings : null),
    line: port ? `${port.name}, ${cardShorthand(port.settings)}` : null,
  };
}
