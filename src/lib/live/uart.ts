/**
 * What a UART at one framing reads from characters sent at another: the wire bit sequence of the sender
 * (`bitSequence` of the frame engine) sampled at the receiver's bit times. Pure; times in microseconds.
 *
 * The receiver model (common practice for a UART without oversampling details):
 * - it hunts for a start bit: the first mark→space edge at or after the point where it may hunt;
 * - it checks the start bit again half a bit time later (a space → mark glitch shorter than that is no start);
 * - it samples each data bit in the middle of its bit time, least significant first, then the parity bit
 *   (when it expects one) and the first stop bit; a space where the stop bit should be is a framing error,
 *   a parity bit that does not match is a parity error;
 * - it hunts again from the middle of the stop bit. Only the first stop bit is checked, as receivers do.
 * After the last character the line stays at mark (idle).
 */
import { bitSequence } from '../frame/timing';
import type { LineSettings } from '../frame/port-settings';
import { type Result, success } from '../frame/result';

export interface ReceivedChar {
  byte: number;
  framingError: boolean;
  parityError: boolean;
  /** Microseconds from the start of the transmission to the middle of the stop bit (when the byte is complete). */
  atUs: number;
}

export interface Reception {
  chars: ReceivedChar[];
  bytes: Uint8Array;
  framingErrors: number;
  parityErrors: number;
  /** Microseconds the sender's bit sequence lasts, idle bits included. */
  totalUs: number;
}

/** Two framings are the same when a receiver at one reads a sender at the other without changing a bit. */
export function sameFraming(a: LineSettings, b: LineSettings): boolean {
  return a.baud === b.baud && a.dataBits === b.dataBits && a.parity === b.parity && a.stopBits === b.stopBits;
}

/** The parity bit a sender at `parity` puts after these data bits (mark = 1, space = 0). */
export function parityBit(parity: LineSettings['parity'], value: number, dataBits: number): 0 | 1 {
  let ones = 0;
  for (let i = 0; i < dataBits; i++) ones += (value >> i) & 1;
  if (parity === 'mark') return 1;
  if (parity === 'space') return 0;
  return (parity === 'even' ? ones & 1 : (ones & 1) ^ 1) as 0 | 1;
}

/**
 * Reads `bytes`, sent at `sender`'s framing, with a receiver at `receiver`'s framing. With equal framings
 * the bytes come back unchanged and without errors (tested for every byte value).
 */
export function receiveAs(bytes: Uint8Array, sender: LineSettings, receiver: LineSettings): Result<Reception> {
  const seq = bitSequence(bytes, sender, bytes.length);
  if (!seq.ok) return seq;
  const probe = bitSequence(new Uint8Array(0), receiver, 0);
  if (!probe.ok) return probe;
  const { cells, totalUs } = seq.value;
  const starts = cells.map((c) => c.startUs);
  const levelAt = (t: number): 0 | 1 => {
    if (t < 0 || t >= totalUs) return 1;
    let lo = 0;
    let hi = cells.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid]! <= t) lo = mid;
      else hi = mid - 1;
    }
    return cells[lo]!.level;
  };
  // The hunt only moves forward, so the search for the next edge resumes where the last one stopped.
  let scan = 1;
  /** The first mark→space edge at or after `from`, or null. */
  const nextFallingEdge = (from: number): number | null => {
    for (; scan < cells.length; scan++) {
      const t = starts[scan]!;
      if (t < from) continue;
      if (cells[scan]!.level === 0 && cells[scan - 1]!.level === 1) return t;
    }
    return null;
  };

  const bitUs = 1e6 / receiver.baud;
  const chars: ReceivedChar[] = [];
  let hunt = 0;
  let framingErrors = 0;
  let parityErrors = 0;
  for (;;) {
    const edge = nextFallingEdge(hunt);
    if (edge === null) break;
    if (levelAt(edge + bitUs / 2) !== 0) {
      hunt = edge + bitUs / 2;
      continue;
    }
    let value = 0;
    for (let k = 0; k < receiver.dataBits; k++) value |= levelAt(edge + bitUs * (1.5 + k)) << k;
    let next = 1.5 + receiver.dataBits;
    let parityError = false;
    if (receiver.parity !== 'none') {
      parityError = levelAt(edge + bitUs * next) !== parityBit(receiver.parity, value, receiver.dataBits);
      next += 1;
    }
    const stopAt = edge + bitUs * next;
    const framingError = levelAt(stopAt) !== 1;
    if (framingError) framingErrors++;
    if (parityError) parityErrors++;
    chars.push({ byte: value, framingError, parityError, atUs: stopAt });
    hunt = stopAt;
  }
  return success({ chars, bytes: Uint8Array.from(chars, (c) => c.byte), framingErrors, parityErrors, totalUs });
}
