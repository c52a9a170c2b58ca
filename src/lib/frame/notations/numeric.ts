/**
 * Hex and decimal notations.
 *
 * Hex input: bytes as hex digit pairs in either case, with or without a `0x` prefix, separated by any
 * mix of spaces, tabs, line breaks, commas, semicolons, colons or dashes, or not separated at all:
 * `0D 0A`, `0x0D,0x0A`, `0d0a` and `0D:0a` are all the same two bytes. A group with one digit (`D`, `0xD`)
 * is one byte; a group with an odd number of digits above one is an error because it cannot be split.
 * Hex rendering: uppercase pairs separated by one space.
 *
 * Decimal input: numbers 0-255 separated by spaces, tabs, line breaks, commas or semicolons.
 * Decimal rendering: numbers separated by one space.
 */
import { HEX_TABLE, createRenderTable, hexValue, renderWithTable } from '../bytes';
import { type Result, failure, success } from '../result';

function isHexSeparator(c: number): boolean {
  return c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d || c === 0x2c || c === 0x3b || c === 0x3a || c === 0x2d;
}

export function parseHex(text: string): Result<Uint8Array> {
  const out = new Uint8Array((text.length + 1) >> 1);
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
    if (c === 0x30 && (text.charCodeAt(i + 1) | 0x20) === 0x78) {
      i += 2;
      if (i >= len || hexValue(text.charCodeAt(i)) < 0) return failure(groupStart, '0x must be followed by hex digits');
    }
    const digitsStart = i;
    while (i < len && hexValue(text.charCodeAt(i)) >= 0) i++;
    const count = i - digitsStart;
    if (i < len && !isHexSeparator(text.charCodeAt(i))) {
      return failure(i, `"${text[i]}" is not a hex digit; use 0-9 and A-F, separated by spaces or commas`);
    }
    if (count === 1) {
      out[n++] = hexValue(text.charCodeAt(digitsStart));
    } else if (count % 2 === 1) {
      return failure(groupStart, 'Odd number of hex digits; write each byte as two digits (for example 0D)');
    } else {
      for (let j = digitsStart; j < i; j += 2) {
        out[n++] = (hexValue(text.charCodeAt(j)) << 4) | hexValue(text.charCodeAt(j + 1));
      }
    }
  }
  return success(out.slice(0, n));
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
    const c = text.charCodeAt(i);
    if (isDecimalSeparator(c)) {
      i++;
      continue;
    }
    const start = i;
    let value = 0;
    while (i < len) {
      const d = text.charCodeAt(i);
      if (d < 0x30 || d > 0x39) break;
      value = value * 10 + (d - 0x30);
      if (value > 255) return failure(start, 'Each decimal byte must be 0 to 255');
      i++;
    }
    if (i < len && !isDecimalSeparator(text.charCodeAt(i))) {
      return failure(i, `"${text[i]}" is not a decimal digit; write bytes as numbers 0-255 separated by spaces`);
    }
    out[n++] = value;
  }
  return success(out.slice(0, n));
}

export function renderDecimal(bytes: Uint8Array): string {
  return renderWithTable(bytes, DECIMAL, ' ');
}
