/** The live link's exchange log as a text file: both directions, millisecond timestamps, the framing it ran at. */
import { renderMnemonic } from '../frame/notations/mnemonic';
import { renderHex } from '../frame/notations/numeric';
import type { LinkOpenOptions } from './serial';
import type { ExchangeLogEntry } from './session';

export interface ExchangeLogHeader {
  device: string;
  port: string;
  /** `9600 8-N-1` */
  line: string;
  /** "a serial port" or "the simulated device (no hardware)". */
  through: string;
  openedAt: Date;
  options: LinkOpenOptions;
}

const ms = (x: number) => x.toFixed(3).padStart(10);

/** One line per entry: time since the link opened, direction, hex, then the bytes with control names. */
export function exchangeLogText(h: ExchangeLogHeader, entries: readonly ExchangeLogEntry[]): string {
  const lines = [
    'Live link exchange log',
    `Device: ${h.device}`,
    `Port: ${h.port} at ${h.line}, flow control ${h.options.flowControl}`,
    `Through: ${h.through}`,
    `Opened: ${h.openedAt.toISOString()} with baudRate ${h.options.baudRate}, dataBits ${h.options.dataBits}, parity ${h.options.parity}, stopBits ${h.options.stopBits}`,
    '',
    '        ms  dir  bytes',
  ];
  for (const e of entries) {
    if (e.kind === 'sent' || e.kind === 'received') {
      const dir = e.kind === 'sent' ? 'TX ' : 'RX ';
      const label = e.kind === 'sent' && e.label ? `  (${e.label})` : '';
      lines.push(`${ms(e.atMs)}  ${dir}  ${renderHex(e.bytes)}  |  ${renderMnemonic(e.bytes)}${label}`);
    } else if (e.kind === 'line-error') lines.push(`${ms(e.atMs)}  ERR  ${e.error}`);
    else lines.push(`${ms(e.atMs)}  ---  ${e.text}`);
  }
  return `${lines.join('\n')}\n`;
}

/** A file name for the exchangeLog: the device and the time it was opened, letters, digits and dashes only. */
export function exchangeLogFileName(device: string, openedAt: Date): string {
  const stamp = openedAt.toISOString().slice(0, 19).replace(/[:T]/g, '-');
  const name = device.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-+|-+$/g, '') || 'device';
  return `live-link-${name}-${stamp}.txt`;
}
