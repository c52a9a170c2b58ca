/** 8-bit block checks computed by plain arithmetic over a byte range. */

/**
 * LRC as in Modbus ASCII (Modbus over Serial Line Specification and Implementation Guide V1.02,
 * 2.5.2.2 and 6.2.1): the two's complement of the 8-bit sum of the bytes.
 * Modbus ASCII computes it over the binary message bytes, not over their hex characters.
 */
export function lrc8(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let sum = 0;
  for (let i = start; i < end; i++) sum += bytes[i]!;
  return -sum & 0xff;
}

/** XOR of all bytes: the NMEA 0183 sentence checksum and the classic block check character (BCC). */
export function xor8(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let x = 0;
  for (let i = start; i < end; i++) x ^= bytes[i]!;
  return x;
}

/** Arithmetic sum of all bytes modulo 256. */
export function sum8(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let sum = 0;
  for (let i = start; i < end; i++) sum += bytes[i]!;
  return sum & 0xff;
}

/** Arithmetic sum of all bytes modulo 65536 (a 16-bit sum of bytes, not of 16-bit words). */
export function sum16(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let sum = 0;
  for (let i = start; i < end; i++) sum += bytes[i]!;
  return sum & 0xffff;
}

type BlockCheck = (bytes: Uint8Array, start?: number, end?: number) => number;

/** One's complement of a block check: every bit of the `width`-bit value inverted. */
export const inverted = (f: BlockCheck, width: 8 | 16): BlockCheck => (b, s, e) => ~f(b, s, e) & (width === 8 ? 0xff : 0xffff);

/** Two's complement of a block check, so that adding it to the check gives 0 modulo 2^width. */
export const twosComplement = (f: BlockCheck, width: 8 | 16): BlockCheck => (b, s, e) => -f(b, s, e) & (width === 8 ? 0xff : 0xffff);
