/** Reads a received reply against a reply template: field values, checksum verdicts, and mismatches. */
import { HEX_PAIR, bytesAt, bytesToLatin1, indexOfBytes, toHex } from './bytes';
import { type SegmentSpan, notHexFinding, segmentBytes } from './assemble';
import { checksumLength, checksumOfRange, formatChecksumValue, placeChecksum, resolveChecksum } from './checksum';
import { engineeringExact, readNumber, toNumber } from './field-format';
import { type Finding, isClean } from './findings';
import { type ReplySplit, checksumRangeAt, fixedLength, isNumberChar, splitReply } from './reply-split';
import type { ChecksumSegment, Segment, Template } from './template';

export interface DecodedField {
  /** Characters received for the field. */
  text: string;
  /** Raw value read from the text (number for numeric fields, text for text/choice). */
  raw?: number | string;
  /** Engineering value: raw with the scaling inverted, or the choice's value key. */
  value?: number | string;
  range: [number, number];
}

export interface ChecksumVerdict {
  segmentId: string;
  algorithm: string;
  expected: number;
  /** Value read from the reply, or null when its characters are not a number. */
  received: number | null;
  ok: boolean;
  range: [number, number];
}

export interface DecodedReply {
  ok: boolean;
  fields: Record<string, DecodedField>;
  checksums: ChecksumVerdict[];
  segments: SegmentSpan[];
  findings: Finding[];
}

function readReceivedChecksum(bytes: Uint8Array, seg: ChecksumSegment, width: number): number | null {
  const n = Math.ceil(width / 8);
  if (seg.encoding === 'binary') {
    let v = 0;
    for (let i = 0; i < n; i++) {
      const b = bytes[seg.byteOrder === 'high-first' ? i : n - 1 - i]!;
      v = v * 256 + b;
    }
    return v;
  }
  const text = bytesToLatin1(bytes);
  if (seg.encoding === 'ascii-decimal') return /^\d+$/.test(text) ? Number(text) : null;
  if (!/^[0-9a-f]+$/i.test(text)) return null;
  const pairs = text.match(/../g)!;
  if (seg.byteOrder === 'low-first') pairs.reverse();
  return parseInt(pairs.join(''), 16);
}

/**
 * Where the segments lie when no split reads the whole reply (a malformed reply): left to right, each
 * segment where it would be, so the findings can say what went wrong where. `shortAt` is the first
 * segment the reply ran out in.
 */
function walkReply(segs: readonly Segment[], bytes: Uint8Array): ReplySplit & { shortAt: number } {
  const n = bytes.length;
  const starts: number[] = [];
  const ends: number[] = [];
  let shortAt = segs.length;
  let pos = 0;
  for (let index = 0; index < segs.length; index++) {
    const s = segs[index]!;
    starts.push(pos);
    let end: number;
    if (s.type === 'literal' || s.type === 'terminator' || s.type === 'checksum') end = pos + fixedLength(s)!;
    else {
      const w = fixedLength(s);
      let tail: number | undefined = 0;
      for (let j = index + 1; j < segs.length && tail !== undefined; j++) {
        const f = fixedLength(segs[j]!);
        tail = f === undefined ? undefined : tail + f;
      }
      const next = segs[index + 1];
      const delimiter = next && (next.type === 'literal' || next.type === 'terminator') ? segmentBytes(next) : undefined;
      if (w !== undefined) end = pos + w;
      else if (s.type === 'choice') {
        const match = [...s.options].sort((x, y) => y.send.length - x.send.length).find((o) => bytesToLatin1(bytes.subarray(pos, pos + o.send.length)) === o.send);
        end = pos + (match ? match.send.length : 0);
      } else if (delimiter?.length) {
        const at = indexOfBytes(bytes, delimiter, pos);
        end = at < 0 ? n : at;
      } else if (tail !== undefined) end = Math.max(pos, n - tail);
      else if (s.type !== 'text') {
        end = pos;
        while (end < n && isNumberChar(bytes[end]!)) end++;
      } else end = n;
    }
    if (end > n) {
      shortAt = Math.min(shortAt, index);
      end = n;
    }
    ends.push(end);
    pos = end;
  }
  return { starts, ends, shortAt };
}

/**
 * Splits the reply into the template's segments, then reads each one. The split is the one where every
 * segment fits and every checksum verifies; failing that, one where the segments fit with a checksum
 * that does not (reported as `checksum-mismatch`); failing that, a left-to-right read that reports the
 * first mismatch, a short reply or an unreadable field. So a reply assembled from the template always
 * reads back as the values it was assembled from, when the template can be read one way only.
 */
export function decodeReply(template: Template, bytes: Uint8Array): DecodedReply {
  const segs = template.segments;
  const split = splitReply(segs, bytes, true) ?? splitReply(segs, bytes, false);
  const { starts, ends, shortAt } = split ? { ...split, shortAt: segs.length } : walkReply(segs, bytes);
  const spans: SegmentSpan[] = [];
  const fields: Record<string, DecodedField> = {};
  const checksums: ChecksumVerdict[] = [];
  const findings: Finding[] = [];

  for (let index = 0; index < segs.length; index++) {
    const s = segs[index]!;
    const start = starts[index]!;
    const end = ends[index]!;
    if (index === shortAt) {
      findings.push({ severity: 'error', code: 'reply-too-short', segmentId: s.id, range: [bytes.length, bytes.length], message: `The reply ended after ${bytes.length} bytes, before "${s.id}"; check the response timeout and that the whole reply arrived.` });
    }
    if (s.type === 'literal' || s.type === 'terminator') {
      const want = segmentBytes(s);
      if (index < shortAt && !bytesAt(bytes, want, start)) {
        findings.push({ severity: 'error', code: 'reply-mismatch', segmentId: s.id, range: [start, start + want.length], message: `Expected ${toHex(want)} at position ${start} but received ${toHex(bytes.subarray(start, start + want.length))}; the reply does not follow this template.` });
      }
      spans.push({ index, id: s.id, type: s.type, start, end });
    } else if (s.type === 'checksum') {
      const a = resolveChecksum(s);
      if (!a) continue;
      if (index >= shortAt) {
        spans.push({ index, id: s.id, type: s.type, start, end });
        continue;
      }
      const [from, to] = checksumRangeAt(s, starts, ends, start);
      const { value: expected, problem } = checksumOfRange(a, s.over, bytes, from, to);
      if (problem) findings.push(notHexFinding(s, problem));
      const ok = bytesAt(bytes, placeChecksum(expected, a.width, s), start);
      const received = readReceivedChecksum(bytes.subarray(start, start + checksumLength(a.width, s.encoding)), s, a.width);
      checksums.push({ segmentId: s.id, algorithm: a.name, expected, received, ok, range: [start, end] });
      spans.push({ index, id: s.id, type: s.type, start, end, raw: received ?? undefined });
      if (!ok) {
        const got = received === null ? `"${toHex(bytes.subarray(start, end))}"` : formatChecksumValue(received, a.width);
        findings.push({ severity: 'error', code: 'checksum-mismatch', segmentId: s.id, range: [start, end], message: `${a.name} should be ${formatChecksumValue(expected, a.width)} but the reply carries ${got}; the reply was corrupted on the line, or the checksum settings (range, byte order, encoding) differ from the device's.` });
      }
    } else {
      const text = bytesToLatin1(bytes.subarray(start, end));
      const field: DecodedField = { text, range: [start, end] };
      if (s.type === 'integer' || s.type === 'decimal') {
        const raw = readNumber(text, s.type === 'decimal');
        if (raw !== undefined) {
          field.raw = toNumber(raw);
          const value = engineeringExact(raw, s.scale);
          if (value) field.value = toNumber(value);
        }
      } else if (s.type === 'text') {
        field.raw = text;
        field.value = text;
      } else {
        const option = s.options.find((o) => o.send === text);
        if (option) {
          field.raw = text;
          field.value = option.value;
        }
      }
      if (field.raw === undefined && index < shortAt) {
        const shown = text.length ? `"${[...text].map((ch) => (ch >= ' ' && ch <= '~' ? ch : `<x${HEX_PAIR[ch.charCodeAt(0)]}>`)).join('')}"` : 'nothing';
        findings.push({ severity: 'error', code: 'reply-field-unreadable', segmentId: s.id, range: [start, end], message: `${s.label || s.name}: received ${shown} at position ${start}, which is not a valid ${s.type} for this field.` });
      }
      fields[s.name] = field;
      spans.push({ index, id: s.id, type: s.type, start, end, name: s.name, value: field.value, raw: field.raw });
    }
  }
  const pos = ends.length ? ends[ends.length - 1]! : 0;
  if (pos < bytes.length) {
    findings.push({ severity: 'warning', code: 'reply-extra-bytes', range: [pos, bytes.length], message: `${bytes.length - pos} bytes after the end of the template (${toHex(bytes.subarray(pos, Math.min(bytes.length, pos + 16)))}); the template may be missing a segment, or two replies ran together.` });
  }
  return { ok: isClean(findings), fields, checksums, segments: spans, findings };
}
