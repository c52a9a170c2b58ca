/** Checksum catalogue: lookup by name or alias (ASCII, case-insensitive), computation, and placement in a frame. */
import { HEX_PAIR } from '../bytes';
import { type Result, failure, success } from '../result';

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

export {
  type ByteOrder, type ChecksumAlgorithm, type ChecksumKind, type ChecksumValue, CHECKSUM_ALGORITHMS, checksumNameKey,
  computeChecksum, customCrcAlgorithm, findChecksumAlgorithm, listChecksumAlgorithms,
} from './catalogue';
export { type ChecksumEncoding, type ChecksumPlacement, checksumLength, formatChecksumValue, placeChecksum } from './placement';
export {
  CUSTOM_CRC, type ChecksumInput, type CrcParamsInput, type CrcParamsText, type RangeChecksum, checksumOfRange, crcParamsSchema,
  defaultChecksumByteOrder, isCustomCrcName, numericCrcParams, resolveChecksum,
} from './segment';
export { CRC_MODELS, type CrcModel, type CrcParams, createCrc, crcParamsProblem } from './crc';
export { lrc8, xor8, sum8, sum16 } from './simple';
