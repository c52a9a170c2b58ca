import { describe, expect, it } from 'vitest';
import { receiveAs, sameFraming } from '../../src/lib/live/uart';
import type { LineSettings } from '../../src/lib/frame';

const line = (baud: number, dataBits: number, parity: LineSettings['parity'], stopBits: 1 | 1.5 | 2): LineSettings => ({ baud, dataBits, parity, stopBits });
const read = (bytes: number[], from: LineSettings, to: LineSettings) => {
  const r = receiveAs(Uint8Array.from(bytes), from, to);
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
};

describe('receiveAs: a UART at one framing reading characters sent at another', () => {
  it('reads back every byte unchanged when the framings agree (0x00 to 0xFF), and nothing from nothing', () => {
    const all = Array.from({ length: 256 }, (_, i) => i);
    for (const s of [line(9600, 8, 'none', 1), line(19200, 8, 'even', 1), line(115200, 8, 'odd', 2), line(300, 8, 'mark', 1.5)]) {
      const r = read(all, s, s);
      expect([...r.bytes]).toEqual(all);
      expect(r.framingErrors + r.parityErrors).toBe(0);
    }
    const seven = line(9600, 7, 'even', 1);
    expect([...read([0x00, 0x7f, 0x80, 0xff], seven, seven).bytes]).toEqual([0x00, 0x7f, 0x00, 0x7f]);
    expect(read([], line(9600, 8, 'none', 1), line(19200, 8, 'none', 1)).chars).toEqual([]);
  });

  it('0x55 sent at 9600 8-N-1 and read at 19200 8-N-1 gives 0x66 with a framing error, then 0xE6', () => {
    // Worked on paper, T = one 9600 bit time, the receiver's bit is T/2. Line from the start bit's edge at T:
    // slot 1 start 0, slots 2-9 the data 1 0 1 0 1 0 1 0 (0x55 LSB first), slot 10 stop 1, then idle 1.
    // Receiver 1: start checked at 1.25T (0), data at 1.75T, 2.25T, ... 5.25T read 0 1 1 0 0 1 1 0 = 0x66,
    // stop at 5.75T is in slot 5 (0): framing error. Next mark→space edge at 7T; data at 7.75T ... 11.25T read
    // 0 1 1 0 0 1 1 1 = 0xE6 (slots 10 and 11 are mark), stop at 11.75T is idle (1): no error.
    const r = read([0x55], line(9600, 8, 'none', 1), line(19200, 8, 'none', 1));
    expect(r.chars.map((c) => [c.byte, c.framingError, c.parityError])).toEqual([[0x66, true, false], [0xe6, false, false]]);
    expect(r.framingErrors).toBe(1);
  });

  it('0x0F sent at 28800 8-N-1 and read at 9600 8-N-1 gives one 0xFF without an error', () => {
    // S = one 28800 bit time, the receiver's bit is 3S. Slots: 1 start 0, 2-5 data 1 1 1 1, 6-9 data 0 0 0 0,
    // 10 stop 1. The edge at 1S is no start bit (checked at 2.5S: mark). The next edge at 6S is (7.5S: space);
    // data at 10.5S, 13.5S, ... all mark (stop bit, then idle) = 0xFF; stop at 34.5S: mark.
    const r = read([0x0f], line(28800, 8, 'none', 1), line(9600, 8, 'none', 1));
    expect(r.chars.map((c) => [c.byte, c.framingError, c.parityError])).toEqual([[0xff, false, false]]);
  });

  it('8-N-1 read as 7-E-1 at the same baud: 0x41 passes, 0x43 has a parity error', () => {
    // 0x41 = data 1 0 0 0 0 0 1 | 0: seven bits 0x41 (two ones, even parity bit 0); the eighth data bit 0 is read
    // as the parity bit: 0 = as expected. 0x43 = 1 1 0 0 0 0 1 | 0: three ones want parity 1, the line has 0.
    const r = read([0x41, 0x43], line(9600, 8, 'none', 1), line(9600, 7, 'even', 1));
    expect(r.chars.map((c) => [c.byte, c.framingError, c.parityError])).toEqual([[0x41, false, false], [0x43, false, true]]);
    expect(r.parityErrors).toBe(1);
  });

  it('8-E-1 read as 8-N-1: the parity bit is read as the stop bit, so 0x00 (parity 0) has a framing error and 0x01 none', () => {
    const r = read([0x01, 0x00], line(9600, 8, 'even', 1), line(9600, 8, 'none', 1));
    expect(r.chars.map((c) => [c.byte, c.framingError])).toEqual([[0x01, false], [0x00, true]]);
  });

  it('0x00, 0x7F, 0x80 and 0xFF sent at 9600 8-N-1 and read at 19200 8-N-1', () => {
    // Slots of T as in the 0x55 case; the receiver samples data at 1.75T, 2.25T, ... 5.25T and the stop bit at 5.75T.
    // 0x00: slots 1-9 space: data 0x00, stop in slot 5 space: framing error; no mark→space edge follows.
    // 0x7F: slot 1 start, slots 2-8 mark, slot 9 space: 0 1 1 1 1 1 1 1 = 0xFE, stop (slot 5) mark; then the
    //   edge at 9T: data at 9.75T (space), 10.25T ... mark = 0xFE again, stop in the idle line.
    // 0x80: slots 1-8 space, slot 9 mark: data 0x00, stop in slot 5 space: framing error; no edge follows.
    // 0xFF: only the start bit is space: bit 0 at 1.75T space, the rest mark = 0xFE, stop mark.
    const at = (b: number) => read([b], line(9600, 8, 'none', 1), line(19200, 8, 'none', 1)).chars.map((c) => [c.byte, c.framingError]);
    expect(at(0x00)).toEqual([[0x00, true]]);
    expect(at(0x7f)).toEqual([[0xfe, false], [0xfe, false]]);
    expect(at(0x80)).toEqual([[0x00, true]]);
    expect(at(0xff)).toEqual([[0xfe, false]]);
  });

  it('tells equal framings from different ones', () => {
    expect(sameFraming(line(9600, 8, 'none', 1), line(9600, 8, 'none', 1))).toBe(true);
    expect(sameFraming(line(9600, 8, 'none', 1), line(9600, 8, 'none', 2))).toBe(false);
    expect(sameFraming(line(9600, 8, 'none', 1), line(9600, 8, 'even', 1))).toBe(false);
  });

  it('refuses line settings outside the engine range with a message', () => {
    const r = receiveAs(Uint8Array.of(1), line(0, 8, 'none', 1), line(9600, 8, 'none', 1));
    expect(r.ok).toBe(false);
  });
});
