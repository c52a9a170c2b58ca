/**
 * Mnemonic notation: control characters by their RFC 20 names (RFC 20, section 4.1) in angle brackets.
 *
 * Input rules (names in either ASCII case):
 * - `<NUL>` ... `<US>` for 0x00-0x1F, `<DEL>` for 0x7F, `<SP>` accepted for 0x20, `<XON>` / `<XOFF>`
 *   accepted for DC1 / DC3 (software flow control); names are ASCII letters only (no Unicode case folding);
 * - `<xHH>` for any byte (two hex digits);
 * - any other printable ASCII stands for itself, including `>`; a literal `<` must be written `<x3C>`.
 *
 * Rendering: 0x00-0x1F and 0x7F by name, `<` as `<x3C>`, other printable ASCII as itself,
 * 0x80-0xFF as `<xHH>` in uppercase hex.
 */
import { HEX_PAIR, createRenderTable, hexValue, renderWithTable } from '../bytes';
import { type Result, failure, success } from '../result';
import { notPrintable } from './escaped';

/** RFC 20 section 4.1 names for 0x00-0x1F. */
export const CONTROL_NAMES = [
  'NUL', 'SOH', 'STX', 'ETX', 'EOT', 'ENQ', 'ACK', 'BEL', 'BS', 'HT', 'LF', 'VT', 'FF', 'CR', 'SO', 'SI',
  'DLE', 'DC1', 'DC2', 'DC3', 'DC4', 'NAK', 'SYN', 'ETB', 'CAN', 'EM', 'SUB', 'ESC', 'FS', 'GS', 'RS', 'US',
] as const;

const BY_NAME = new Map<string, number>(CONTROL_NAMES.map((name, i) => [name, i]));
BY_NAME.set('DEL', 0x7f);
BY_NAME.set('SP', 0x20);
// software flow control: XON is DC1, XOFF is DC3 (common practice)
BY_NAME.set('XON', 0x11);
BY_NAME.set('XOFF', 0x13);

/** Longest text between `<` and `>`: XOFF. */
const MAX_NAME = 4;

/** ASCII letters to upper case; any other character (ſ, ı, ﬀ, K) stays as it is, so it matches no name. */
const asciiUpper = (text: string) => text.replace(/[a-z]/g, (c) => String.fromCharCode(c.charCodeAt(0) - 32));

const RENDER = createRenderTable(Array.from({ length: 256 }, (_, b) => {
  if (b < 0x20) return `<${CONTROL_NAMES[b]}>`;
  if (b === 0x7f) return '<DEL>';
  if (b === 0x3c) return '<x3C>';
  if (b < 0x7f) return String.fromCharCode(b);
  return `<x${HEX_PAIR[b]}>`;
}));

export function parseMnemonic(text: string): Result<Uint8Array> {
  const out = new Uint8Array(text.length);
  let n = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c !== 0x3c) {
      if (c < 0x20 || c > 0x7e) return failure(i, notPrintable(c));
      out[n++] = c;
      continue;
    }
    const close = text.indexOf('>', i + 1);
    if (close < 0 || close - i > MAX_NAME + 1) {
      return failure(i, '< starts a name such as <CR>; close it with >, or write a literal < as <x3C>');
    }
    const name = asciiUpper(text.slice(i + 1, close));
    const named = BY_NAME.get(name);
    if (named !== undefined) {
      out[n++] = named;
    } else if (name.length === 3 && name[0] === 'X' && hexValue(name.charCodeAt(1)) >= 0 && hexValue(name.charCodeAt(2)) >= 0) {
      out[n++] = (hexValue(name.charCodeAt(1)) << 4) | hexValue(name.charCodeAt(2));
    } else {
      return failure(i, `Unknown name <${text.slice(i + 1, close)}>; use a control name such as <CR>, or <xHH>`);
    }
    i = close;
  }
  return success(out.slice(0, n));
}

export function renderMnemonic(bytes: Uint8Array): string {
  return renderWithTable(bytes, RENDER);
}
