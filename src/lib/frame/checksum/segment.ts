/** What a template's checksum segment needs from the catalogue: custom CRC parameters, the algorithm, the covered bytes. */
import { z } from 'zod';
import { HEX_PAIR } from '../bytes';
import { type ByteOrder, type ChecksumAlgorithm, checksumNameKey, customCrcAlgorithm, findChecksumAlgorithm } from './catalogue';
import { type CrcParams, crcParamsProblem } from './crc';
import type { ChecksumEncoding } from './placement';

/** The `algorithm` of a checksum segment that brings its own CRC parameters in `crc`. */
export const CUSTOM_CRC = 'custom';
export const isCustomCrcName = (algorithm: string) => checksumNameKey(algorithm) === 'CUSTOM';

const registerValue = z.union([
  z.number().int().min(0).max(0xffffffff),
  z.string().regex(/^(0[xX])?[0-9A-Fa-f]{1,8}$/, 'Write the value in hex, e.g. 0x1021'),
]);
const numberOf = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' ? parseInt(v.replace(/^0x/i, ''), 16) : NaN);
const hexText = (v: number, width: number) => '0x' + v.toString(16).toUpperCase().padStart(Math.ceil(width / 4), '0');

/** Custom CRC parameters as written in a template or request: registers as hex text (`"0x1021"`) or numbers. */
export interface CrcParamsInput {
  width: number;
  poly: number | string;
  init: number | string;
  refin: boolean;
  refout: boolean;
  xorout: number | string;
}

export function numericCrcParams(p: CrcParamsInput): CrcParams {
  return { width: p.width, poly: numberOf(p.poly), init: numberOf(p.init), refin: p.refin, refout: p.refout, xorout: numberOf(p.xorout) };
}

/**
 * Custom CRC parameters (width 1-32, polynomial in normal form, init, refin, refout, xorout) as in the
 * CRC RevEng catalogue. Saved canonically with registers as uppercase hex text padded to the width.
 */
export const crcParamsSchema = z
  .object({ width: z.number().int().min(1).max(32), poly: registerValue, init: registerValue, refin: z.boolean(), refout: z.boolean(), xorout: registerValue })
  .superRefine((p, ctx) => {
    const problem = crcParamsProblem(numericCrcParams(p));
    if (problem) ctx.addIssue({ code: 'custom', path: [problem.key], message: problem.message });
  })
  .transform((p) => {
    const n = numericCrcParams(p);
    return { width: n.width, poly: hexText(n.poly, n.width), init: hexText(n.init, n.width), refin: n.refin, refout: n.refout, xorout: hexText(n.xorout, n.width) };
  });
export type CrcParamsText = z.output<typeof crcParamsSchema>;

const resolved = new WeakMap<object, ChecksumAlgorithm | null>();

/** The algorithm of a checksum segment: a catalogue name or alias, or `custom` with its `crc` parameters. */
export function resolveChecksum(segment: { algorithm: string; crc?: CrcParamsInput | undefined }): ChecksumAlgorithm | undefined {
  if (!isCustomCrcName(segment.algorithm)) return findChecksumAlgorithm(segment.algorithm);
  const crc = segment.crc;
  if (!crc) return undefined;
  let a = resolved.get(crc);
  if (a === undefined) {
    const r = customCrcAlgorithm(numericCrcParams(crc));
    a = r.ok ? r.value : null;
    resolved.set(crc, a);
  }
  return a ?? undefined;
}

/** Byte order when a segment gives none: the model's for binary values, high byte first for characters (the number as written). */
export function defaultChecksumByteOrder(segment: { algorithm: string; crc?: CrcParamsInput | undefined; encoding?: ChecksumEncoding }): ByteOrder {
  return ((segment.encoding ?? 'binary') === 'binary' ? resolveChecksum(segment)?.byteOrder : undefined) ?? 'high-first';
}

/** `bytes`: the covered bytes as they are; `decoded-hex`: the bytes the covered hex characters stand for (Modbus ASCII). */
export type ChecksumInput = 'bytes' | 'decoded-hex';

export interface RangeChecksum {
  value: number;
  /** decoded-hex only: where the covered text stops being hex pairs, and why; the value covers the pairs before. */
  problem: { at: number; message: string } | null;
}

const HEX_VALUE = new Int8Array(256).fill(-1);
for (let i = 0; i < 16; i++) {
  HEX_VALUE['0123456789ABCDEF'.charCodeAt(i)] = i;
  HEX_VALUE['0123456789abcdef'.charCodeAt(i)] = i;
}

/**
 * The checksum of bytes [from, to). Over `decoded-hex` each pair of hex characters counts as the byte it
 * stands for: Modbus ASCII's LRC of ":010300000001" is computed over 01 03 00 00 00 01 (Modbus over Serial
 * Line V1.02, 2.5.2.2).
 */
export function checksumOfRange(a: ChecksumAlgorithm, input: ChecksumInput | undefined, bytes: Uint8Array, from: number, to: number): RangeChecksum {
  if (input !== 'decoded-hex') return { value: a.compute(bytes, from, to), problem: null };
  const decoded = new Uint8Array((to - from) >> 1);
  let n = 0;
  let problem: RangeChecksum['problem'] = null;
  for (let i = from; i < to; i += 2) {
    const bad = HEX_VALUE[bytes[i]!]! < 0 ? i : i + 1 < to && HEX_VALUE[bytes[i + 1]!]! < 0 ? i + 1 : -1;
    if (bad >= 0) {
      const c = bytes[bad]!;
      const shown = c >= 0x20 && c <= 0x7e ? `"${String.fromCharCode(c)}" (${HEX_PAIR[c]})` : `byte ${HEX_PAIR[c]}`;
      problem = { at: bad, message: `${shown} at position ${bad} is not a hex digit` };
      break;
    }
    if (i + 1 >= to) {
      problem = { at: i, message: `the covered text has an odd number of hex characters (position ${i} has no partner)` };
      break;
    }
    decoded[n++] = (HEX_VALUE[bytes[i]!]! << 4) | HEX_VALUE[bytes[i + 1]!]!;
  }
  return { value: a.compute(decoded, 0, n), problem };
}
