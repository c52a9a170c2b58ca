/** The words for a port's parts and values, shared by the port form and the conflict notice of ports. */
import type { PortInput } from '../../lib/schemas/vault';
import { fieldLabel } from './shared';
import {
  CONTROL_LINE_LABELS, CTS_MODE_LABELS, DTR_MODE_LABELS, HANDSHAKE_LABELS, INTERFACE_LABELS, PARITY_LABELS, PROTOCOL_LABELS, RS485_DIRECTION_LABELS, RTS_MODE_LABELS,
} from '../../lib/frame/port-text';

/** The port settings' words come from the one port-text module; the frame-rule choices are the form's own. */
export const LABELS = {
  interface: INTERFACE_LABELS,
  parity: PARITY_LABELS,
  handshake: HANDSHAKE_LABELS,
  protocol: PROTOCOL_LABELS,
  direction: RS485_DIRECTION_LABELS,
  byteSet: { printable: 'Printable only (20-7E)', '7-bit': '7-bit (00-7F)', '8-bit': 'Any byte' },
  letterCase: { any: 'Any case', upper: 'Upper case', lower: 'Lower case' },
} as const;

/** Form labels by dotted path. */
const PART_LABELS: Record<string, string> = {
  name: 'Port name',
  'settings.interface': 'Electrical interface',
  'settings.baud': 'Baud rate',
  'settings.dataBits': 'Data bits',
  'settings.parity': 'Parity',
  'settings.stopBits': 'Stop bits',
  'settings.handshake': 'Handshaking',
  'settings.protocol': 'Protocol',
  'settings.nodeAddress': 'Node address',
  'settings.tcpHost': 'TCP host',
  'settings.tcpPort': 'TCP port',
  'settings.rs485Direction': 'Direction control',
  'settings.rtsMode': CONTROL_LINE_LABELS.rtsMode,
  'settings.ctsMode': CONTROL_LINE_LABELS.ctsMode,
  'settings.dtrMode': CONTROL_LINE_LABELS.dtrMode,
  'settings.rtsLeadMs': `${CONTROL_LINE_LABELS.rtsLeadMs} (ms)`,
  'settings.rtsTailMs': `${CONTROL_LINE_LABELS.rtsTailMs} (ms)`,
  'settings.echo': CONTROL_LINE_LABELS.echo,
  'settings.termination': 'Termination',
  'settings.bias': 'Bias',
  'settings.responseTimeoutMs': 'Response timeout (ms)',
  'settings.interCharTimeoutMs': 'Inter-character timeout (ms)',
  'settings.turnaroundDelayMs': 'Turnaround delay (ms)',
  'settings.retries': 'Retries',
  'settings.frameRules': 'Frame rules',
  'settings.frameRules.start': 'Start bytes (hex)',
  'settings.frameRules.terminator': 'Terminator (hex)',
  'settings.frameRules.maxLength': 'Maximum length',
  'settings.frameRules.byteSet': 'Allowed bytes',
  'settings.frameRules.letterCase': 'Letter case',
  wiring: 'Connector and wiring',
  notes: 'Notes',
};

const VALUE_LABELS: Record<string, Record<string, string>> = {
  'settings.interface': LABELS.interface,
  'settings.parity': LABELS.parity,
  'settings.handshake': LABELS.handshake,
  'settings.protocol': LABELS.protocol,
  'settings.rs485Direction': LABELS.direction,
  'settings.rtsMode': RTS_MODE_LABELS,
  'settings.ctsMode': CTS_MODE_LABELS,
  'settings.dtrMode': DTR_MODE_LABELS,
  'settings.frameRules.byteSet': LABELS.byteSet,
  'settings.frameRules.letterCase': LABELS.letterCase,
};

/** The label of a part of a port (`['settings', 'baud']` → "Baud rate"). */
export function portPartLabel(path: readonly string[]): string {
  const key = path.join('.');
  return PART_LABELS[key] ?? fieldLabel(key);
}

/** A port part's value in the form's words; `undefined` when there is no special reading. */
export function portPartValue(path: readonly string[], value: unknown): string | undefined {
  const key = path.join('.');
  if (typeof value === 'string' && VALUE_LABELS[key]?.[value]) return VALUE_LABELS[key][value];
  if (key === 'wiring' && Array.isArray(value)) {
    return value.length === 0 ? 'no rows' : (value as PortInput['wiring']).map((w) => [w.pin, w.signal, w.colour].filter(Boolean).join(' ')).join('; ');
  }
  return undefined;
}

export const portShape = (p: PortInput): PortInput => ({ name: p.name, settings: p.settings, wiring: p.wiring, notes: p.notes });
