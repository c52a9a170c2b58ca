/** Byte helpers shared by the notations; table-driven so rendering stays fast on large inputs. */

const HEX_DIGITS = '0123456789ABCDEF';

/** `HEX_PAIR[b]` is the two-digit uppercase hex of byte b. */
export const HEX_PAIR: readonly string[] = Array.from(
  { length: 256 },
  (_, b) => HEX_DIGITS[b >> 4]! + HEX_DIGITS[b & 15]!,
);

/** Value of a hex digit character code, or -1. Accepts both cases. */
export function hexValue(code: number): number {
  if (code >= 48 && code <= 57) return code - 48;
  if (code >= 65 && code <= 70) return code - 55;
  if (code >= 97 && code <= 102) return code - 87;
  return -1;
}

/** A 256-entry table of ASCII strings (one per byte value), pre-encoded for `renderWithTable`. */
export interface RenderTable {
  strings: readonly string[];
  /** Character codes, STRIDE per byte value. */
  codes: Uint8Array;
  lengths: Uint8Array;
  maxLength: number;
}

const STRIDE = 8;

export function createRenderTable(strings: readonly string[]): RenderTable {
  const codes = new Uint8Array(256 * STRIDE);
  const lengths = new Uint8Array(256);
  let maxLength = 0;
  for (let b = 0; b < 256; b++) {
    const t = strings[b]!;
    lengths[b] = t.length;
    maxLength = Math.max(maxLength, t.length);
    for (let j = 0; j < t.length; j++) codes[b * STRIDE + j] = t.charCodeAt(j);
  }
  return { strings, codes, lengths, maxLength };
}

/** Uppercase hex pairs as a render table. */
export const HEX_TABLE = createRenderTable(HEX_PAIR);

const decoder = new TextDecoder();
let scratch = new Uint8Array(4096);

/**
 * Joins the table string of each byte, with an optional one-character separator. The characters go
 * into one reused byte buffer that is decoded once: no per-byte string concatenation.
 */
export function renderWithTable(bytes: Uint8Array, table: RenderTable, separator = ''): string {
  const n = bytes.length;
  if (n === 0) return '';
  const sep = separator.length ? separator.charCodeAt(0) : -1;
  const need = n * (table.maxLength + 1);
  if (scratch.length < need) scratch = new Uint8Array(Math.max(need, scratch.length * 2));
  const out = scratch;
  const { codes, lengths } = table;
  let at = 0;
  for (let i = 0; i < n; i++) {
    if (sep >= 0 && i > 0) out[at++] = sep;
    const b = bytes[i]!;
    const len = lengths[b]!;
    const o = b * STRIDE;
    out[at++] = codes[o]!;
    for (let j = 1; j < len; j++) out[at++] = codes[o + j]!;
  }
  return decoder.decode(out.subarray(0, at));
}

/**
 * Like `renderWithTable` (no separator), but each byte takes its string from `tables[pick(bytes, i)]`,
 * for notations where a byte's rendering depends on its neighbours.
 */
export function renderWithChoice(bytes: Uint8Array, tables: readonly RenderTable[], pick: (bytes: Uint8Array, i: number) => number): string {
  const n = bytes.length;
  if (n === 0) return '';
  const need = n * Math.max(...tables.map((t) => t.maxLength));
  if (scratch.length < need) scratch = new Uint8Array(Math.max(need, scratch.length * 2));
  const out = scratch;
  const allCodes = tables.map((t) => t.codes);
  const allLengths = tables.map((t) => t.lengths);
  let at = 0;
  for (let i = 0; i < n; i++) {
    const k = pick(bytes, i);
    const codes = allCodes[k]!;
    const lengths = allLengths[k]!;
    const b = bytes[i]!;
    const len = lengths[b]!;
    const o = b * STRIDE;
    for (let j = 0; j < len; j++) out[at++] = codes[o + j]!;
  }
  return decoder.decode(out.subarray(0, at));
}

/** Uppercase hex, one pair per byte, space-separated: `0D 0A`. */
export function toHex(bytes: Uint8Array, separator = ' '): string {
  return renderWithTable(bytes, HEX_TABLE, separator);
}


/** Byte values of a string whose characters are all 0x00-0xFF (Latin-1); -1 marks the first wider character. */
export function latin1Bytes(text: string): Uint8Array | number {
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c > 0xff) return i;
    out[i] = c;
  }
  return out;
}

/** The characters for bytes 0x00-0xFF (Latin-1), chunked so large arrays do not overflow the call stack. */
export function bytesToLatin1(bytes: Uint8Array): string {
  return codesToString(bytes);
}

function codesToString(codes: Uint8Array): string {
  if (codes.length <= 8192) return String.fromCharCode.apply(null, codes as unknown as number[]);
  const parts: string[] = [];
  for (let at = 0; at < codes.length; at += 8192) {
    parts.push(String.fromCharCode.apply(null, codes.subarray(at, at + 8192) as unknown as number[]));
  }
  return parts.join('');
}

/** Index of `needle` in `hay` at or after `from`, limited to before `end`; -1 if absent. */
export function indexOfBytes(hay: Uint8Array, needle: Uint8Array, from = 0, end = hay.length): number {
  if (needle.length === 0) return -1;
  const first = needle[0]!;
  const last = end - needle.length;
  outer: for (let i = from; i <= last; i++) {
    if (hay[i] !== first) continue;
    for (let j = 1; j < needle.length; j++) if (hay[i + j] !== needle[j]) continue outer;
    return i;
  }
  return -1;
}

/** True when `a` holds exactly the bytes of `b` starting at `at`. */
export function bytesAt(a: Uint8Array, b: Uint8Array, at: number): boolean {
  if (at < 0 || at + b.length > a.length) return false;
  for (let i = 0; i < b.length; i++) if (a[at + i] !== b[i]) return false;
  return true;
}

/** A growable byte buffer for assembling frames without intermediate arrays. */
export class ByteWriter {
  private buf: Uint8Array;
  length = 0;
  constructor(capacity = 64) {
    this.buf = new Uint8Array(capacity);
  }
  /** Empties the buffer, keeping its memory for the next frame. */
  reset(): void {
    this.length = 0;
  }
  private reserve(n: number): void {
    if (this.length + n <= this.buf.length) return;
    let size = this.buf.length * 2;
    while (size < this.length + n) size *= 2;
    const next = new Uint8Array(size);
    next.set(this.buf.subarray(0, this.length));
    this.buf = next;
  }
  push(byte: number): void {
    this.reserve(1);
    this.buf[this.length++] = byte;
  }
  pushBytes(bytes: Uint8Array): void {
    this.reserve(bytes.length);
    this.buf.set(bytes, this.length);
    this.length += bytes.length;
  }
  /** Appends the low byte of each character code (callers pass ASCII). */
  pushAscii(text: string): void {
    this.reserve(text.length);
    for (let i = 0; i < text.length; i++) this.buf[this.length++] = text.charCodeAt(i) & 0xff;
  }
  view(): Uint8Array {
    return this.buf.subarray(0, this.length);
  }
  toBytes(): Uint8Array {
    return this.buf.slice(0, this.length);
  }
}
