/**
 * Escaped notation: C string-literal escapes (ISO/IEC 9899, 6.4.4.4 "Character constants").
 *
 * Input rules:
 * - printable ASCII 0x20-0x7E other than `\` stands for itself;
 * - `\r` 0D, `\n` 0A, `\t` 09, `\\` 5C, and the other simple escapes of 6.4.4.4
 *   (`\a` 07, `\b` 08, `\f` 0C, `\v` 0B, `\'`, `\"`, `\?`); `\e` 1B (ESC, a common compiler extension);
 * - `\xHH` takes exactly two hex digits (either case); C reads hex digits greedily, this notation does not;
 * - octal escapes as in C: `\` followed by one to three octal digits, so `\0` is NUL, `\000` is NUL,
 *   and `\012` is 0A, exactly as a C compiler reads them; values above `\377` are an error;
 * - any other character (a real line break, a non-ASCII letter) is an error: write it as `\xHH`.
 *
 * Rendering, made so that a C compiler reads the text inside "..." back as exactly these bytes:
 * printable ASCII as itself, `\` as `\\`, `"` as `\"`, CR/LF/TAB as `\r \n \t`, NUL as `\0`, every
 * other byte as `\xHH` (uppercase). Where C would read on into the next character, the escape takes the
 * three-digit octal form instead: `\xHH` before a hex digit (01 41 → `\001A`, since C reads `\x01A` as
 * one byte) and `\0` before an octal digit (NUL then `1` → `\0001`). A `?` after a `?` is written `\?`
 * so no trigraph (`??=`, `??/`, ...) can form.
 */
import { HEX_PAIR, createRenderTable, hexValue, renderWithChoice, renderWithTable } from '../bytes';
import { type Result, failure, success } from '../result';

const NORMAL = Array.from({ length: 256 }, (_, b) => {
  if (b === 0x5c) return '\\\\';
  if (b === 0x22) return '\\"';
  if (b >= 0x20 && b <= 0x7e) return String.fromCharCode(b);
  if (b === 0x0d) return '\\r';
  if (b === 0x0a) return '\\n';
  if (b === 0x09) return '\\t';
  if (b === 0x00) return '\\0';
  return '\\x' + HEX_PAIR[b];
});
const RENDER = createRenderTable(NORMAL);
/** The context forms: three-digit octal for numeric escapes, `\?` for a question mark. */
const CONTEXT = createRenderTable(NORMAL.map((s, b) => (b === 0x3f ? '\\?' : s.startsWith('\\x') || b === 0 ? '\\' + b.toString(8).padStart(3, '0') : s)));
const TABLES = [RENDER, CONTEXT];

const isHexDigit = (b: number | undefined) => b !== undefined && hexValue(b) >= 0;
const isOctalDigit = (b: number | undefined) => b !== undefined && b >= 0x30 && b <= 0x37;

/** 1 where byte i needs its context form. */
function pick(bytes: Uint8Array, i: number): number {
  const b = bytes[i]!;
  if (b >= 0x20 && b <= 0x7e) return b === 0x3f && i > 0 && bytes[i - 1] === 0x3f ? 1 : 0;
  if (b === 0) return isOctalDigit(bytes[i + 1]) ? 1 : 0;
  if (b === 0x0d || b === 0x0a || b === 0x09) return 0;
  return isHexDigit(bytes[i + 1]) ? 1 : 0;
}

const SIMPLE: Record<string, number> = {
  r: 0x0d, n: 0x0a, t: 0x09, '\\': 0x5c, a: 0x07, b: 0x08, f: 0x0c, v: 0x0b, "'": 0x27, '"': 0x22, '?': 0x3f, e: 0x1b,
};
const SIMPLE_CODES = new Int16Array(128).fill(-1);
for (const [k, v] of Object.entries(SIMPLE)) SIMPLE_CODES[k.charCodeAt(0)] = v;

/** Bytes written in escaped notation. Errors carry the offset of the offending character or escape. */
export function parseEscaped(text: string): Result<Uint8Array> {
  const out = new Uint8Array(text.length);
  let n = 0;
  const len = text.length;
  for (let i = 0; i < len; i++) {
    const c = text.charCodeAt(i);
    if (c !== 0x5c) {
      if (c < 0x20 || c > 0x7e) return failure(i, notPrintable(c));
      out[n++] = c;
      continue;
    }
    if (i + 1 >= len) return failure(i, 'A backslash must be followed by an escape such as \\r; write \\\\ for a backslash');
    const e = text.charCodeAt(i + 1);
    if (e === 0x78) {
      const hi = i + 2 < len ? hexValue(text.charCodeAt(i + 2)) : -1;
      const lo = i + 3 < len ? hexValue(text.charCodeAt(i + 3)) : -1;
      if (hi < 0 || lo < 0) return failure(i, '\\x needs two hex digits');
      out[n++] = (hi << 4) | lo;
      i += 3;
    } else if (e >= 0x30 && e <= 0x37) {
      let value = e - 0x30;
      let j = i + 2;
      while (j < len && j < i + 4) {
        const d = text.charCodeAt(j);
        if (d < 0x30 || d > 0x37) break;
        value = value * 8 + (d - 0x30);
        j++;
      }
      if (value > 0xff) return failure(i, 'Octal escape is above \\377 (255); use \\xHH for one byte');
      out[n++] = value;
      i = j - 1;
    } else {
      const v = e < 128 ? SIMPLE_CODES[e]! : -1;
      if (v < 0) {
        return failure(i, `Unknown escape \\${text[i + 1]}; use \\r \\n \\t \\0 \\\\ or \\xHH`);
      }
      out[n++] = v;
      i += 1;
    }
  }
  return success(out.slice(0, n));
}

/** Escaped notation of bytes; `parseEscaped(renderEscaped(b))` returns b, and so does a C compiler. */
export function renderEscaped(bytes: Uint8Array): string {
  for (let i = 0; i < bytes.length; i++) if (pick(bytes, i)) return renderWithChoice(bytes, TABLES, pick);
  return renderWithTable(bytes, RENDER);
}

export function notPrintable(code: number): string {
  const hex = code.toString(16).toUpperCase().padStart(4, '0');
  return `Character U+${hex} is not printable ASCII; write the byte as an escape`;
}
