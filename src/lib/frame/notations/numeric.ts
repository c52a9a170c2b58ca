/**
 * Hex and decimal notations.
 *
 * Hex input: bytes as hex digit pairs in either case, separated by any mix of spaces, tabs, line
 * breaks, commas, semicolons, colons or dashes, or not separated at all: `0D 0A`, `0d0a` and `0D:0a`
 * are the same two bytes. A group may be written `0x0D`, `0Dh` (suffix, as assemblers do), `16#0D`
 * (IEC 61131-3 typed literal, `_` allowed between digits) or in binary as `2#00001101`. A group with
 * one hex digit (`D`, `0xD`) is one byte; a group with an odd number of hex digits above one is an error
 * because it cannot be split. A binary group of 1-8 digits is one byte; longer ones must be whole bytes
 * (multiples of 8 digits). Hex rendering: uppercase pairs separated by one space.
 *
 * Decimal input: numbers 0-255 separated by spaces, tabs, line breaks, commas or semicolons. A byte may
 * also be written in another base when the base is marked: `16#0D`, `0x0D`, `0Dh`, `8#15`, `2#1101`,
 * `0b1101`. Decimal rendering: numbers separated by one space.
 */
import { HEX_TABLE, createRenderTable, hexValue, renderWithTable } from '../bytes';
import { type Result, failure, success } from '../result';

function isHexSeparator(c: number): boolean {
  return c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d || c === 0x2c || c === 0x3b || c === 0x3a || c === 0x2d;
}

/** Value of a digit character in `base` (2, 8, 10 or 16), or -1. */
function digitValue(code: number, base: number): number {
  const v = hexValue(code);
  return v >= 0 && v < base ? v : -1;
}

const BASE_NAMES: Record<number, string> = { 2: 'binary', 8: 'octal', 10: 'decimal', 16: 'hex' };

/**
 * Digits in `base` from `from` up to `end` (exclusive); with `underscores`, a `_` between two digits is
 * skipped (IEC 61131-3 literals). Returns the digit values, or the position of the first bad character.
 */
function readDigits(text: string, from: number, end: number, base: number, underscores: boolean): number[] | { at: number; message: string } {
  const digits: number[] = [];
  for (let i = from; i < end; i++) {
    const c = text.charCodeAt(i);
    if (underscores && c === 0x5f && digits.length > 0 && i + 1 < end && digitValue(text.charCodeAt(i + 1), base) >= 0) continue;
    const v = digitValue(c, base);
    if (v < 0) return { at: i, message: `"${text[i]}" is not a ${BASE_NAMES[base]} digit` };
    digits.push(v);
  }
  return digits;
}

/** `16#` / `2#` / other base prefix at `i`: the base and the prefix length, or undefined. */
function basePrefix(text: string, i: number): { base: number; length: number } | undefined {
  const m = /^(\d{1,2})#/.exec(text.slice(i, i + 3));
  return m ? { base: Number(m[1]), length: m[0].length } : undefined;
}

export function parseHex(text: string): Result<Uint8Array> {
  const out = new Uint8Array(text.length);
  let n = 0;
  let i = 0;
  const len = text.length;
  while (i < len) {
    const c = text.charCodeAt(i);
    if (isHexSeparator(c)) {
      i++;
      continue;
    }
    const groupStart = i;
    let end = i;
    while (end < len && !isHexSeparator(text.charCodeAt(end))) end++;
    const prefix = basePrefix(text, i);
    if (prefix) {
      if (prefix.base !== 16 && prefix.base !== 2) return failure(groupStart, `${prefix.base}# is not a byte form here; write hex as 16#0D or binary as 2#00001101`);
      i += prefix.length;
      if (i >= end) return failure(groupStart, `${prefix.base}# must be followed by digits`);
      const digits = readDigits(text, i, end, prefix.base, true);
      if (!Array.isArray(digits)) return failure(digits.at, `${digits.message}; write hex as 16#0D or binary as 2#00001101`);
      if (prefix.base === 2) {
        if (digits.length > 8 && digits.length % 8 !== 0) return failure(groupStart, 'A binary group is one byte (up to 8 digits) or whole bytes (a multiple of 8 digits)');
        const size = digits.length <= 8 ? digits.length : 8;
        for (let j = 0; j < digits.length; j += size) out[n++] = digits.slice(j, j + size).reduce((v, d) => v * 2 + d, 0);
        i = end;
        continue;
      }
      n = pushHexDigits(out, n, digits);
      if (n < 0) return failure(groupStart, 'Odd number of hex digits; write each byte as two digits (for example 16#0D)');
      i = end;
      continue;
    }
    if (c === 0x30 && (text.charCodeAt(i + 1) | 0x20) === 0x78) {
      i += 2;
      if (i >= len || hexValue(text.charCodeAt(i)) < 0) return failure(groupStart, '0x must be followed by hex digits');
    }
    const digitsStart = i;
    while (i < len && hexValue(text.charCodeAt(i)) >= 0) i++;
    const digitsEnd = i;
    // assembler suffix: 0Dh
    if (i < len && (text.charCodeAt(i) | 0x20) === 0x68 && digitsEnd > digitsStart && digitsStart === groupStart) i++;
    if (i < len && !isHexSeparator(text.charCodeAt(i))) {
      return failure(i, `"${text[i]}" is not a hex digit; use 0-9 and A-F, separated by spaces or commas`);
    }
    if (digitsEnd === digitsStart) return failure(groupStart, `"${text[groupStart]}" is not a hex digit; use 0-9 and A-F, separated by spaces or commas`);
    const digits: number[] = [];
    for (let j = digitsStart; j < digitsEnd; j++) digits.push(hexValue(text.charCodeAt(j)));
    n = pushHexDigits(out, n, digits);
    if (n < 0) return failure(groupStart, 'Odd number of hex digits; write each byte as two digits (for example 0D)');
  }
  return success(out.slice(0, n));
}

/** Appends the bytes of a hex digit group (one digit = one byte, else pairs); -1 for an odd count above one. */
function pushHexDigits(out: Uint8Array, n: number, digits: number[]): number {
  if (digits.length === 1) {
    out[n++] = digits[0]!;
    return n;
  }
  if (digits.length % 2 === 1) return -1;
  for (let j = 0; j < digits.length; j += 2) out[n++] = (digits[j]! << 4) | digits[j + 1]!;
  return n;
}

export function renderHex(bytes: Uint8Array): string {
  return renderWithTable(bytes, HEX_TABLE, ' ');
}

const DECIMAL = createRenderTable(Array.from({ length: 256 }, (_, b) => String(b)));

function isDecimalSeparator(c: number): boolean {
  return c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d || c === 0x2c || c === 0x3b;
}

export function parseDecimal(text: string): Result<Uint8Array> {
  const out = new Uint8Array((text.length >> 1) + 1);
  let n = 0;
  let i = 0;
  const len = text.length;
  while (i < len) {
    if (isDecimalSeparator(text.charCodeAt(i))) {
      i++;
      continue;
    }
    const start = i;
    while (i < len && !isDecimalSeparator(text.charCodeAt(i))) i++;
    const value = parseByteToken(text, start, i);
    if (typeof value !== 'number') return failure(value.at, value.message);
    out[n++] = value;
  }
  return success(out.slice(0, n));
}

const PLAIN_DECIMAL_HINT = 'write bytes as numbers 0-255 separated by spaces';

/** One byte written as a number: decimal, or marked hex/octal/binary (`16#0D`, `0x0D`, `0Dh`, `8#15`, `2#1101`, `0b1101`). */
function parseByteToken(text: string, start: number, end: number): number | { at: number; message: string } {
  let base = 10;
  let from = start;
  let to = end;
  let underscores = false;
  const prefix = basePrefix(text, start);
  const second = text.charCodeAt(start + 1) | 0x20;
  if (prefix) {
    if (prefix.base !== 16 && prefix.base !== 8 && prefix.base !== 2) return { at: start, message: `Base ${prefix.base}# is not supported; use 16#, 8# or 2#` };
    base = prefix.base;
    from = start + prefix.length;
    underscores = true;
  } else if (/^[0-9a-f]+h$/i.test(text.slice(start, end))) {
    base = 16;
    to = end - 1;
  } else if (text.charCodeAt(start) === 0x30 && (second === 0x78 || second === 0x62) && end - start >= 2) {
    base = second === 0x78 ? 16 : 2;
    from = start + 2;
  }
  if (from >= to) return { at: start, message: `A number is missing after ${text.slice(start, from)}; ${PLAIN_DECIMAL_HINT}` };
  const digits = readDigits(text, from, to, base, underscores);
  if (!Array.isArray(digits)) return { at: digits.at, message: base === 10 ? `"${text[digits.at]}" is not a decimal digit; ${PLAIN_DECIMAL_HINT}` : `${digits.message}; ${PLAIN_DECIMAL_HINT}` };
  let value = 0;
  for (const d of digits) {
    value = value * base + d;
    if (value > 255) return { at: start, message: 'Each decimal byte must be 0 to 255' };
  }
  return value;
}

export function renderDecimal(bytes: Uint8Array): string {
  return renderWithTable(bytes, DECIMAL, ' ');
}
