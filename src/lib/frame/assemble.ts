/** Builds the bytes of a command from a template and field values. */
import { ByteWriter } from './bytes';
import { checksumOfRange, placeChecksum, resolveChecksum } from './checksum';
import { encodeField } from './field-encode';
import type { Finding } from './findings';
import { isClean } from './findings';
import { hexBytes } from './schema-common';
import type { ChecksumSegment, FieldValues, Segment, SegmentType, Template } from './template';

/** Where one segment landed in the frame: bytes [start, end). */
export interface SegmentSpan {
  index: number;
  id: string;
  type: SegmentType;
  start: number;
  end: number;
  /** Field name (fields only). */
  name?: string;
  /** Engineering value (fields) as given or defaulted. */
  value?: number | string;
  /** Raw value after scaling (fields), the text sent (text/choice), or the checksum value. */
  raw?: number | string;
}

export interface AssembledFrame {
  /** True when no finding is an error. */
  ok: boolean;
  bytes: Uint8Array;
  byteCount: number;
  segments: SegmentSpan[];
  findings: Finding[];
}

const literalCache = new WeakMap<object, Uint8Array>();
// Reused across calls (assembly is synchronous); the result is copied out with toBytes().
const scratch = new ByteWriter(512);

/** Bytes of a literal or terminator segment, decoded once per segment object. */
export function segmentBytes(segment: { bytes: string }): Uint8Array {
  let b = literalCache.get(segment);
  if (!b) {
    b = hexBytes(segment.bytes);
    literalCache.set(segment, b);
  }
  return b;
}

/** Byte range [start, end) a checksum covers, given the spans laid out before it. */
export function checksumRange(segment: ChecksumSegment, spans: readonly SegmentSpan[], checksumStart: number): [number, number] {
  const { from, to } = segment.range;
  const start = from === 'start' ? 0 : (spans[from]?.start ?? 0);
  const end = to === 'checksum' ? checksumStart : (spans[to]?.end ?? checksumStart);
  return [start, Math.max(start, end)];
}

/** The finding when a checksum over decoded hex covers something that is not hex text. */
export function notHexFinding(s: ChecksumSegment, problem: { at: number; message: string }): Finding {
  return {
    severity: 'error', code: 'checksum-not-hex', segmentId: s.id, range: [problem.at, problem.at + 1],
    message: `The checksum is computed over the bytes its hex characters stand for, but ${problem.message}. Let it cover only the hex text (for Modbus ASCII: from after the ":" up to the checksum).`,
  };
}

/**
 * Lays the segments out in order. Field problems become findings and the frame is still built (with
 * nothing sent for a field that has no usable value) so a preview can show it.
 */
export function assembleFrame(template: Template, values: FieldValues = {}): AssembledFrame {
  const out = scratch;
  out.reset();
  const segments: SegmentSpan[] = [];
  const findings: Finding[] = [];
  const list: readonly Segment[] = template.segments;
  for (let index = 0; index < list.length; index++) {
    const s = list[index]!;
    const start = out.length;
    if (s.type === 'literal' || s.type === 'terminator') {
      out.pushBytes(segmentBytes(s));
      segments.push({ index, id: s.id, type: s.type, start, end: out.length });
    } else if (s.type === 'checksum') {
      const algorithm = resolveChecksum(s);
      if (!algorithm) {
        findings.push({ severity: 'error', code: 'field-invalid', segmentId: s.id, message: `Checksum "${s.algorithm}" is not in the catalogue; pick another algorithm.` });
        segments.push({ index, id: s.id, type: s.type, start, end: start });
        continue;
      }
      const [from, to] = checksumRange(s, segments, start);
      const { value, problem } = checksumOfRange(algorithm, s.over, out.view(), from, to);
      if (problem) findings.push(notHexFinding(s, problem));
      out.pushBytes(placeChecksum(value, algorithm.width, s));
      segments.push({ index, id: s.id, type: s.type, start, end: out.length, raw: value });
    } else {
      const encoded = encodeField(s, values);
      out.pushAscii(encoded.text);
      const span: SegmentSpan = { index, id: s.id, type: s.type, start, end: out.length, name: s.name };
      if (encoded.value !== undefined) span.value = encoded.value;
      if (encoded.raw !== undefined) span.raw = encoded.raw;
      segments.push(span);
      for (const f of encoded.findings) {
        findings.push(f.range ? { ...f, range: [start + f.range[0], start + f.range[1]] } : { ...f, range: [start, out.length] });
      }
    }
  }
  const bytes = out.toBytes();
  return { ok: isClean(findings), bytes, byteCount: bytes.length, segments, findings };
}
