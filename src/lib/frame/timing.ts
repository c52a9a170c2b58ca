/**
 * Line timing from port settings. A character is 1 start bit + data bits + parity bit (if any) + stop
 * bits; Modbus RTU, for example, uses 11 bits (Modbus over Serial Line Specification and
 * Implementation Guide V1.02, 2.5.1). All times are milliseconds unless the name says µs.
 */
import { type LineSettings, lineSettingsSchema } from './port-settings';
import { lineShorthand } from './port-text';
import { type Result, failure, success } from './result';

/** Above this rate the Modbus guide fixes the silent intervals (2.5.1.1). */
export const MODBUS_FIXED_TIMING_ABOVE_BAUD = 19200;

export function bitsPerChar(s: LineSettings): number {
  return 1 + s.dataBits + (s.parity === 'none' ? 0 : 1) + s.stopBits;
}

/** Milliseconds one character occupies on the line: bitsPerChar × 1000 ÷ baud. */
export function charTimeMs(s: LineSettings): number {
  return (bitsPerChar(s) * 1000) / s.baud;
}

/**
 * Silent intervals of the Modbus guide 2.5.1.1: inter-character 1.5 and inter-frame 3.5 character
 * times, fixed at 0.75 ms and 1.75 ms when the rate is above 19200 bit/s.
 */
export function silentIntervals(s: LineSettings): { interCharTimeoutMs: number; interFrameGapMs: number } {
  if (s.baud > MODBUS_FIXED_TIMING_ABOVE_BAUD) return { interCharTimeoutMs: 0.75, interFrameGapMs: 1.75 };
  const t = charTimeMs(s);
  return { interCharTimeoutMs: 1.5 * t, interFrameGapMs: 3.5 * t };
}

export interface LineTiming {
  bitsPerChar: number;
  /** Characters per second the line carries back to back. */
  charsPerSecond: number;
  charTimeMs: number;
  /** Request on the wire: byteCount × charTimeMs. */
  frameTimeMs: number;
  /** Reply on the wire: replyByteCount × charTimeMs. */
  replyTimeMs: number;
  /** Device's time between the end of the request and the start of its reply (given, not measured). */
  responseMs: number;
  interCharTimeoutMs: number;
  interFrameGapMs: number;
  /**
   * frameTimeMs + responseMs + replyTimeMs + interFrameGapMs: the composer's one-command estimate, one silent
   * interval per poll. The timing tool and the bus planner count a transaction as ./bus-cycle.ts describes.
   */
  transactionMs: number;
}

export function lineTiming(s: LineSettings, byteCount: number, replyByteCount = 0, responseMs = 0): LineTiming {
  const bits = bitsPerChar(s);
  const t = charTimeMs(s);
  const gaps = silentIntervals(s);
  const frameTimeMs = byteCount * t;
  const replyTimeMs = replyByteCount * t;
  return {
    bitsPerChar: bits,
    charsPerSecond: s.baud / bits,
    charTimeMs: t,
    frameTimeMs,
    replyTimeMs,
    responseMs,
    ...gaps,
    transactionMs: frameTimeMs + responseMs + replyTimeMs + gaps.interFrameGapMs,
  };
}

/** Milliseconds rounded to nanoseconds (6 decimals), so JSON stays readable. */
export function roundMs(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

/** What `POST /api/tools/timing` answers: `lineTiming` with the port shorthand and the bus planner's transaction, times rounded by `roundMs`. */
export interface TimingReport {
  /** `9600 8-N-1` */
  port: string;
  bitsPerChar: number;
  charsPerSecond: number;
  charTimeMs: number;
  frameTimeMs: number;
  replyTimeMs: number;
  interCharTimeoutMs: number;
  interFrameGapMs: number;
  /**
   * One Modbus RTU transaction, as the bus planner counts it (./bus-cycle.ts): request + interFrameGapMs +
   * responseMs + reply + interFrameGapMs; without a reply, request + interFrameGapMs.
   */
  transactionMs: number;
}

/** `responseMs`: the device's own delay from the end of the request to the start of its reply (with a reply only). */
export function timingReport(s: LineSettings, byteCount: number, replyByteCount = 0, responseMs = 0): TimingReport {
  const t = lineTiming(s, byteCount, replyByteCount, responseMs);
  const transactionMs = replyByteCount > 0
    ? t.frameTimeMs + t.interFrameGapMs + responseMs + t.replyTimeMs + t.interFrameGapMs
    : t.frameTimeMs + t.interFrameGapMs;
  return {
    port: lineShorthand(s),
    bitsPerChar: t.bitsPerChar,
    charsPerSecond: roundMs(t.charsPerSecond),
    charTimeMs: roundMs(t.charTimeMs),
    frameTimeMs: roundMs(t.frameTimeMs),
    replyTimeMs: roundMs(t.replyTimeMs),
    interCharTimeoutMs: roundMs(t.interCharTimeoutMs),
    interFrameGapMs: roundMs(t.interFrameGapMs),
    transactionMs: roundMs(transactionMs),
  };
}

export interface PolledDevice {
  requestBytes: number;
  replyBytes: number;
  /** Time the device takes to start answering, ms. */
  responseMs?: number;
}

/** One polling cycle over every device on one line, each polled once, then the cycle repeats. */
export function pollCycle(s: LineSettings, devices: readonly PolledDevice[]): { cycleTimeMs: number; pollsPerSecond: number; cyclesPerSecond: number } {
  let cycleTimeMs = 0;
  for (const d of devices) cycleTimeMs += lineTiming(s, d.requestBytes, d.replyBytes, d.responseMs ?? 0).transactionMs;
  if (cycleTimeMs === 0) return { cycleTimeMs: 0, pollsPerSecond: 0, cyclesPerSecond: 0 };
  return { cycleTimeMs, pollsPerSecond: (devices.length * 1000) / cycleTimeMs, cyclesPerSecond: 1000 / cycleTimeMs };
}

export type BitKind = 'idle' | 'start' | 'data' | 'parity' | 'stop';

export interface BitCell {
  kind: BitKind;
  /** Logic level: 1 = mark (idle), 0 = space. */
  level: 0 | 1;
  startUs: number;
  durationUs: number;
  /** Which byte of the input (not for idle). */
  byteIndex?: number;
  /** Data bit number, 0 = least significant (data bits only). */
  bit?: number;
}

/**
 * Bits on the wire for drawing: one bit time of idle, then per byte a start bit (0), data bits least
 * significant first, the parity bit (even/odd make the count of 1s even/odd; mark = 1, space = 0), and
 * the stop bits as one cell of 1, 1.5 or 2 bit times; one bit time of idle at the end.
 */
export function bitSequence(bytes: Uint8Array, s: LineSettings, maxBytes = 16): Result<BitSequence> {
  const problem = lineProblem(s);
  if (problem) return failure(0, problem);
  if (Number.isNaN(maxBytes) || maxBytes < 0) return failure(0, `Byte limit ${maxBytes} must be 0 or more`);
  const bitUs = 1e6 / s.baud;
  const cells: BitCell[] = [];
  let t = 0;
  const push = (cell: Omit<BitCell, 'startUs' | 'durationUs'>, bits: number) => {
    cells.push({ ...cell, startUs: t, durationUs: bits * bitUs });
    t += bits * bitUs;
  };
  push({ kind: 'idle', level: 1 }, 1);
  const n = Math.min(bytes.length, Math.max(0, maxBytes));
  for (let byteIndex = 0; byteIndex < n; byteIndex++) {
    const b = bytes[byteIndex]!;
    push({ kind: 'start', level: 0, byteIndex }, 1);
    let ones = 0;
    for (let bit = 0; bit < s.dataBits; bit++) {
      const level = ((b >> bit) & 1) as 0 | 1;
      ones += level;
      push({ kind: 'data', level, byteIndex, bit }, 1);
    }
    if (s.parity !== 'none') {
      const level = s.parity === 'mark' ? 1 : s.parity === 'space' ? 0 : s.parity === 'even' ? ones & 1 : (ones & 1) ^ 1;
      push({ kind: 'parity', level: level as 0 | 1, byteIndex }, 1);
    }
    push({ kind: 'stop', level: 1, byteIndex }, s.stopBits);
  }
  push({ kind: 'idle', level: 1 }, 1);
  return success({ cells, totalUs: t, truncated: n < bytes.length });
}

export interface BitSequence {
  cells: BitCell[];
  totalUs: number;
  /** True when `maxBytes` cut the sequence short. */
  truncated: boolean;
}

/** What is wrong with line settings given in code, or null: the ranges of `lineSettingsSchema`. */
function lineProblem(s: LineSettings): string | null {
  const r = lineSettingsSchema.safeParse(s);
  if (r.success) return null;
  const key = String(r.error.issues[0]!.path[0]);
  return `${key} ${String((s as Record<string, unknown>)[key])} is outside the line settings (${r.error.issues[0]!.message})`;
}
