import { describe, expect, test } from 'vitest';
import { type LineSettings, bitSequence as bitSequenceResult, bitsPerChar, charTimeMs, lineTiming, pollCycle, silentIntervals } from '~/lib/frame';

const s = (baud: number, dataBits = 8, parity: 'none' | 'even' | 'odd' | 'mark' | 'space' = 'none', stopBits: 1 | 1.5 | 2 = 1) => ({ baud, dataBits, parity, stopBits });

describe('character and frame time', () => {
  test('9600 baud, 10-bit characters: 960 chars/s, 1.04167 ms per char, 1.5 chars = 1.5625 ms', () => {
    // published UART timing worked example (9600 baud, 8-N-1 = 10 bits per character)
    const t = lineTiming(s(9600), 10);
    expect(t.bitsPerChar).toBe(10);
    expect(t.charsPerSecond).toBe(960);
    expect(t.charTimeMs).toBeCloseTo(1.04167, 5);
    expect(t.interCharTimeoutMs).toBeCloseTo(1.5625, 10);
    expect(t.interFrameGapMs).toBeCloseTo(3.6458333, 6);
    expect(t.frameTimeMs).toBeCloseTo(10.4166667, 6);
  });
  test('Modbus RTU character is 11 bits', () => {
    // Modbus over Serial Line guide V1.02, 2.5.1: 1 start + 8 data + 1 parity + 1 stop (or 2 stop without parity)
    expect(bitsPerChar(s(19200, 8, 'even', 1))).toBe(11);
    expect(bitsPerChar(s(19200, 8, 'none', 2))).toBe(11);
    expect(bitsPerChar(s(9600, 7, 'none', 1.5))).toBe(9.5);
    expect(charTimeMs(s(19200, 8, 'even'))).toBeCloseTo(0.5729167, 6);
  });
  test('fixed silent intervals above 19200 baud', () => {
    // Modbus over Serial Line guide V1.02, 2.5.1.1: above 19200 bit/s t1.5 = 750 µs and t3.5 = 1.750 ms
    expect(silentIntervals(s(38400, 8, 'even'))).toEqual({ interCharTimeoutMs: 0.75, interFrameGapMs: 1.75 });
    expect(silentIntervals(s(115200))).toEqual({ interCharTimeoutMs: 0.75, interFrameGapMs: 1.75 });
    // at exactly 19200 the character-time formula still applies (11-bit char: 1.5 × 0.5729 ms)
    expect(silentIntervals(s(19200, 8, 'even')).interCharTimeoutMs).toBeCloseTo(0.859375, 9);
  });
  test('transaction and polling cycle', () => {
    // 9600 8-N-1 (common practice port setting): 8-byte request, 2 ms response time, 7-byte reply, 3.5-char gap
    const t = lineTiming(s(9600), 8, 7, 2);
    expect(t.replyTimeMs).toBeCloseTo(7.2916667, 6);
    expect(t.transactionMs).toBeCloseTo(8 * (10 / 9.6) + 2 + 7 * (10 / 9.6) + 3.5 * (10 / 9.6), 9);
    const cycle = pollCycle(s(9600), [{ requestBytes: 8, replyBytes: 7, responseMs: 2 }, { requestBytes: 8, replyBytes: 7, responseMs: 2 }]);
    expect(cycle.cycleTimeMs).toBeCloseTo(2 * t.transactionMs, 9);
    expect(cycle.pollsPerSecond).toBeCloseTo(2000 / (2 * t.transactionMs), 9);
    expect(pollCycle(s(9600), [])).toEqual({ cycleTimeMs: 0, pollsPerSecond: 0, cyclesPerSecond: 0 });
    expect(lineTiming(s(9600), 0).frameTimeMs).toBe(0);
  });
});

/** The sequence, for settings that are valid (errors are tested in typed-calls.test.ts). */
function bitSequence(bytes: Uint8Array, settings: LineSettings, maxBytes?: number) {
  const r = bitSequenceResult(bytes, settings, maxBytes);
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
}

describe('bitSequence', () => {
  const levels = (bytes: number[], settings: ReturnType<typeof s>) =>
    bitSequence(Uint8Array.from(bytes), settings).cells.filter((c) => c.kind !== 'idle').map((c) => `${c.kind[0]}${c.level}`).join(' ');
  test("0x41 'A' on 8-N-1: start 0, data LSB first 1 0 0 0 0 0 1 0, stop 1", () => {
    // UART framing: start bit 0, data least significant bit first, stop bit 1 (common practice; RS-232 idle = mark = 1)
    expect(levels([0x41], s(9600))).toBe('s0 d1 d0 d0 d0 d0 d0 d1 d0 s1');
  });
  test('0x41 with even, odd, mark and space parity', () => {
    // 0x41 has two 1 bits: even parity bit 0, odd parity bit 1 (common practice parity definition)
    expect(levels([0x41], s(9600, 8, 'even'))).toBe('s0 d1 d0 d0 d0 d0 d0 d1 d0 p0 s1');
    expect(levels([0x41], s(9600, 8, 'odd'))).toBe('s0 d1 d0 d0 d0 d0 d0 d1 d0 p1 s1');
    expect(levels([0x41], s(9600, 8, 'mark'))).toBe('s0 d1 d0 d0 d0 d0 d0 d1 d0 p1 s1');
    expect(levels([0x41], s(9600, 8, 'space'))).toBe('s0 d1 d0 d0 d0 d0 d0 d1 d0 p0 s1');
    // 0x43 has three 1 bits: even parity bit 1
    expect(levels([0x43], s(9600, 8, 'even'))).toBe('s0 d1 d1 d0 d0 d0 d0 d1 d0 p1 s1');
  });
  test('0x00, 0x7F, 0x80, 0xFF on 7-E-2 timing', () => {
    const seq = bitSequence(Uint8Array.from([0x00, 0x7f, 0x80, 0xff]), s(9600, 7, 'even', 2));
    const perByte = 1 + 7 + 1 + 1; // cells: start, 7 data, parity, one 2-bit stop cell
    expect(seq.cells.length).toBe(2 + 4 * perByte);
    // 0x80 on 7 data bits: the top bit is not sent, data all 0, even parity 0
    expect(seq.cells.filter((c) => c.byteIndex === 2 && c.kind !== 'start' && c.kind !== 'stop').map((c) => c.level)).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
    const stop = seq.cells.find((c) => c.kind === 'stop')!;
    expect(stop.durationUs).toBeCloseTo(2 * 1e6 / 9600, 9);
    expect(seq.totalUs).toBeCloseTo((2 + 4 * 11) * 1e6 / 9600, 6);
    expect(seq.cells[1]).toMatchObject({ kind: 'start', level: 0, byteIndex: 0 });
    expect(seq.cells[1]!.startUs).toBeCloseTo(1e6 / 9600, 9);
  });
  test('empty input and truncation', () => {
    expect(bitSequence(new Uint8Array(0), s(9600)).cells.map((c) => c.kind)).toEqual(['idle', 'idle']);
    const long = bitSequence(new Uint8Array(100), s(9600), 4);
    expect(long.truncated).toBe(true);
    expect(long.cells.filter((c) => c.kind === 'start').length).toBe(4);
  });
});
