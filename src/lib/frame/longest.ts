/** How long a template's frame can get with every field at its widest, for fixed-size buffers such as a PLC STRING. */
import { segmentBytes } from './assemble';
import { checksumLength, resolveChecksum } from './checksum';
import { encodeField } from './field-encode';
import { MAX_NUMBER_CHARS } from './field-format';
import type { DecimalField, FieldSegment, IntegerField, Template } from './template';

/** A field whose template sets no limit on its width. */
export interface UnlimitedField {
  id: string;
  name: string;
  label: string;
  /** Characters it was counted at: MAX_NUMBER_CHARS for a number, null for text (no upper bound). */
  countedAs: number | null;
}

export interface LongestFrame {
  /** Bytes with every field at its widest; null when a text field has no `maxLength`. */
  byteCount: number | null;
  unlimited: UnlimitedField[];
}

/**
 * Widest text a number field sends within its limits: `width` when set (wider values are errors);
 * else the longer of the texts of `min` and `max` (|raw| is largest at one of them, on either side of
 * zero); without both limits MAX_NUMBER_CHARS, beyond which nothing is sent. Null = no limit.
 */
function widestNumber(field: IntegerField | DecimalField): number | null {
  if (field.width !== undefined) return Number.isInteger(field.width) && field.width >= 1 && field.width <= MAX_NUMBER_CHARS ? field.width : 0;
  if (!Number.isFinite(field.min) || !Number.isFinite(field.max)) return null;
  let widest = 0;
  for (const bound of [field.min!, field.max!]) {
    const encoded = encodeField(field, { [field.name]: bound });
    const tooWide = encoded.findings.some((f) => f.code === 'field-too-wide');
    widest = Math.max(widest, tooWide ? MAX_NUMBER_CHARS : encoded.text.length);
  }
  return widest;
}

function widestField(field: FieldSegment): number | null {
  switch (field.type) {
    case 'integer':
    case 'decimal':
      return widestNumber(field);
    case 'text':
      return Number.isInteger(field.maxLength) && field.maxLength! >= 0 ? field.maxLength! : null;
    case 'choice':
      return field.options.reduce((n, o) => Math.max(n, o.send.length), 0);
  }
}

/**
 * Every literal and terminator as it is, every checksum at its encoded length, every field at its
 * widest per the template: numbers by `width` or `min`/`max` (counted at MAX_NUMBER_CHARS without
 * them), text by `maxLength` (without one the frame has no upper bound), choices by their longest `send`.
 */
export function longestFrame(template: Template): LongestFrame {
  let byteCount: number | null = 0;
  const unlimited: UnlimitedField[] = [];
  for (const s of template.segments) {
    let n: number | null;
    if (s.type === 'literal' || s.type === 'terminator') n = segmentBytes(s).length;
    else if (s.type === 'checksum') {
      const algorithm = resolveChecksum(s);
      n = algorithm ? checksumLength(algorithm.width, s.encoding) : 0;
    } else {
      n = widestField(s);
      if (n === null) {
        const countedAs = s.type === 'text' ? null : MAX_NUMBER_CHARS;
        unlimited.push({ id: s.id, name: s.name, label: s.label || s.name, countedAs });
        n = countedAs;
      }
    }
    byteCount = byteCount === null || n === null ? null : byteCount + n;
  }
  return { byteCount, unlimited };
}
