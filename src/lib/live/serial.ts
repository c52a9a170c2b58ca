/**
 * The browser side of the live link: what a stored port's settings become when the Web Serial API opens a
 * port (W3C Community Group draft "Web Serial API": `SerialOptions` takes baudRate, dataBits 7 or 8, stopBits
 * 1 or 2, parity none/even/odd, flowControl none/hardware), and why a browser or a port cannot be used.
 * Settings the API cannot open are refused with their reason, never quietly replaced by others.
 * No imports beyond the engine; the browser objects are passed in, so the module is tested in Node.
 */
import type { PortSettings } from '../frame/port-settings';
import { lineShorthand } from '../frame/port-text';

/** The subset of Web Serial's `SerialOptions` this app passes to `port.open`. */
export interface LinkOpenOptions {
  baudRate: number;
  dataBits: 7 | 8;
  stopBits: 1 | 2;
  parity: 'none' | 'even' | 'odd';
  flowControl: 'none' | 'hardware';
  bufferSize: number;
}

/** Web Serial's output signals (`SerialOutputSignals`). */
export interface OutputSignals {
  dataTerminalReady?: boolean;
  requestToSend?: boolean;
  break?: boolean;
}
/** Web Serial's input signals (`SerialInputSignals`). */
export interface InputSignals {
  dataCarrierDetect: boolean;
  clearToSend: boolean;
  ringIndicator: boolean;
  dataSetReady: boolean;
}

/** What this app uses of a Web Serial `SerialPort`; the fake port implements the same. */
export interface SerialPortLike {
  open(options: LinkOpenOptions): Promise<void>;
  close(): Promise<void>;
  readonly readable: ReadableStream<Uint8Array> | null;
  readonly writable: WritableStream<Uint8Array> | null;
  setSignals(signals: OutputSignals): Promise<void>;
  getSignals(): Promise<InputSignals>;
}
/** What this app uses of `navigator.serial`. */
export interface SerialLike {
  requestPort(options?: { filters?: unknown[] }): Promise<SerialPortLike>;
}

/** Read buffer asked of the browser: larger than any frame the engine builds. */
export const LINK_BUFFER_BYTES = 4096;

export type OpenPlan =
  | { ok: true; options: LinkOpenOptions; warnings: string[] }
  | { ok: false; problems: string[] };

/**
 * The options a port's stored settings open with, or every reason they cannot be opened from a browser.
 * Warnings do not stop the link but say what the browser cannot do for this port.
 */
export function openPlan(s: PortSettings): OpenPlan {
  const problems: string[] = [];
  if (s.interface === 'tcp') {
    problems.push('This port is reached over TCP (a serial-over-TCP server); a web page cannot open TCP connections. Use a serial port, or a program on the computer.');
    return { ok: false, problems };
  }
  const line = lineShorthand(s);
  if (s.dataBits !== 7 && s.dataBits !== 8) problems.push(`${line}: browsers open 7 or 8 data bits only, not ${s.dataBits}.`);
  if (s.parity === 'mark' || s.parity === 'space') problems.push(`${line}: browsers open parity none, even or odd only, not ${s.parity}.`);
  if (s.stopBits !== 1 && s.stopBits !== 2) problems.push(`${line}: browsers open 1 or 2 stop bits only, not ${s.stopBits}.`);
  if (s.handshake === 'xon-xoff') problems.push('Handshake XON/XOFF: browsers offer no software flow control; the page would have to pause on XOFF itself, which it does not.');
  if (s.handshake === 'dtr-dsr') problems.push('Handshake DTR/DSR: browsers offer hardware flow control on RTS/CTS only.');
  if (problems.length) return { ok: false, problems };
  const warnings: string[] = [];
  if (s.interface === 'rs485-2w' && s.rs485Direction === 'rts') {
    warnings.push('This RS-485 port switches its transmitter with RTS. RTS set from the browser changes milliseconds late, too slow to turn the line around: use an adapter with automatic direction control.');
  }
  return {
    ok: true, warnings,
    options: {
      baudRate: s.baud,
      dataBits: s.dataBits as 7 | 8,
      stopBits: s.stopBits as 1 | 2,
      parity: s.parity as 'none' | 'even' | 'odd',
      flowControl: s.handshake === 'rts-cts' ? 'hardware' : 'none',
      bufferSize: LINK_BUFFER_BYTES,
    },
  };
}

/** Why this page cannot reach serial ports, or null when it can. */
export function serialUnavailable(env: { serial?: unknown; isSecureContext?: boolean }): string | null {
  if (env.isSecureContext === false) {
    return 'This page is not in a secure context (it was not loaded over HTTPS or from this computer), and browsers offer serial ports only to secure pages. Open the app over HTTPS.';
  }
  if (!env.serial) {
    return 'This browser has no Web Serial API. Use a current Chromium-based desktop browser; other browsers and phones cannot open serial ports from a web page.';
  }
  return null;
}

/** Errors the Web Serial readable stream raises and recovers from (a new `port.readable` follows). */
export const RECOVERABLE_READ_ERRORS = ['FramingError', 'ParityError', 'BreakError', 'BufferOverrunError'] as const;

export function isRecoverableReadError(e: unknown): e is { name: (typeof RECOVERABLE_READ_ERRORS)[number] } {
  return typeof e === 'object' && e !== null && (RECOVERABLE_READ_ERRORS as readonly string[]).includes(String((e as { name?: unknown }).name));
}
