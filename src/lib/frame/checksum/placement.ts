/** How a checksum value goes on the wire: binary bytes, hex characters or decimal characters. */
import type { ByteOrder } from './catalogue';

export type ChecksumEncoding = 'binary' | 'ascii-hex' | 'ascii-decimal';

export interface ChecksumPlacement {
  encoding: ChecksumEncoding;
  /** Order of the value's bytes on the wire (binary and ascii-hex); ignored for one-byte checksums. */
  byteOrder: ByteOrder;
  /** Letter case of ascii-hex digits. */
  case: 'upper' | 'lower';
}

const bytesOf = (width: number) => Math.ceil(width / 8);

/** `0x4B37`: uppercase hex padded to the algorithm width (a 12-bit CRC shows 3 digits). */
export function formatChecksumValue(value: number, width: number): string {
  return '0x' + value.toString(16).toUpperCase().padStart(Math.ceil(width / 4), '0');
}

/**
 * Bytes a placed checksum occupies: whole bytes in binary (a 12-bit CRC takes 2), two hex characters per
 * byte, or as many decimal digits as the largest value has (3 for 8 bits, 5 for 16, 10 for 32).
 */
export function checksumLength(width: number, encoding: ChecksumEncoding): number {
  if (encoding === 'binary') return bytesOf(width);
  if (encoding === 'ascii-hex') return 2 * bytesOf(width);
  return String(2 ** width - 1).length;
}

/**
 * The checksum as sent. ascii-hex writes each byte as two hex digits, high nibble first, bytes in
 * `byteOrder` (Modbus ASCII sends LRC 0x61 as "61", 2.5.2.2); ascii-decimal is zero-padded.
 */
export function placeChecksum(value: number, width: number, placement: ChecksumPlacement): Uint8Array {
  const n = bytesOf(width);
  const ordered = new Uint8Array(n);
  const low = placement.byteOrder === 'low-first';
  for (let i = 0; i < n; i++) ordered[low ? i : n - 1 - i] = Math.floor(value / 2 ** (8 * i)) & 0xff;
  if (placement.encoding === 'binary') return ordered;
  if (placement.encoding === 'ascii-hex') {
    const digits = placement.case === 'lower' ? HEX_LOWER : HEX_UPPER;
    const out = new Uint8Array(2 * n);
    for (let i = 0; i < n; i++) {
      out[2 * i] = digits[ordered[i]! >> 4]!;
      out[2 * i + 1] = digits[ordered[i]! & 15]!;
    }
    return out;
  }
  const text = String(value).padStart(checksumLength(width, 'ascii-decimal'), '0');
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) out[i] = text.charCodeAt(i);
  return out;
}

const HEX_UPPER = Uint8Array.from('0123456789ABCDEF', (c) => c.charCodeAt(0));
const HEX_LOWER = Uint8Array.from('0123456789abcdef', (c) => c.charCodeAt(0));
