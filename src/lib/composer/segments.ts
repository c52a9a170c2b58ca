/** Template edits for the segment editor: add, duplicate, remove and move segments, keeping checksum ranges right. */
import { CONTROL_NAMES } from '../frame/notations/mnemonic';
import { defaultChecksumByteOrder, findChecksumAlgorithm } from '../frame/checksum';
import type { PortSettings } from '../frame/port-settings';
import { moveSegment, type ChecksumSegment, type Segment, type Template } from '../frame/template';
import type { FrameRulesInput } from '../frame/frame-rules';
import { hexOfText, labelOfBytes } from './bytes-text';

export type AddKind = 'text' | 'control' | 'integer' | 'decimal' | 'text-field' | 'choice' | 'checksum' | 'terminator';

export const ADD_KINDS: { kind: AddKind; label: string }[] = [
  { kind: 'text', label: 'Literal text' },
  { kind: 'control', label: 'Control character' },
  { kind: 'integer', label: 'Whole-number field' },
  { kind: 'decimal', label: 'Decimal field' },
  { kind: 'text-field', label: 'Text field' },
  { kind: 'choice', label: 'Choice field' },
  { kind: 'checksum', label: 'Checksum' },
  { kind: 'terminator', label: 'Terminator' },
];

type Protocol = PortSettings['protocol'];

/**
 * A first template for a port: its start bytes and its terminator. Without frame rules: ":" and CR LF for
 * Modbus ASCII (Modbus over Serial Line V1.02, 2.5.2), nothing for Modbus RTU (frames are delimited by
 * silence), a carriage return otherwise.
 */
export function starterTemplate(rules: FrameRulesInput = {}, protocol?: Protocol): Template {
  const segments: Segment[] = [];
  const start = rules.start ?? (protocol === 'modbus-ascii' ? '3A' : undefined);
  const terminator = rules.terminator ?? (protocol === 'modbus-ascii' ? '0D 0A' : protocol === 'modbus-rtu' ? undefined : '0D');
  if (start) segments.push({ type: 'literal', id: 'start', bytes: start, label: labelOfBytes(start) });
  if (terminator) segments.push({ type: 'terminator', id: 'end', bytes: terminator });
  return { version: 1, segments };
}

/**
 * The template for a newly chosen port: a template still equal to the old port's starter becomes the new
 * port's starter (a new command on a Modbus RTU port moved to an ASCII port gains its terminator); any
 * edited template is kept as it is.
 */
export function restartForPort(t: Template, from: Pick<PortSettings, 'frameRules' | 'protocol'>, to: Pick<PortSettings, 'frameRules' | 'protocol'>): Template {
  const untouched = JSON.stringify(t.segments) === JSON.stringify(starterTemplate(from.frameRules, from.protocol).segments);
  return untouched ? { ...t, segments: starterTemplate(to.frameRules, to.protocol).segments } : t;
}

function freeId(t: Template, prefix: string): string {
  const ids = new Set(t.segments.map((s) => s.id));
  for (let n = 1; ; n++) if (!ids.has(`${prefix}${n}`)) return `${prefix}${n}`;
}

function freeName(t: Template, base: string): string {
  const names = new Set(t.segments.flatMap((s) => ('name' in s ? [s.name] : [])));
  if (!names.has(base)) return base;
  for (let n = 2; ; n++) if (!names.has(`${base}${n}`)) return `${base}${n}`;
}

/**
 * Where new segments go: before the terminator (and a checksum after it), else at the end; in both cases
 * before the checksums that close the frame (Modbus: payload, checksum, CR LF).
 */
export function insertionIndex(t: Template): number {
  const term = t.segments.findIndex((s) => s.type === 'terminator');
  let at = term < 0 ? t.segments.length : term;
  while (at > 0 && t.segments[at - 1]!.type === 'checksum') at--;
  return at;
}

export interface AddOptions {
  /** Literal text (kind `text`); letters follow the port's letter case. */
  text?: string;
  /** Byte value 0x00-0x1F or 0x7F (kind `control`). */
  code?: number;
  /**
   * Checksum algorithm name (kind `checksum`); default by protocol: LRC for Modbus ASCII, CRC-16/MODBUS
   * for Modbus RTU, else XOR-8 (block check character).
   */
  algorithm?: string;
  /** The port's protocol: sets the checksum's algorithm, encoding and what it is computed over. */
  protocol?: Protocol;
}

/** Applies the frame rules' letter case to literal text; ASCII letters only (ſ must not become S, nor ß SS). */
export function applyCase(text: string, rules: FrameRulesInput = {}): string {
  if (rules.letterCase === 'upper') return text.replace(/[a-z]+/g, (m) => m.toUpperCase());
  if (rules.letterCase === 'lower') return text.replace(/[A-Z]+/g, (m) => m.toLowerCase());
  return text;
}

export function makeSegment(t: Template, kind: AddKind, rules: FrameRulesInput = {}, opts: AddOptions = {}): Segment {
  const textCase = rules.letterCase === 'upper' ? 'upper' : rules.letterCase === 'lower' ? 'lower' : 'as-is';
  switch (kind) {
    case 'text': {
      const text = applyCase(opts.text ?? '', rules);
      return { type: 'literal', id: freeId(t, 'lit'), bytes: hexOfText(text), label: text };
    }
    case 'control': {
      const code = opts.code ?? 0x0d;
      const hex = code.toString(16).toUpperCase().padStart(2, '0');
      return { type: 'literal', id: freeId(t, 'ctl'), bytes: hex, label: code === 0x7f ? 'DEL' : CONTROL_NAMES[code] ?? hex };
    }
    case 'integer':
      return { type: 'integer', id: freeId(t, 'f'), name: freeName(t, 'value'), label: 'Value', pad: 'zero', sign: 'negative', default: 0 };
    case 'decimal':
      return { type: 'decimal', id: freeId(t, 'f'), name: freeName(t, 'amount'), label: 'Amount', pad: 'zero', sign: 'negative', decimals: 1, default: 0 };
    case 'text-field':
      return { type: 'text', id: freeId(t, 'f'), name: freeName(t, 'text'), label: 'Text', case: textCase, default: '' };
    case 'choice':
      return { type: 'choice', id: freeId(t, 'f'), name: freeName(t, 'mode'), label: 'Mode', default: 'a', options: [{ value: 'a', label: 'First', send: 'A' }, { value: 'b', label: 'Second', send: 'B' }] };
    case 'checksum': {
      const protocol = opts.protocol;
      const fallback = protocol === 'modbus-ascii' ? 'LRC' : protocol === 'modbus-rtu' ? 'CRC-16/MODBUS' : 'XOR-8';
      const algorithm = findChecksumAlgorithm(opts.algorithm ?? fallback)?.name ?? fallback;
      const encoding = protocol === 'modbus-rtu' ? 'binary' : 'ascii-hex';
      // Modbus ASCII: the LRC covers the bytes the hex stands for, from after the ":" (Modbus over Serial Line V1.02, 2.5.2.2)
      const decoded = protocol === 'modbus-ascii';
      const afterStart = decoded && t.segments[0]?.type === 'literal' && insertionIndex(t) > 1;
      return {
        type: 'checksum', id: freeId(t, 'sum'), algorithm, range: { from: afterStart ? 1 : 'start', to: 'checksum' }, over: decoded ? 'decoded-hex' : 'bytes',
        encoding, byteOrder: defaultChecksumByteOrder({ algorithm, encoding }), case: 'upper',
      };
    }
    case 'terminator':
      return { type: 'terminator', id: freeId(t, 'end'), bytes: rules.terminator ?? '0D' };
  }
}

/** Adds a segment before the terminator; a second terminator is refused (returns the template unchanged). */
export function addSegment(t: Template, kind: AddKind, rules: FrameRulesInput = {}, opts: AddOptions = {}): Template {
  if (kind === 'terminator' && t.segments.some((s) => s.type === 'terminator')) return t;
  const seg = makeSegment(t, kind, rules, opts);
  if (kind === 'terminator') return { ...t, segments: [...t.segments, seg] };
  return insertAt(t, insertionIndex(t), seg);
}

/** Inserts `seg` at `at`, shifting checksum ranges that point at or past it. */
export function insertAt(t: Template, at: number, seg: Segment): Template {
  const shift = (n: number) => (n >= at ? n + 1 : n);
  const segments = t.segments.map((s) => (s.type === 'checksum' ? withRange(s, shiftRange(s.range, shift)) : s));
  segments.splice(at, 0, seg);
  return { ...t, segments: segments.map((s, i) => (s.type === 'checksum' ? sane(s, i) : s)) };
}

type Range = ChecksumSegment['range'];
const shiftRange = (r: Range, f: (n: number) => number): Range => ({
  from: r.from === 'start' ? 'start' : f(r.from),
  to: r.to === 'checksum' ? 'checksum' : f(r.to),
} as Range);
const withRange = (s: ChecksumSegment, range: Range): ChecksumSegment => ({ ...s, range });

/** A checksum range that no longer fits (covers itself or later segments) falls back to "everything before it". */
function sane(s: ChecksumSegment, index: number): ChecksumSegment {
  const from = s.range.from === 'start' ? 0 : s.range.from;
  const to = s.range.to === 'checksum' ? index - 1 : s.range.to;
  return from >= index || to >= index || from > to ? withRange(s, { from: 'start', to: 'checksum' }) : s;
}

/** A copy right after the original, with a fresh id (and field name); a terminator is not duplicated. */
export function duplicateSegment(t: Template, index: number): Template {
  const s = t.segments[index];
  if (!s || s.type === 'terminator') return t;
  const copy = { ...s, id: freeId(t, s.id.replace(/\d+$/, '') || 'seg') } as Segment;
  if ('name' in copy) copy.name = freeName(t, copy.name.replace(/\d+$/, ''));
  return insertAt(t, index + 1, copy);
}

export function removeSegment(t: Template, index: number): Template {
  if (!t.segments[index]) return t;
  const f = (n: number) => (n > index ? n - 1 : n);
  const segments = t.segments
    .filter((_, i) => i !== index)
    .map((s) => (s.type === 'checksum' ? withRange(s, shiftRange(s.range, f)) : s));
  return { ...t, segments: segments.map((s, i) => (s.type === 'checksum' ? sane(s, i) : s)) };
}

/** Moves a segment one place up (-1) or down (+1) with the engine's `moveSegment`. */
export function nudgeSegment(t: Template, index: number, delta: -1 | 1): Template {
  const to = index + delta;
  if (to < 0 || to >= t.segments.length) return t;
  const r = moveSegment(t, index, to);
  if (!r.ok) return t;
  const moved = r.value;
  return { ...moved, segments: moved.segments.map((s, i) => (s.type === 'checksum' ? sane(s, i) : s)) };
}

export function replaceSegment(t: Template, index: number, seg: Segment): Template {
  return { ...t, segments: t.segments.map((s, i) => (i === index ? seg : s)) };
}
