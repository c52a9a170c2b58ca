/** The preview's byte cells: one per byte, with what made it and which findings touch it. */
import type { SegmentSpan } from '../frame/assemble';
import type { Finding, Severity } from '../frame/findings';
import type { Segment, Template } from '../frame/template';
import { byteGlyph } from './bytes-text';

export interface ByteCell {
  offset: number;
  hex: string;
  decimal: number;
  /** Character, RFC 20 name, or xHH. */
  glyph: string;
  segmentIndex: number;
  /** "Field angle", "Literal", "Checksum XOR-8", "Terminator". */
  segmentLabel: string;
  /** Worst severity of a finding covering this byte. */
  severity?: Severity;
  /** Indexes into the findings list. */
  findings: number[];
}

export function segmentTitle(s: Segment | undefined): string {
  if (!s) return 'Unknown';
  switch (s.type) {
    case 'literal': return `Literal ${s.label ? `"${s.label}"` : s.id}`;
    case 'terminator': return 'Terminator';
    case 'checksum': return `Checksum ${s.algorithm}`;
    default: return `Field ${s.label || s.name}`;
  }
}

const RANK: Record<Severity, number> = { info: 1, warning: 2, error: 3 };

export function byteCells(bytes: Uint8Array, spans: readonly SegmentSpan[], template: Template, findings: readonly Finding[] = []): ByteCell[] {
  const cells: ByteCell[] = [];
  let span = 0;
  for (let offset = 0; offset < bytes.length; offset++) {
    while (span < spans.length - 1 && offset >= spans[span]!.end) span++;
    const s = spans[span];
    const b = bytes[offset]!;
    cells.push({
      offset,
      hex: b.toString(16).toUpperCase().padStart(2, '0'),
      decimal: b,
      glyph: byteGlyph(b),
      segmentIndex: s?.index ?? -1,
      segmentLabel: segmentTitle(s ? template.segments[s.index] : undefined),
      findings: [],
    });
  }
  findings.forEach((f, i) => {
    if (!f.range) return;
    const [start, end] = f.range;
    for (let o = start; o < Math.min(end, cells.length); o++) {
      const c = cells[o]!;
      c.findings.push(i);
      if (!c.severity || RANK[f.severity] > RANK[c.severity]) c.severity = f.severity;
    }
  });
  return cells;
}
