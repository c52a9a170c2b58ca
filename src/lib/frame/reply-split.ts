/**
 * Where each segment of a reply template lies in the received bytes. A field whose length varies is
 * tried at each length it could have (numbers longest first, text shortest first, choices by their
 * options) until every later segment fits and the template ends exactly at the last byte.
 */
import { segmentBytes } from './assemble';
import { bytesAt } from './bytes';
import { checksumLength, checksumOfRange, placeChecksum, resolveChecksum } from './checksum';
import { readNumber } from './field-format';
import type { ChecksumSegment, Segment } from './template';

/** A split of the reply: segment i covers bytes [starts[i], ends[i]). */
export interface ReplySplit {
  starts: number[];
  ends: number[];
}

/** Characters of a number field on the wire: digits, sign, point, and the space of space padding. */
export function isNumberChar(b: number): boolean {
  return (b >= 0x30 && b <= 0x39) || b === 0x2b || b === 0x2d || b === 0x2e || b === 0x20;
}

/** Bytes a segment always occupies, or undefined when its length depends on the value. */
export function fixedLength(s: Segment): number | undefined {
  if (s.type === 'literal' || s.type === 'terminator') return segmentBytes(s).length;
  if (s.type === 'checksum') {
    const a = resolveChecksum(s);
    return a ? checksumLength(a.width, s.encoding) : 0;
  }
  if ((s.type === 'integer' || s.type === 'decimal') && s.width !== undefined) return Number.isInteger(s.width) && s.width >= 0 ? s.width : undefined;
  if (s.type === 'choice') {
    if (s.options.length === 0) return undefined;
    const n = s.options[0]!.send.length;
    return s.options.every((o) => o.send.length === n) ? n : undefined;
  }
  return undefined;
}

/** Byte range [start, end) a checksum covers, given where the segments before it lie. */
export function checksumRangeAt(segment: ChecksumSegment, starts: readonly number[], ends: readonly number[], checksumStart: number): [number, number] {
  const { from, to } = segment.range;
  const start = from === 'start' ? 0 : (starts[from] ?? 0);
  const end = to === 'checksum' ? checksumStart : (ends[to] ?? checksumStart);
  return [start, Math.max(start, end)];
}

const latin1 = (bytes: Uint8Array, from: number, to: number) => String.fromCharCode(...bytes.subarray(from, to));

/** End positions a segment starting at `pos` could have, lazily, in the order they are tried. */
function* candidates(s: Segment, bytes: Uint8Array, pos: number, strict: boolean): Generator<number> {
  const n = bytes.length;
  if (s.type === 'literal' || s.type === 'terminator') {
    const want = segmentBytes(s);
    if (bytesAt(bytes, want, pos)) yield pos + want.length;
  } else if (s.type === 'checksum') {
    const len = fixedLength(s)!;
    if (pos + len <= n) yield pos + len;
  } else if (s.type === 'integer' || s.type === 'decimal') {
    const decimal = s.type === 'decimal';
    const width = fixedLength(s);
    if (width !== undefined) {
      const end = pos + width;
      if (end <= n && (!strict || readNumber(latin1(bytes, pos, end), decimal))) yield end;
      return;
    }
    let run = pos;
    while (run < n && run - pos < MAX_NUMBER_RUN && isNumberChar(bytes[run]!)) run++;
    for (let end = run; end > pos; end--) if (readNumber(latin1(bytes, pos, end), decimal)) yield end;
  } else if (s.type === 'choice') {
    const lengths = s.options.filter((o) => bytesAt(bytes, latin1Codes(o.send), pos)).map((o) => o.send.length);
    for (const len of [...new Set(lengths)].sort((a, b) => b - a)) yield pos + len;
  } else {
    const limit = Math.min(n, pos + (s.maxLength ?? n));
    yield pos;
    for (let end = pos + 1; end <= limit; end++) {
      if (s.allowed !== undefined && !s.allowed.includes(String.fromCharCode(bytes[end - 1]!))) return;
      yield end;
    }
  }
}

/** Longest run of number characters tried for a number without a width. */
const MAX_NUMBER_RUN = 400;

const latin1Codes = (text: string) => Uint8Array.from(text, (c) => c.charCodeAt(0) & 0xff);

/** Candidate tries before the search gives up and the caller falls back to a plain left-to-right read. */
const BUDGET = 20_000;

/**
 * The split that reads the whole reply with every segment in place, or null. `strict`: fixed-width
 * numbers must be readable and every checksum must verify (so a checksum also tells where a field
 * ends); otherwise checksums only take their place, so a corrupted one can be reported.
 */
export function splitReply(segs: readonly Segment[], bytes: Uint8Array, strict: boolean): ReplySplit | null {
  const starts: number[] = new Array(segs.length).fill(0);
  const ends: number[] = new Array(segs.length).fill(0);
  // Without checksum checks the outcome at (segment, position) never depends on the path there.
  const failed = strict ? null : new Set<number>();
  let tries = 0;
  const walk = (index: number, pos: number): boolean | null => {
    if (index === segs.length) return pos === bytes.length;
    const key = index * (bytes.length + 1) + pos;
    if (failed?.has(key)) return false;
    const s = segs[index]!;
    for (const end of candidates(s, bytes, pos, strict)) {
      if (++tries > BUDGET) return null;
      starts[index] = pos;
      ends[index] = end;
      if (strict && s.type === 'checksum') {
        const a = resolveChecksum(s);
        if (a) {
          const [from, to] = checksumRangeAt(s, starts, ends, pos);
          if (!bytesAt(bytes, placeChecksum(checksumOfRange(a, s.over, bytes, from, to).value, a.width, s), pos)) continue;
        }
      }
      const r = walk(index + 1, end);
      if (r !== false) return r;
    }
    failed?.add(key);
    return false;
  };
  return walk(0, 0) ? { starts, ends } : null;
}
