/** Small conversions between typed text, hex text and labels, for the segment editor and the byte cells. */
import { toHex } from '../frame/bytes';
import { CONTROL_NAMES } from '../frame/notations/mnemonic';
import { hexBytes } from '../frame/schema-common';

/** Hex text for literal text (each character one byte; characters above 0xFF are dropped). */
export function hexOfText(text: string): string {
  const codes = [...text].map((c) => c.charCodeAt(0)).filter((c) => c <= 0xff);
  return toHex(Uint8Array.from(codes));
}

/** What a byte looks like in a cell: the character, its RFC 20 name, or `xHH`. */
export function byteGlyph(b: number): string {
  if (b < 0x20) return CONTROL_NAMES[b]!;
  if (b === 0x20) return 'SP';
  if (b === 0x7f) return 'DEL';
  if (b > 0x7f) return `x${b.toString(16).toUpperCase()}`;
  return String.fromCharCode(b);
}

/** Readable label for literal bytes: printable runs as text, controls as `<NAME>`. */
export function labelOfBytes(hex: string): string {
  let out = '';
  for (const b of hexBytes(hex)) out += b > 0x20 && b < 0x7f ? String.fromCharCode(b) : b === 0x20 ? ' ' : `<${byteGlyph(b)}>`;
  return out;
}

/** Text for editing a literal: printable characters as themselves, or null if any byte is not printable. */
export function textOfHex(hex: string): string | null {
  let out = '';
  for (const b of hexBytes(hex)) {
    if (b < 0x20 || b > 0x7e) return null;
    out += String.fromCharCode(b);
  }
  return out;
}

/** Control characters offered in the picker: 0x00-0x1F and DEL, with their RFC 20 names. */
export const CONTROL_CHOICES: { code: number; name: string; hex: string }[] = [
  ...CONTROL_NAMES.map((name, code) => ({ code, name, hex: code.toString(16).toUpperCase().padStart(2, '0') })),
  { code: 0x7f, name: 'DEL', hex: '7F' },
];
