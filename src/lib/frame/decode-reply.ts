/** Reads a received reply against a reply template: field values, checksum verdicts, and mismatches. */
import { HEX_PAIR, bytesAt, bytesToLatin1, indexOfBytes, toHex } from './bytes';
import { type SegmentSpan, checksumRange, segmentBytes } from './assemble';
import { checksumLength, findChecksumAlgorithm, formatChecksumValue, placeChecksum } from './checksum';
import { engineeringExact, readNumber, toNumber } from './field-format';
import { type Finding, isClean } from './findings';
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

function fixedLength(s: Segment): number | undefined {
  if (s.type === 'literal' || s.type === 'terminator') return segmentBytes(s).length;
  if (s.type === 'checksum') {
    const a = findChecksumAlgorithm(s.algorithm);
    return a ? checksumLength(a.width, s.encoding) : 0;
  }
  if ((s.type === 'integer' || s.type === 'decimal') && s.width !== undefined) return s.width;
  if (s.type === 'choice') {
    const n = s.options[0]!.send.length;
    return s.options.every((o) => o.send.length === n) ? n : undefined;
  }
  return undefined;
}

function readReceivedChecksum(bytes: Uint8Array, seg: ChecksumSegment, width: number): number | null {
  const n = width / 8;
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

const NUMERIC_CHAR = /[0-9+\-. ]/;

export function decodeReply(template: Template, bytes: Uint8Array): DecodedReply {
  const segs = template.segments;
  const spans: SegmentSpan[] = [];
  const fields: Record<string, DecodedField> = {};
  const checksums: ChecksumVerdict[] = [];
  const findings: Finding[] = [];
  let pos = 0;
  let short = false;
  const tooShort = (s: Segment) => {
    if (!short) findings.push({ severity: 'error', code: 'reply-too-short', segmentId: s.id, range: [bytes.length, bytes.length], message: `The reply ended after ${bytes.length} bytes, before "${s.id}"; check the response timeout and that the whole reply arrived.` });
    short = true;
  };

  for (let index = 0; index < segs.length; index++) {
    const s = segs[index]!;
    const start = pos;
    if (s.type === 'literal' || s.type === 'terminator') {
      const want = segmentBytes(s);
      if (pos + want.length > bytes.length) tooShort(s);
      else if (!bytesAt(bytes, want, pos)) {
        const got = bytes.subarray(pos, pos + want.length);
        findings.push({ severity: 'error', code: 'reply-mismatch', segmentId: s.id, range: [pos, pos + want.length], message: `Expected ${toHex(want)} at position ${pos} but received ${toHex(got)}; the reply does not follow this template.` });
      }
      pos = Math.min(bytes.length, pos + want.length);
      spans.push({ index, id: s.id, type: s.type, start, end: pos });
    } else if (s.type === 'checksum') {
      const a = findChecksumAlgorithm(s.algorithm);
      if (!a) continue;
      const len = checksumLength(a.width, s.encoding);
      if (pos + len > bytes.length) {
        tooShort(s);
        pos = bytes.length;
        spans.push({ index, id: s.id, type: s.type, start, end: pos });
        continue;
      }
      const [from, to] = checksumRange(s, spans, pos);
      const expected = a.compute(bytes, from, to);
      const ok = bytesAt(bytes, placeChecksum(expected, a.width, s), pos);
      const received = readReceivedChecksum(bytes.subarray(pos, pos + len), s, a.width);
      pos += len;
      checksums.push({ segmentId: s.id, algorithm: a.name, expected, received, ok, range: [start, pos] });
      spans.push({ index, id: s.id, type: s.type, start, end: pos, raw: received ?? undefined });
      if (!ok) {
        const got = received === null ? `"${toHex(bytes.subarray(start, pos))}"` : formatChecksumValue(received, a.width);
        findings.push({ severity: 'error', code: 'checksum-mismatch', segmentId: s.id, range: [start, pos], message: `${a.name} should be ${formatChecksumValue(expected, a.width)} but the reply carries ${got}; the reply was corrupted on the line, or the checksum settings (range, byte order, encoding) differ from the device's.` });
      }
    } else {
      let end: number;
      const w = fixedLength(s);
      let tail: number | undefined = 0;
      for (let j = index + 1; j < segs.length && tail !== undefined; j++) {
        const f = fixedLength(segs[j]!);
        tail = f === undefined ? undefined : tail + f;
      }
      const next = segs[index + 1];
      if (w !== undefined) end = pos + w;
      else if (s.type === 'choice') {
        const match = [...s.options].sort((x, y) => y.send.length - x.send.length).find((o) => bytesToLatin1(bytes.subarray(pos, pos + o.send.length)) === o.send);
        end = pos + (match ? match.send.length : 0);
      } else if (next && (next.type === 'literal' || next.type === 'terminator')) {
        const at = indexOfBytes(bytes, segmentBytes(next), pos);
        end = at < 0 ? bytes.length : at;
      } else if (s.type !== 'text') {
        end = pos;
        while (end < bytes.length && NUMERIC_CHAR.test(String.fromCharCode(bytes[end]!))) end++;
      } else end = tail !== undefined ? Math.max(pos, bytes.length - tail) : bytes.length;
      if (end > bytes.length) {
        tooShort(s);
        end = bytes.length;
      }
      const text = bytesToLatin1(bytes.subarray(pos, end));
      const field: DecodedField = { text, range: [pos, end] };
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
      if (field.raw === undefined && !short) {
        const shown = text.length ? `"${[...text].map((ch) => (ch >= ' ' && ch <= '~' ? ch : `<x${HEX_PAIR[ch.charCodeAt(0)]}>`)).join('')}"` : 'nothing';
        findings.push({ severity: 'error', code: 'reply-field-unreadable', segmentId: s.id, range: [pos, end], message: `${s.label || s.name}: received ${shown} at position ${pos}, which is not a valid ${s.type} for this field.` });
      }
      fields[s.name] = field;
      spans.push({ index, id: s.id, type: s.type, start: pos, end, name: s.name, value: field.value, raw: field.raw });
      pos = end;
    }
  }
  if (pos < bytes.length) {
    findings.push({ severity: 'warning', code: 'reply-extra-bytes', range: [pos, bytes.length], message: `${bytes.length - pos} bytes after the end of the template (${toHex(bytes.subarray(pos, Math.min(bytes.length, pos + 16)))}); the template may be missing a segment, or two replies ran together.` });
  }
  return { ok: isClean(findings), fields, checksums, segments: spans, findings };
}
