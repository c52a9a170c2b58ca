/** The timing panel's rows, from port settings and the frame and reply sizes. */
import { lineTiming, MODBUS_FIXED_TIMING_ABOVE_BAUD } from '../frame/timing';
import { pollTiming } from '../frame/bus-cycle';
import type { LineSettings, PortSettings } from '../frame/port-settings';
import { lineShorthand } from '../frame/port-text';
import { ms, rate } from './format';

export interface TimingRow {
  id: string;
  label: string;
  value: string;
  /** How it was worked out, in one line. */
  how: string;
}

export interface TimingSummary {
  shorthand: string;
  rows: TimingRow[];
  frameTimeMs: number;
  pollsPerSecond: number;
}

/**
 * One transaction as the bus planner counts it (`pollTiming`, src/lib/frame/bus-cycle.ts): the request, the silent
 * interval after it (Modbus RTU), the device's own response time `responseMs`, the reply, then the silent interval
 * (Modbus RTU) or the port's turnaround delay (other protocols). `replyBytes` null = no reply template (no reply
 * row; the transaction is the request, its interval and the turnaround delay). `responseMs` is the device's delay
 * before it answers: not stored with a command, so 0 unless given.
 */
export function timingSummary(settings: LineSettings & Partial<PortSettings>, requestBytes: number, replyBytes: number | null, responseMs = 0): TimingSummary {
  const t = lineTiming(settings, requestBytes, replyBytes ?? 0, 0);
  const protocol = settings.protocol ?? 'other';
  const rtu = protocol === 'modbus-rtu';
  const turnaround = settings.turnaroundDelayMs ?? 0;
  const p = pollTiming({ baud: settings.baud, dataBits: settings.dataBits, parity: settings.parity, stopBits: settings.stopBits, protocol,
    responseTimeoutMs: settings.responseTimeoutMs ?? 0, turnaroundDelayMs: turnaround, retries: settings.retries ?? 0 }, { requestBytes, replyBytes: replyBytes ?? 0, responseMs }, 0);
  const pollsPerSecond = p.totalMs > 0 ? 1000 / p.totalMs : 0;
  const bits = `${t.bitsPerChar} bits per character`;
  const rows: TimingRow[] = [
    { id: 'char', label: 'Character time', value: ms(t.charTimeMs), how: `${bits} ÷ ${settings.baud} bit/s (${rate(t.charsPerSecond)} characters/s)` },
    { id: 'frame', label: 'Frame time', value: ms(t.frameTimeMs), how: `${requestBytes} bytes × ${ms(t.charTimeMs)}` },
  ];
  if (replyBytes !== null) {
    rows.push(
      { id: 'response', label: 'Device response time', value: ms(p.responseMs), how: 'the device\'s own delay before it answers (responseMs); not stored with a command' },
      { id: 'reply', label: 'Reply time', value: ms(t.replyTimeMs), how: `${replyBytes} bytes × ${ms(t.charTimeMs)}` },
    );
  }
  const fixed = settings.baud > MODBUS_FIXED_TIMING_ABOVE_BAUD ? ` (fixed above ${MODBUS_FIXED_TIMING_ABOVE_BAUD} bit/s)` : '';
  const how = replyBytes === null
    ? (rtu ? 'request + silent gap + turnaround delay' : 'request + turnaround delay')
    : (rtu ? 'request + silent gap + response time + reply + silent gap' : 'request + response time + reply + turnaround delay');
  rows.push(
    { id: 't15', label: 'Inter-character timeout', value: ms(t.interCharTimeoutMs), how: `1.5 character times${fixed}` },
    { id: 't35', label: 'Silent gap between frames', value: ms(t.interFrameGapMs), how: `3.5 character times${fixed}${rtu ? '' : '; counted in a transaction only on Modbus RTU'}` },
  );
  if (replyBytes === null || !rtu) rows.push({ id: 'turnaround', label: 'Turnaround delay', value: ms(turnaround), how: 'the port\'s wait before the master sends again' });
  rows.push(
    { id: 'transaction', label: 'One transaction', value: ms(p.totalMs), how: `${how}, as the bus planner counts it` },
    { id: 'polls', label: 'Polls per second', value: rate(pollsPerSecond), how: 'this command alone, back to back on the line' },
  );
  return { shorthand: lineShorthand(settings), rows, frameTimeMs: t.frameTimeMs, pollsPerSecond };
}
