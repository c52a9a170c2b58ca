/** The timing panel's rows, from port settings and the frame and reply sizes. */
import { lineTiming, MODBUS_FIXED_TIMING_ABOVE_BAUD, pollCycle } from '../frame/timing';
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
 * `replyBytes` null = no reply template (the reply row is left out and polls count the request only).
 * `responseMs` is the device's own answer delay (from the port settings).
 */
export function timingSummary(settings: LineSettings & Partial<PortSettings>, requestBytes: number, replyBytes: number | null, responseMs = settings.turnaroundDelayMs ?? 0): TimingSummary {
  const t = lineTiming(settings, requestBytes, replyBytes ?? 0, replyBytes === null ? 0 : responseMs);
  const cycle = pollCycle(settings, [{ requestBytes, replyBytes: replyBytes ?? 0, responseMs: replyBytes === null ? 0 : responseMs }]);
  const bits = `${t.bitsPerChar} bits per character`;
  const rows: TimingRow[] = [
    { id: 'char', label: 'Character time', value: ms(t.charTimeMs), how: `${bits} ÷ ${settings.baud} bit/s (${rate(t.charsPerSecond)} characters/s)` },
    { id: 'frame', label: 'Frame time', value: ms(t.frameTimeMs), how: `${requestBytes} bytes × ${ms(t.charTimeMs)}` },
  ];
  if (replyBytes !== null) {
    rows.push({ id: 'reply', label: 'Reply time', value: ms(t.replyTimeMs), how: `${replyBytes} bytes × ${ms(t.charTimeMs)}, after a ${ms(responseMs)} turnaround` });
  }
  const fixed = settings.baud > MODBUS_FIXED_TIMING_ABOVE_BAUD ? ` (fixed above ${MODBUS_FIXED_TIMING_ABOVE_BAUD} bit/s)` : '';
  rows.push(
    { id: 't15', label: 'Inter-character timeout', value: ms(t.interCharTimeoutMs), how: `1.5 character times${fixed}` },
    { id: 't35', label: 'Silent gap between frames', value: ms(t.interFrameGapMs), how: `3.5 character times${fixed}` },
    { id: 'transaction', label: 'One transaction', value: ms(t.transactionMs), how: replyBytes === null ? 'frame + gap' : 'frame + turnaround + reply + gap' },
    { id: 'polls', label: 'Polls per second', value: rate(cycle.pollsPerSecond), how: 'this command alone, back to back on the line' },
  );
  return { shorthand: lineShorthand(settings), rows, frameTimeMs: t.frameTimeMs, pollsPerSecond: cycle.pollsPerSecond };
}
