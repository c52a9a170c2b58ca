/**
 * The replies to a sequence, received back to back (a PLC reads what came back for the whole string): split
 * into each step's reply, in step order, and each read against its step's reply template with its own
 * checksum verdicts. Steps that expect no reply take no bytes.
 */
import type { SegmentSpan } from './assemble';
import { type ChecksumVerdict, type DecodedField, decodeReply } from './decode-reply';
import { type Finding, isClean } from './findings';
import type { Segment, Template } from './template';

export interface StepReply {
  /** The step's index (0-based) in the sequence. */
  step: number;
  ok: boolean;
  /** Bytes [start, end) of the received whole. */
  start: number;
  end: number;
  fields: Record<string, DecodedField>;
  checksums: ChecksumVerdict[];
  segments: SegmentSpan[];
  findings: Finding[];
}

export interface SequenceReply {
  ok: boolean;
  /** One entry per step that expects a reply, in step order. */
  steps: StepReply[];
  /** Findings of the whole (bytes after the last reply); each step's own are in its entry. */
  findings: Finding[];
}

const SEP = '\u0000';

/**
 * Decodes `bytes` as the replies of the steps in order. `replies[i]` is step i's reply template, or null when
 * step i expects none. The step templates are read as one template (segment ids and field names kept apart
 * per step, checksum ranges moved to where the step starts), so the split that reads the whole and verifies
 * every checksum wins, as for one reply.
 */
export function decodeSequenceReply(replies: readonly (Template | null | undefined)[], bytes: Uint8Array): SequenceReply {
  const segments: Segment[] = [];
  const owner: { step: number; first: number }[] = [];
  replies.forEach((t, step) => {
    if (!t) return;
    const first = segments.length;
    for (const s of t.segments) {
      const id = `${step}${SEP}${s.id}`;
      if (s.type === 'checksum') {
        const { from, to } = s.range;
        segments.push({ ...s, id, range: { from: from === 'start' ? first : from + first, to: to === 'checksum' ? to : to + first } } as Segment);
      } else if ('name' in s) segments.push({ ...s, id, name: `${step}${SEP}${s.name}` } as Segment);
      else segments.push({ ...s, id } as Segment);
      owner.push({ step, first });
    }
  });
  const whole = decodeReply({ version: 1, segments }, bytes);
  const stepOf = (id: string | undefined) => (id === undefined ? undefined : Number(id.slice(0, id.indexOf(SEP))));
  const own = (id: string) => id.slice(id.indexOf(SEP) + 1);

  const out: StepReply[] = [];
  const byStep = new Map<number, StepReply>();
  replies.forEach((t, step) => {
    if (!t) return;
    const r: StepReply = { step, ok: true, start: 0, end: 0, fields: {}, checksums: [], segments: [], findings: [] };
    out.push(r);
    byStep.set(step, r);
  });
  for (const span of whole.segments) {
    const r = byStep.get(stepOf(span.id)!)!;
    const first = owner[span.index]!.first;
    r.segments.push({ ...span, index: span.index - first, id: own(span.id), ...(span.name !== undefined ? { name: own(span.name) } : {}) });
  }
  for (const [name, f] of Object.entries(whole.fields)) byStep.get(stepOf(name)!)!.fields[own(name)] = f;
  for (const c of whole.checksums) byStep.get(stepOf(c.segmentId)!)!.checksums.push({ ...c, segmentId: own(c.segmentId) });
  const rest: Finding[] = [];
  for (const f of whole.findings) {
    const r = byStep.get(stepOf(f.segmentId) ?? -1);
    if (r) r.findings.push({ ...f, segmentId: own(f.segmentId!), message: `Step ${r.step + 1}: ${f.message}` });
    else rest.push(f);
  }
  for (const r of out) {
    r.start = r.segments.length ? r.segments[0]!.start : 0;
    r.end = r.segments.length ? r.segments[r.segments.length - 1]!.end : r.start;
    r.ok = isClean(r.findings);
  }
  return { ok: isClean(out.flatMap((r) => r.findings)) && isClean(rest), steps: out, findings: rest };
}
