/** The content of a field card, built from vault records: what a technician reads at the cabinet. */
import { assembleFrame, renderHex, renderIecLiteral, portSettingsText, type PortSettings, type Template, type FieldValues } from '../frame';

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
  plc: string;
  hex: string;
  movesMachinery: boolean;
  problem: string | null;
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

/** The command's bytes as a PLC string literal and as hex, with the frame engine's defaults. */
export function cardCommand(c: CardCommandInput): CardCommand {
  try {
    const frame = assembleFrame(c.template, c.fieldValues);
    const error = frame.findings.find((f) => f.severity === 'error');
    return {
      id: c.id, name: c.name, purpose: c.purpose, movesMachinery: c.movesMachinery,
      plc: renderIecLiteral(frame.bytes), hex: renderHex(frame.bytes), problem: error ? error.message : null,
    };
  } catch (err) {
    return { id: c.id, name: c.name, purpose: c.purpose, movesMachinery: c.movesMachinery, plc: '', hex: '', problem: (err as Error).message };
  }
}
