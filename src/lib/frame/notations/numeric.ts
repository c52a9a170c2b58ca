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

type Bad = { at: number; message: string };
const bad = (at: number, message: string): Bad => ({ at, message });
const BASE_NAMES: Record<number, string> = { 2: 'binary', 8: 'octal', 10: 'decimal', 16: 'hex' };

/**
 * Digit values of `g` from `from` to `to` in `base`; with `iec`, a `_` between two digits is skipped
 * (IEC 61131-3 literals). An offending character or missing digits give its offset in the group.
 */
function digitsOf(g: string, from: number, to: number, base: number, iec: boolean): number[] | Bad {
  const out: number[] = [];
  const value = (i: number) => {
    const v = hexValue(g.charCodeAt(i));
    return v < base ? v : -1;
  };
  for (let i = from; i < to; i++) {
    const v = value(i);
    if (v >= 0) out.push(v);
    else if (!(iec && g[i] === '_' && out.length && i + 1 < to && value(i + 1) >= 0)) return bad(i, `"${g[i]}" is not a ${BASE_NAMES[base]} digit`);
  }
  return out.length ? out : bad(0, `${g.slice(0, from) || 'A group'} must be followed by digits`);
}

/** `16#`, `2#`, `8#` …: the base and the prefix length. */
const basePrefix = (g: string) => /^(\d{1,2})#/.exec(g);

/** Bytes of one hex group: `0D0A`, `0x0D`, `0Dh`, `16#0D_0A`, `2#00001101`. */
function hexGroup(g: string): number[] | Bad {
  const prefix = basePrefix(g);
  const suffix = /^[0-9a-f]+h/i.exec(g);
  let base = 16;
  let from = 0;
  let to = g.length;
  if (prefix) {
    base = Number(prefix[1]);
    if (base !== 16 && base !== 2) return bad(0, `${base}# is not a byte form here; write hex as 16#0D or binary as 2#00001101`);
    from = prefix[0].length;
  } else if (/^0x/i.test(g)) from = 2;
  else if (suffix) to = suffix[0].length - 1;
  const d = digitsOf(g, from, to, base, !!prefix);
  if (!Array.isArray(d)) return d;
  if (to + 1 < g.length) return bad(to + 1, `"${g[to + 1]}" is not a hex digit`);
  if (base === 2) {
    if (d.length > 8 && d.length % 8) return bad(0, 'A binary group is one byte (up to 8 digits) or whole bytes (a multiple of 8 digits)');
    const size = Math.min(8, d.length);
    const out: number[] = [];
    for (let j = 0; j < d.length; j += size) out.push(d.slice(j, j + size).reduce((v, x) => v * 2 + x, 0));
    return out;
  }
  if (d.length === 1) return d;
  if (d.length % 2) return bad(0, 'Odd number of hex digits; write each byte as two digits (for example 0D)');
  const out: number[] = [];
  for (let j = 0; j < d.length; j += 2) out.push(d[j]! * 16 + d[j + 1]!);
  return out;
}

const DECIMAL_HINT = '; write bytes as numbers 0-255 separated by spaces';

/** One byte of the decimal notation: `13`, or marked `16#0D`, `0x0D`, `0Dh`, `8#15`, `2#1101`, `0b1101`. */
function decimalGroup(g: string): number[] | Bad {
  const prefix = basePrefix(g);
  let base = 10;
  let from = 0;
  let to = g.length;
  if (prefix) {
    base = Number(prefix[1]);
    if (base !== 16 && base !== 8 && base !== 2) return bad(0, `Base ${base}# is not supported; use 16#, 8# or 2#`);
    from = prefix[0].length;
  } else if (/^[0-9a-f]+h$/i.test(g)) {
    base = 16;
    to--;
  } else if (/^0[xb]/i.test(g)) {
    base = /^0x/i.test(g) ? 16 : 2;
    from = 2;
  }
  const d = digitsOf(g, from, to, base, !!prefix);
  if (!Array.isArray(d)) return bad(d.at, d.message + DECIMAL_HINT);
  let value = 0;
  for (const x of d) {
    value = value * base + x;
    if (value > 255) return bad(0, 'Each decimal byte must be 0 to 255');
  }
  return [value];
}

/** Bytes of text split into groups by `groups` (a global pattern of the non-separator runs). */
function parseGroups(text: string, groups: RegExp, read: (g: string) => number[] | Bad): Result<Uint8Array> {
  const out: number[] = [];
  groups.lastIndex = 0;
  for (let m = groups.exec(text); m; m = groups.exec(text)) {
    const r = read(m[0]);
    if (!Array.isArray(r)) return failure(m.index + r.at, r.message);
    for (const b of r) out.push(b);
  }
  return success(Uint8Array.from(out));
}

/** Hex groups are separated by spaces, tabs, line breaks, commas, semicolons, colons or dashes. */
export function parseHex(text: string): Result<Uint8Array> {
  return parseGroups(text, /[^ \t\n\r,;:-]+/g, hexGroup);
}

export function renderHex(bytes: Uint8Array): string {
  return renderWithTable(bytes, HEX_TABLE, ' ');
}

const DECIMAL = createRenderTable(Array.from({ length: 256 }, (_, b) => String(b)));

/** Decimal bytes are separated by spaces, tabs, line breaks, commas or semicolons. */
export function parseDecimal(text: string): Result<Uint8Array> {
  return parseGroups(text, /[^ \t\n\r,;]+/g, decimalGroup);
}

export function renderDecimal(bytes: Uint8Array): string {
  return renderWithTable(bytes, DECIMAL, ' ');
}
