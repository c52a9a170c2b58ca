/**
 * Register words: bytes packed two per 16-bit word, for PLCs whose serial send instruction takes a
 * register (word) array instead of a byte string.
 *
 * `high-first`: the first byte of each pair goes in bits 15-8 ("ABC" -> 0x4142 0x4300).
 * `low-first`: the first byte goes in bits 7-0 ("ABC" -> 0x4241 0x0043).
 * An odd byte count is padded with one 0x00 byte, reported as `padded: true`; pass the original
 * `byteCount` when unpacking to drop the padding again.
 */
import { HEX_PAIR } from '../bytes';
import { type Result, failure, success } from '../result';

export type WordByteOrder = 'high-first' | 'low-first';

export interface RegisterWords {
  /** Unsigned 16-bit word values, 0-65535. */
  words: number[];
  wordCount: number;
  /** True when a 0x00 byte was added to complete the last word. */
  padded: boolean;
  byteOrder: WordByteOrder;
  /** Words as four uppercase hex digits each, space-separated: `4142 4300`. */
  hex: string;
  /** Words as unsigned decimals, space-separated: `16706 17152`. */
  decimal: string;
  /** Words as signed 16-bit decimals (INT), space-separated. */
  signedDecimal: string;
}

export function packRegisterWords(bytes: Uint8Array, byteOrder: WordByteOrder = 'high-first'): RegisterWords {
  const wordCount = (bytes.length + 1) >> 1;
  const words = new Array<number>(wordCount);
  for (let w = 0; w < wordCount; w++) {
    const first = bytes[2 * w]!;
    const second = bytes[2 * w + 1] ?? 0;
    words[w] = byteOrder === 'high-first' ? (first << 8) | second : (second << 8) | first;
  }
  return {
    words,
    wordCount,
    padded: bytes.length % 2 === 1,
    byteOrder,
    hex: words.map((v) => HEX_PAIR[v >> 8]! + HEX_PAIR[v & 0xff]!).join(' '),
    decimal: words.join(' '),
    signedDecimal: words.map((v) => (v >= 0x8000 ? v - 0x10000 : v)).join(' '),
  };
}

/**
 * Bytes from words (unsigned 0-65535, or signed -32768..-1 as INT); `byteCount` (default: two per
 * word) trims the padding byte. A count that is negative, not whole or more than the words hold, or a
 * word outside the 16-bit range, is an error (position 0).
 */
export function unpackRegisterWords(
  words: readonly number[],
  byteOrder: WordByteOrder = 'high-first',
  byteCount = words.length * 2,
): Result<Uint8Array> {
  if (!Number.isInteger(byteCount) || byteCount < 0 || byteCount > words.length * 2) {
    return failure(0, `Byte count ${byteCount} does not fit ${words.length} words; give a whole number from 0 to ${words.length * 2}`);
  }
  const bad = words.findIndex((w) => !Number.isInteger(w) || w < -32768 || w > 65535);
  if (bad >= 0) return failure(0, `Word ${bad + 1} (${words[bad]}) is not a 16-bit word; give -32768 to 65535`);
  const out = new Uint8Array(byteCount);
  for (let i = 0; i < out.length; i++) {
    const w = words[i >> 1]! & 0xffff;
    const high = (i & 1) === 0 ? byteOrder === 'high-first' : byteOrder === 'low-first';
    out[i] = high ? w >> 8 : w & 0xff;
  }
  return success(out);
}

/**
 * Words written as text: `base: 'hex'` takes 1-4 hex digits per word (optional `0x`/`16#` prefix),
 * `base: 'decimal'` takes 0-65535 or a signed -32768..-1 per word. Separators: spaces, commas, semicolons, line breaks.
 */
export function parseRegisterWords(text: string, base: 'hex' | 'decimal'): Result<number[]> {
  const words: number[] = [];
  const re = /[^\s,;]+/g;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    const token = m[0];
    if (base === 'hex') {
      const digits = token.replace(/^(0x|16#)/i, '');
      if (!/^[0-9a-f]{1,4}$/i.test(digits)) {
        return failure(m.index, `"${token}" is not a 16-bit hex word; write 1 to 4 hex digits such as 4142`);
      }
      words.push(parseInt(digits, 16));
    } else {
      if (!/^-?\d{1,5}$/.test(token)) return failure(m.index, `"${token}" is not a whole number`);
      const v = Number(token);
      if (v < -32768 || v > 65535) return failure(m.index, `${token} does not fit a 16-bit word (-32768 to 65535)`);
      words.push(v < 0 ? v + 0x10000 : v);
    }
  }
  return success(words);
}
