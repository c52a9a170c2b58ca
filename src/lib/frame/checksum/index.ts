/** Checksum catalogue: lookup by name or alias (case-insensitive), computation, and placement in a frame. */
import { HEX_PAIR } from '../bytes';
import { type Result, failure, success } from '../result';
import { CRC_MODELS, createCrc } from './crc';
import { lrc8, sum8, xor8 } from './simple';

export type ChecksumKind = 'crc' | 'lrc' | 'xor' | 'sum';

export interface ChecksumAlgorithm {
  /** Canonical name: the CRC catalogue name, or `LRC`, `XOR-8`, `SUM-8`. */
  name: string;
  aliases: readonly string[];
  width: 8 | 16 | 32;
  kind: ChecksumKind;
  /** Value over the ASCII bytes of "123456789". */
  check: number;
  compute(bytes: Uint8Array, start?: number, end?: number): number;
}

/** The catalogue in picker order. */
export const CHECKSUM_ALGORITHMS: readonly ChecksumAlgorithm[] = [
  ...CRC_MODELS.map((m) => ({ name: m.name, aliases: m.aliases, width: m.width, kind: 'crc' as const, check: m.check, compute: createCrc(m) })),
  { name: 'LRC', aliases: ['LRC-8', 'MODBUS-LRC'], width: 8, kind: 'lrc', check: 0x23, compute: lrc8 },
  { name: 'XOR-8', aliases: ['BCC', 'NMEA'], width: 8, kind: 'xor', check: 0x31, compute: xor8 },
  { name: 'SUM-8', aliases: ['SUM'], width: 8, kind: 'sum', check: 0xdd, compute: sum8 },
];

const BY_NAME = new Map<string, ChecksumAlgorithm>();
for (const a of CHECKSUM_ALGORITHMS) for (const n of [a.name, ...a.aliases]) BY_NAME.set(n.toUpperCase(), a);

/** Case-insensitive lookup over names and aliases; `CRC-16/CCITT` finds CRC-16/KERMIT as the catalogue says. */
export function findChecksumAlgorithm(name: string): ChecksumAlgorithm | undefined {
  return BY_NAME.get(name) ?? BY_NAME.get(name.trim().toUpperCase());
}

/** Plain data for UI pickers. */
export function listChecksumAlgorithms(): { name: string; aliases: string[]; width: number; kind: ChecksumKind }[] {
  return CHECKSUM_ALGORITHMS.map((a) => ({ name: a.name, aliases: [...a.aliases], width: a.width, kind: a.kind }));
}

export interface ChecksumValue {
  algorithm: string;
  width: number;
  value: number;
}

export function computeChecksum(algorithm: string, bytes: Uint8Array): Result<ChecksumValue> {
  const found = findChecksumAlgorithm(algorithm);
  if (!found) {
    return failure(0, `Unknown checksum "${algorithm}"; pick one of ${CHECKSUM_ALGORITHMS.map((a) => a.name).join(', ')}`);
  }
  return success({ algorithm: found.name, width: found.width, value: found.compute(bytes) });
}

/** `0x4B37`: uppercase hex padded to the algorithm width. */
export function formatChecksumValue(value: number, width: number): string {
  return '0x' + value.toString(16).toUpperCase().padStart(width / 4, '0');
}

export type ChecksumEncoding = 'binary' | 'ascii-hex' | 'ascii-decimal';
export type ByteOrder = 'low-first' | 'high-first';

export interface ChecksumPlacement {
  encoding: ChecksumEncoding;
  /** Order of the value's bytes on the wire (binary and ascii-hex); ignored for one-byte checksums. */
  byteOrder: ByteOrder;
  /** Letter case of ascii-hex digits. */
  case: 'upper' | 'lower';
}

/** Bytes a placed checksum occupies: width/8 binary, width/4 hex characters, or 3/5/10 decimal digits. */
export function checksumLength(width: number, encoding: ChecksumEncoding): number {
  if (encoding === 'binary') return width / 8;
  if (encoding === 'ascii-hex') return width / 4;
  return width === 8 ? 3 : width === 16 ? 5 : 10;
}

/**
 * The checksum as sent. ascii-hex writes each byte as two hex digits, high nibble first, bytes in
 * `byteOrder` (Modbus ASCII sends LRC 0x61 as "61", 2.5.2.2); ascii-decimal is zero-padded.
 */
export function placeChecksum(value: number, width: number, placement: ChecksumPlacement): Uint8Array {
  const n = width / 8;
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

/**
 * NMEA 0183 sentence checksum: XOR of the characters between `$` (or `!`) and `*`, as two uppercase
 * hex digits, high nibble first. Accepts a sentence with or without the `*hh` tail.
 */
export function nmeaChecksum(sentence: string): Result<{ value: number; text: string }> {
  const begin = sentence.search(/[$!]/);
  if (begin < 0) return failure(0, 'An NMEA sentence starts with $ or !');
  const star = sentence.indexOf('*', begin + 1);
  const end = star < 0 ? sentence.length : star;
  let x = 0;
  for (let i = begin + 1; i < end; i++) {
    const c = sentence.charCodeAt(i);
    if (c > 0x7e || c < 0x20) return failure(i, 'NMEA sentences contain printable ASCII only');
    x ^= c;
  }
  return success({ value: x, text: HEX_PAIR[x]! });
}

export { CRC_MODELS, createCrc, lrc8, xor8, sum8 };
export type { CrcModel, CrcParams } from './crc';
