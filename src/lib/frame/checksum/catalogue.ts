/** The checksum catalogue: CRC models and block checks, lookup by ASCII name or alias, custom CRC parameters. */
import { type Result, failure, success } from '../result';
import { CRC_MODELS, type CrcParams, createCrc, crcParamsProblem } from './crc';
import { inverted, lrc8, sum16, sum8, twosComplement, xor8 } from './simple';

export type ChecksumKind = 'crc' | 'lrc' | 'xor' | 'sum';
export type ByteOrder = 'low-first' | 'high-first';

export interface ChecksumAlgorithm {
  /** Canonical name: the CRC catalogue name, `LRC`, `SUM-8`, `XOR-8`…, or `CRC-n custom (…)` for own parameters. */
  name: string;
  aliases: readonly string[];
  /** Bits, 1-32 (CRCs); 8 or 16 for block checks. */
  width: number;
  kind: ChecksumKind;
  /** Value over the ASCII bytes of "123456789". */
  check: number;
  /** Catalogue CRC models: the residue (register after an error-free codeword, before xorout). */
  residue?: number;
  /** CRCs: the parameters (width, poly, init, refin, refout, xorout). */
  params?: CrcParams;
  /**
   * Order of the value's bytes when sent as binary: low byte first for reflected CRCs (refout; their
   * catalogue codewords carry the CRC low byte first, as CRC-16/MODBUS is sent), else high byte first.
   */
  byteOrder: ByteOrder;
  compute(bytes: Uint8Array, start?: number, end?: number): number;
}

const CHECK = Uint8Array.from('123456789', (c) => c.charCodeAt(0));

function crcAlgorithm(name: string, aliases: readonly string[], params: CrcParams, residue?: number): ChecksumAlgorithm {
  const compute = createCrc(params);
  const a: ChecksumAlgorithm = { name, aliases, width: params.width, kind: 'crc', check: compute(CHECK), params, byteOrder: params.refout ? 'low-first' : 'high-first', compute };
  if (residue !== undefined) a.residue = residue;
  return a;
}

const block = (name: string, aliases: string[], width: 8 | 16, kind: ChecksumKind, compute: ChecksumAlgorithm['compute']): ChecksumAlgorithm =>
  ({ name, aliases, width, kind, check: compute(CHECK), byteOrder: 'high-first', compute });

/** The catalogue in picker order: CRC models, then the block checks. */
export const CHECKSUM_ALGORITHMS: readonly ChecksumAlgorithm[] = [
  ...CRC_MODELS.map(({ name, aliases, check: _check, residue, ...params }) => crcAlgorithm(name, aliases, params, residue)),
  block('LRC', ['LRC-8', 'MODBUS-LRC', 'SUM-8/TWOS-COMPLEMENT'], 8, 'lrc', lrc8),
  block('SUM-8', ['SUM'], 8, 'sum', sum8),
  block('SUM-8/INVERTED', ['SUM-8/ONES-COMPLEMENT'], 8, 'sum', inverted(sum8, 8)),
  block('SUM-16', [], 16, 'sum', sum16),
  block('SUM-16/TWOS-COMPLEMENT', [], 16, 'sum', twosComplement(sum16, 16)),
  block('SUM-16/INVERTED', ['SUM-16/ONES-COMPLEMENT'], 16, 'sum', inverted(sum16, 16)),
  block('XOR-8', ['BCC', 'NMEA'], 8, 'xor', xor8),
  block('XOR-8/INVERTED', ['XOR-8/ONES-COMPLEMENT'], 8, 'xor', inverted(xor8, 8)),
  block('XOR-8/TWOS-COMPLEMENT', [], 8, 'xor', twosComplement(xor8, 8)),
];

/**
 * Lookup key of a name: ASCII letters upper-cased, surrounding ASCII spaces and tabs dropped. Anything
 * outside printable ASCII gives no key, so Unicode case folding cannot turn `modbuſ` into `MODBUS`.
 */
export function checksumNameKey(name: string): string | undefined {
  const trimmed = name.replace(/^[ \t]+|[ \t]+$/g, '');
  return /^[\x21-\x7e]+$/.test(trimmed) ? trimmed.toUpperCase() : undefined;
}

const BY_NAME = new Map<string, ChecksumAlgorithm>();
for (const a of CHECKSUM_ALGORITHMS) for (const n of [a.name, ...a.aliases]) BY_NAME.set(checksumNameKey(n)!, a);

/** Lookup over names and aliases, ASCII case-insensitive; `CRC-16/CCITT` finds CRC-16/KERMIT as the catalogue says. */
export function findChecksumAlgorithm(name: string): ChecksumAlgorithm | undefined {
  const exact = BY_NAME.get(name);
  if (exact) return exact;
  const key = checksumNameKey(name);
  return key === undefined ? undefined : BY_NAME.get(key);
}

/** Plain data for UI pickers. */
export function listChecksumAlgorithms(): { name: string; aliases: string[]; width: number; kind: ChecksumKind; byteOrder: ByteOrder }[] {
  return CHECKSUM_ALGORITHMS.map((a) => ({ name: a.name, aliases: [...a.aliases], width: a.width, kind: a.kind, byteOrder: a.byteOrder }));
}

const hexOf = (v: number, width: number) => '0x' + v.toString(16).toUpperCase().padStart(Math.ceil(width / 4), '0');
const sameParams = (a: CrcParams, b: CrcParams) =>
  a.width === b.width && a.poly === b.poly && a.init === b.init && a.refin === b.refin && a.refout === b.refout && a.xorout === b.xorout;

const customCache = new Map<string, ChecksumAlgorithm>();

/**
 * A CRC from its parameters (width 1-32). Parameters of a catalogue model give that model, so the name
 * tells the user what they have; others are named `CRC-16 custom (poly=0x8005 init=0x1234 …)`.
 */
export function customCrcAlgorithm(params: CrcParams): Result<ChecksumAlgorithm> {
  const problem = crcParamsProblem(params);
  if (problem) return failure(0, problem.message);
  const p: CrcParams = { width: params.width, poly: params.poly, init: params.init, refin: params.refin, refout: params.refout, xorout: params.xorout };
  const known = CHECKSUM_ALGORITHMS.find((a) => a.params && sameParams(a.params, p));
  if (known) return success(known);
  const name = `CRC-${p.width} custom (poly=${hexOf(p.poly, p.width)} init=${hexOf(p.init, p.width)} refin=${p.refin} refout=${p.refout} xorout=${hexOf(p.xorout, p.width)})`;
  let found = customCache.get(name);
  if (!found) {
    found = crcAlgorithm(name, [], p);
    if (customCache.size >= 64) customCache.clear();
    customCache.set(name, found);
  }
  return success(found);
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
