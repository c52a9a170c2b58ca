/**
 * PLC string notation: single-byte character string literals of IEC 61131-3 (Annex B, character
 * string literals; "$" escapes).
 *
 * Input rules (letters after `$` in either case):
 * - `$$` 24, `$'` 27, `$L` 0A, `$N` 0A (newline, same byte as `$L`), `$P` 0C, `$R` 0D, `$T` 09;
 * - `$hh` two hex digits, any byte;
 * - printable ASCII other than `$` and `'` stands for itself; a bare `'` is an error (write `$'`);
 * - the text may be wrapped in single quotes (`'A$0D'`); the quotes are removed, positions still count them.
 *
 * Rendering: printable ASCII as itself, `$` as `$$`, `'` as `$'`, every other byte (CR, LF, controls,
 * 0x7F-0xFF) as `$hh` in uppercase hex, so a carriage return shows as `$0D`. `renderIecLiteral` adds the quotes.
 */
import { HEX_PAIR, createRenderTable, hexValue, renderWithTable } from '../bytes';
import { type Result, failure, success } from '../result';
import { notPrintable } from './escaped';

const RENDER = createRenderTable(Array.from({ length: 256 }, (_, b) => {
  if (b === 0x24) return '$$';
  if (b === 0x27) return "$'";
  if (b >= 0x20 && b <= 0x7e) return String.fromCharCode(b);
  return '$' + HEX_PAIR[b];
}));

const NAMED: Record<string, number> = { $: 0x24, "'": 0x27, L: 0x0a, N: 0x0a, P: 0x0c, R: 0x0d, T: 0x09 };

/** Bytes of a PLC string body or quoted literal. */
export function parseIec(text: string): Result<Uint8Array> {
  let from = 0;
  let to = text.length;
  if (text.length >= 2 && text.charCodeAt(0) === 0x27 && text.charCodeAt(text.length - 1) === 0x27) {
    from = 1;
    to = text.length - 1;
  }
  const out = new Uint8Array(to - from);
  let n = 0;
  for (let i = from; i < to; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x27) return failure(i, "A single quote inside a PLC string is written $'");
    if (c !== 0x24) {
      if (c < 0x20 || c > 0x7e) return failure(i, notPrintable(c));
      out[n++] = c;
      continue;
    }
    if (i + 1 >= to) return failure(i, '$ must be followed by R, L, N, P, T, $, \' or two hex digits; write $$ for a dollar sign');
    const hi = hexValue(text.charCodeAt(i + 1));
    if (hi >= 0) {
      const lo = i + 2 < to ? hexValue(text.charCodeAt(i + 2)) : -1;
      if (lo < 0) return failure(i, '$ needs two hex digits (for example $0D)');
      out[n++] = (hi << 4) | lo;
      i += 2;
      continue;
    }
    const e = text.charCodeAt(i + 1);
    // ASCII letters only: Unicode case mapping would turn other characters into escape letters
    const named = e < 0x80 ? NAMED[String.fromCharCode(e >= 0x61 && e <= 0x7a ? e - 32 : e)] : undefined;
    if (named === undefined) {
      return failure(i, `Unknown escape $${text[i + 1]}; use $R $L $N $P $T $$ $' or $hh`);
    }
    out[n++] = named;
    i += 1;
  }
  return success(out.slice(0, n));
}

/** PLC string body without quotes, e.g. `MOVE 10$0D`. */
export function renderIec(bytes: Uint8Array): string {
  return renderWithTable(bytes, RENDER);
}

/** Quoted PLC string literal ready to paste into a program, e.g. `'MOVE 10$0D'`. */
export function renderIecLiteral(bytes: Uint8Array): string {
  return "'" + renderIec(bytes) + "'";
}
