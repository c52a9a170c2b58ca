/**
 * Port settings in words, the one place they are written: the shorthand (`9600 8-N-1` on a serial line,
 * `TCP 192.168.0.10:502` over TCP), one label for each setting's values, and the full text behind every
 * "copy settings". The vault, the field cards, the CSV export, the composer and the device list's SQL
 * (which builds its shorthand from `SHORTHAND_PIECES`) all write a port this way.
 */
import type { FrameRules } from './frame-rules';
import type { CtsMode, DtrMode, Handshake, LineSettings, Parity, PortInterface, PortSettings, Protocol, Rs485Direction, RtsMode } from './port-settings';

/** Parity letters of the shorthand (common practice: N E O M S). */
export const PARITY_LETTERS: Record<Parity, string> = { none: 'N', even: 'E', odd: 'O', mark: 'M', space: 'S' };

export const INTERFACE_LABELS: Record<PortInterface, string> = {
  rs232: 'RS-232', rs422: 'RS-422', 'rs485-2w': 'RS-485 2-wire', 'rs485-4w': 'RS-485 4-wire',
  ttl: 'TTL UART', 'usb-vcp': 'USB virtual COM port', tcp: 'Serial over TCP',
};
export const PARITY_LABELS: Record<Parity, string> = { none: 'None', even: 'Even', odd: 'Odd', mark: 'Mark', space: 'Space' };
export const HANDSHAKE_LABELS: Record<Handshake, string> = { none: 'None', 'rts-cts': 'RTS/CTS', 'xon-xoff': 'XON/XOFF', 'dtr-dsr': 'DTR/DSR' };
export const PROTOCOL_LABELS: Record<Protocol, string> = { ascii: 'Delimited ASCII', 'modbus-rtu': 'Modbus RTU', 'modbus-ascii': 'Modbus ASCII', other: 'Other' };
export const RS485_DIRECTION_LABELS: Record<Rs485Direction, string> = { none: 'None', rts: 'RTS high while transmitting', auto: 'Automatic' };
export const RTS_MODE_LABELS: Record<RtsMode, string> = { off: 'Always off', on: 'Always on', transmit: 'On while sending', flow: 'Flow control (on while ready to receive)' };
export const CTS_MODE_LABELS: Record<CtsMode, string> = { ignore: 'Not checked', gate: 'Sends only while CTS is on' };
export const DTR_MODE_LABELS: Record<DtrMode, string> = { off: 'Always off', on: 'Always on', flow: 'Flow control (with DSR)' };

/** The names of the control-line settings, as the text, the form and the card write them. */
export const CONTROL_LINE_LABELS = {
  rtsMode: 'RTS', ctsMode: 'CTS', dtrMode: 'DTR', rtsLeadMs: 'RTS lead', rtsTailMs: 'RTS tail', echo: 'Hears own transmission',
} as const;

/**
 * The control lines in words, label and value: RTS, CTS and DTR always; the RTS lead and tail when RTS is on
 * while sending (or they are set); whether the port hears its own transmission.
 */
export function controlLineFacts(s: PortSettings): { label: string; value: string }[] {
  const L = CONTROL_LINE_LABELS;
  const facts: { label: string; value: string }[] = [
    { label: L.rtsMode, value: RTS_MODE_LABELS[s.rtsMode] },
    { label: L.ctsMode, value: CTS_MODE_LABELS[s.ctsMode] },
    { label: L.dtrMode, value: DTR_MODE_LABELS[s.dtrMode] },
  ];
  if (s.rtsMode === 'transmit' || s.rtsLeadMs || s.rtsTailMs) {
    facts.push({ label: L.rtsLeadMs, value: `${s.rtsLeadMs} ms` }, { label: L.rtsTailMs, value: `${s.rtsTailMs} ms` });
  }
  facts.push({ label: L.echo, value: s.echo ? 'yes' : 'no' });
  return facts;
}

/** What a port's shorthand is written from: the line settings, and the interface with its TCP address. */
export type ShorthandSettings = LineSettings & Pick<PortSettings, 'interface'> & Partial<Pick<PortSettings, 'tcpHost' | 'tcpPort'>>;

/**
 * One piece of a shorthand: fixed text, a setting as stored, the parity letter, or a TCP setting with the
 * text before it, both left out when the setting is unset or empty.
 */
export type ShorthandPiece =
  | { text: string }
  | { setting: 'baud' | 'dataBits' | 'stopBits' }
  | { parityLetter: true }
  | { ifSet: 'tcpHost' | 'tcpPort'; before: string };

/**
 * The shorthand, piece by piece: on a serial line baud, data bits, parity letter and stop bits
 * (`9600 8-N-1`, `19200 7-E-1.5`); over TCP the address the other end connects to (`TCP 192.168.0.10:502`),
 * since baud and framing belong to the serial side of whatever answers there.
 */
export const SHORTHAND_PIECES: { serial: readonly ShorthandPiece[]; tcp: readonly ShorthandPiece[] } = {
  serial: [{ setting: 'baud' }, { text: ' ' }, { setting: 'dataBits' }, { text: '-' }, { parityLetter: true }, { text: '-' }, { setting: 'stopBits' }],
  tcp: [{ text: 'TCP' }, { ifSet: 'tcpHost', before: ' ' }, { ifSet: 'tcpPort', before: ':' }],
};

function writePieces(pieces: readonly ShorthandPiece[], s: Partial<ShorthandSettings>): string {
  let out = '';
  for (const p of pieces) {
    if ('text' in p) out += p.text;
    else if ('setting' in p) out += String(s[p.setting]);
    else if ('parityLetter' in p) out += PARITY_LETTERS[s.parity!];
    else {
      const value = s[p.ifSet];
      if (value !== undefined && value !== null && value !== '') out += p.before + String(value);
    }
  }
  return out;
}

/** The four line settings alone: `9600 8-N-1` (what the timing and link checks speak of). */
export function lineShorthand(s: LineSettings): string {
  return writePieces(SHORTHAND_PIECES.serial, s);
}

/** A port's shorthand: `9600 8-N-1` on a serial interface, `TCP host:port` on TCP. */
export function portShorthand(s: ShorthandSettings): string {
  return writePieces(s.interface === 'tcp' ? SHORTHAND_PIECES.tcp : SHORTHAND_PIECES.serial, s);
}

const onOff = (on: boolean) => (on ? 'on' : 'off');

/**
 * Every setting of a port, one per line, for copying into a ticket or a commissioning sheet. A TCP port keeps
 * its line settings here: behind a serial-over-TCP server they are what that server's serial side is set to.
 */
export function portSettingsText(s: PortSettings): string {
  const lines = [
    `Port: ${portShorthand(s)}`,
    `Interface: ${INTERFACE_LABELS[s.interface]}`,
    `Baud rate: ${s.baud}`,
    `Data bits: ${s.dataBits}`,
    `Parity: ${PARITY_LABELS[s.parity]}`,
    `Stop bits: ${s.stopBits}`,
    `Handshake: ${HANDSHAKE_LABELS[s.handshake]}`,
    ...controlLineFacts(s).map((f) => `${f.label}: ${f.value}`),
    `Protocol: ${PROTOCOL_LABELS[s.protocol]}`,
  ];
  if (s.nodeAddress !== null) lines.push(`Node address: ${s.nodeAddress}`);
  if (s.interface.startsWith('rs485')) {
    lines.push(`RS-485 direction control: ${RS485_DIRECTION_LABELS[s.rs485Direction]}`);
    lines.push(`Termination: ${onOff(s.termination)}`, `Bias: ${onOff(s.bias)}`);
  }
  lines.push(
    `Response timeout: ${s.responseTimeoutMs} ms`,
    `Inter-character timeout: ${s.interCharTimeoutMs} ms`,
    `Turnaround delay: ${s.turnaroundDelayMs} ms`,
    `Retries: ${s.retries}`,
  );
  return lines.join('\n');
}

/** The frame rules that differ from "anything goes", in words (`terminator 0D 0A, max 32 bytes`), or ''. */
export function frameRulesText(r: FrameRules): string {
  return [
    r.start ? `start ${r.start}` : '',
    r.terminator ? `terminator ${r.terminator}` : '',
    r.maxLength ? `max ${r.maxLength} bytes` : '',
    r.byteSet !== '8-bit' ? `${r.byteSet} bytes` : '',
    r.letterCase !== 'any' ? `${r.letterCase} case` : '',
  ].filter(Boolean).join(', ');
}

export interface WiringRow { pin: string; signal: string; colour: string }

/**
 * The block behind "copy settings as text" on the vault's port and on the field card: the port's name
 * (after `heading — ` when given), its settings, its frame rules and its wiring.
 */
export function portSettingsBlock(name: string, s: PortSettings, wiring: readonly WiringRow[], heading?: string): string {
  const lines = [heading ? `${heading} — ${name}` : name, portSettingsText(s)];
  const rules = frameRulesText(s.frameRules);
  if (rules) lines.push(`Frame rules: ${rules}`);
  if (wiring.length) {
    lines.push('Wiring:');
    for (const w of wiring) lines.push(`  pin ${w.pin || '-'}  ${w.signal || '-'}  ${w.colour || ''}`.trimEnd());
  }
  return lines.join('\n');
}
