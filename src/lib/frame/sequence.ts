/**
 * Command sequences: several templates with their values sent as one string (each step keeping its own
 * terminator: acceleration, deceleration, velocity and distance in one PLC STRING) or one after another.
 * Each step is assembled and checked as its own frame; only sequence-level findings are added.
 */
import { type SegmentSpan, assembleFrame } from './assemble';
import { isClean } from './findings';
import { longestFrame } from './longest';
import { type RenderedNotations, renderAllNotations } from './notations';
import { type LineSettings, defaultPortSettings } from './port-settings';
import { type FrameCheckSettings, checkAssembledFrame } from './preview';
import type { FieldValues, Template } from './template';
import { type TimingReport, charTimeMs, roundMs, timingReport } from './timing';

import { MAX_SEQUENCE_STEPS, SEQUENCE_MODES, type SequenceMode } from './sequence-limits';
import { type SequenceFinding, type Widest, capacityFindings, isCapacity, stepName } from './plc-string';

export { MAX_SEQUENCE_STEPS, SEQUENCE_MODES, type SequenceMode };
export { plcStringFit, type SequenceFinding } from './plc-string';

export interface SequenceStepInput {
  template: Template;
  values?: FieldValues;
  /** What the device answers this step (a reply template); absent or null = no reply expected. */
  reply?: Template | null;
  /**
   * `separate` only: before the next send, wait for this step's reply, at most this long (its timeout, ms).
   * The timing counts the whole timeout (the worst case). Absent = do not wait.
   */
  waitForReplyMs?: number;
}

export interface SequenceOptions {
  /** Line settings, frame rules and protocol; default `defaultPortSettings` (9600 8-N-1, no rules). */
  settings?: LineSettings & FrameCheckSettings;
  mode?: SequenceMode;
  /** `separate` only: idle time from the last byte of one step to the first byte of the next, ms (default 0). */
  delayMs?: number;
  /** Characters the PLC STRING holds (its declared STRING[n] length); none = no capacity check. */
  plcStringCapacity?: number;
}

export interface SequenceStep {
  index: number;
  /** Bytes [start, end) of the whole string. */
  start: number;
  end: number;
  byteCount: number;
  /** byteCount × character time, ms (rounded as `roundMs`). */
  frameTimeMs: number;
  /** Bytes with every field at its widest; null when a text field has no maxLength. */
  longestByteCount: number | null;
  /** The step's segment map, in whole-string offsets. */
  segments: SegmentSpan[];
  findings: SequenceFinding[];
  /** True when the step has a reply template (present only then). */
  expectsReply?: boolean;
  /** `separate` only, when the step waits for its reply: the timeout counted, ms (present only then). */
  waitForReplyMs?: number;
  /** `separate` only: worst case from the sequence's first byte out to this step's first byte out, ms. */
  startMs?: number;
}

/** `timingReport` of the whole string, and what the sends add up to. */
export interface SequenceTiming extends TimingReport {
  /** Sends on the line: 1 for one string, one per step when separate. */
  sends: number;
  delayMs: number;
  /** (steps − 1) × delayMs when separate, else 0. */
  delayTotalMs: number;
  /** frameTimeMs + delayTotalMs + waitTotalMs: first byte out to last byte out (worst case when steps wait). */
  totalMs: number;
  /** Reply timeouts counted before the last send (each waiting step but the last), ms; 0 when none waits. */
  waitTotalMs: number;
  /** totalMs plus the last step's reply timeout when it waits: first byte out to the end of the last wait, ms. */
  worstCaseMs: number;
}

/** Length of the PLC STRING(s) in characters: one per byte, however a notation writes it (`$0D` is one). */
export interface PlcStringLength {
  /** `whole-string` for one string; `each-step` when separate (each send its own STRING; the longest step counts). */
  scope: 'whole-string' | 'each-step';
  capacity: number | null;
  length: number;
  /** With every field at its widest; null when a text field has no maxLength. */
  longestLength: number | null;
}

export interface AssembledSequence {
  /** True when no finding is an error. */
  ok: boolean;
  mode: SequenceMode;
  bytes: Uint8Array;
  byteCount: number;
  notations: RenderedNotations;
  plcString: PlcStringLength;
  steps: SequenceStep[];
  /** Every step's findings in step order, then the sequence-level ones. */
  findings: SequenceFinding[];
  timing: SequenceTiming;
}

/** Sequence-level options given in code without the schema: a finding each, and a usable value. */
function readOptions(options: SequenceOptions, findings: SequenceFinding[]) {
  const invalid = (message: string) => findings.push({ severity: 'error', code: 'field-invalid', message });
  let mode: SequenceMode = options.mode ?? 'one-string';
  if (!SEQUENCE_MODES.includes(mode)) {
    invalid(`Sequence mode "${String(mode)}" is not one of ${SEQUENCE_MODES.join(', ')}; pick one.`);
    mode = 'one-string';
  }
  let delayMs = mode === 'separate' ? (options.delayMs ?? 0) : 0;
  if (!(Number.isFinite(delayMs) && delayMs >= 0)) {
    invalid(`Delay ${String(delayMs)} ms is not a time of 0 ms or more; enter one.`);
    delayMs = 0;
  }
  let capacity = options.plcStringCapacity ?? null;
  if (capacity !== null && !isCapacity(capacity)) {
    invalid(`PLC string capacity ${String(capacity)} is not a whole number of characters of 1 or more; enter the STRING's declared length.`);
    capacity = null;
  }
  return { mode, delayMs, capacity };
}

/** A step's reply wait in `separate` mode: a finding and 0 when unusable, or when there is no reply to wait for. */
function readWait(step: SequenceStepInput, index: number, findings: SequenceFinding[]): number {
  const w = step.waitForReplyMs;
  if (w === undefined) return 0;
  if (!(Number.isFinite(w) && w >= 0)) {
    findings.push({ severity: 'error', code: 'field-invalid', step: index, message: `${stepName(index)}: reply timeout ${String(w)} ms is not a time of 0 ms or more; enter one.` });
    return 0;
  }
  if (!step.reply) {
    findings.push({
      severity: 'warning', code: 'step-wait-without-reply', step: index,
      message: `${stepName(index)} waits for a reply but expects none; give it a reply template or leave the wait out.`,
    });
    return 0;
  }
  return w;
}

/** Assembles and checks a sequence of steps; never throws on malformed input. */
export function assembleSequence(steps: readonly SequenceStepInput[], options: SequenceOptions = {}): AssembledSequence {
  const sequenceFindings: SequenceFinding[] = [];
  const { mode, delayMs, capacity } = readOptions(options, sequenceFindings);
  const settings = options.settings ?? defaultPortSettings;
  const rules = settings.frameRules ?? {};
  const charMs = charTimeMs(settings);

  const parts: Uint8Array[] = [];
  const out: SequenceStep[] = [];
  const widest: Widest[] = [];
  const waits: number[] = [];
  let at = 0;
  steps.forEach((step, index) => {
    const frame = assembleFrame(step.template, step.values ?? {});
    const findings: SequenceFinding[] = checkAssembledFrame(step.template, frame, settings).map((f) => {
      const g: SequenceFinding = { ...f, message: `${stepName(index)}: ${f.message}`, step: index };
      if (f.range) g.range = [f.range[0] + at, f.range[1] + at];
      return g;
    });
    if (mode === 'one-string' && index < steps.length - 1 && !rules.terminator && !frame.segments.some((s) => s.type === 'terminator')) {
      findings.push({
        severity: 'warning', code: 'step-unterminated', step: index,
        message: `${stepName(index)} has no terminator, so in one string the device cannot tell where it ends and ${stepName(index + 1).toLowerCase()} begins. Add a terminator segment, or send the steps separately.`,
      });
    }
    const wait = mode === 'separate' ? readWait(step, index, findings) : 0;
    if (mode !== 'separate' && step.waitForReplyMs !== undefined) {
      findings.push({
        severity: 'warning', code: 'step-wait-in-one-string', step: index,
        message: `${stepName(index)} waits for its reply, but in one string every step goes out at once; send the steps separately to wait between them.`,
      });
    }
    const longest = longestFrame(step.template);
    widest.push({ byteCount: longest.byteCount, unlimited: longest.unlimited.map((f) => ({ ...f, step: index })) });
    const byteCount = frame.byteCount;
    out.push({
      index, start: at, end: at + byteCount, byteCount, frameTimeMs: roundMs(byteCount * charMs), longestByteCount: longest.byteCount,
      segments: frame.segments.map((s) => ({ ...s, start: s.start + at, end: s.end + at })), findings,
      ...(step.reply ? { expectsReply: true } : {}),
      ...(wait > 0 ? { waitForReplyMs: wait } : {}),
    });
    waits.push(wait);
    parts.push(frame.bytes);
    at += byteCount;
  });

  const bytes = new Uint8Array(at);
  parts.reduce((offset, p) => (bytes.set(p, offset), offset + p.length), 0);
  if (steps.length === 0) sequenceFindings.push({ severity: 'warning', code: 'empty-frame', message: 'The sequence has no steps; add one.' });

  let plcString: PlcStringLength;
  if (mode === 'one-string') {
    const longestLength = widest.reduce<number | null>((n, w) => (n === null || w.byteCount === null ? null : n + w.byteCount), 0);
    plcString = { scope: 'whole-string', capacity, length: at, longestLength };
    if (capacity !== null) {
      const whole: Widest = { byteCount: longestLength, unlimited: widest.flatMap((w) => w.unlimited) };
      sequenceFindings.push(...capacityFindings('The string', 0, at, whole, capacity, steps.length > 1 ? ', or send the steps separately' : ''));
    }
  } else {
    const longestLength = widest.reduce<number | null>((n, w) => (n === null || w.byteCount === null ? null : Math.max(n, w.byteCount)), 0);
    plcString = { scope: 'each-step', capacity, length: out.reduce((n, s) => Math.max(n, s.byteCount), 0), longestLength };
    if (capacity !== null) {
      for (const s of out) s.findings.push(...capacityFindings(stepName(s.index), s.start, s.byteCount, widest[s.index]!, capacity, '').map((f) => ({ ...f, step: s.index })));
    }
  }

  const findings = out.flatMap((s) => s.findings).concat(sequenceFindings);
  const sends = mode === 'separate' ? steps.length : Math.min(1, steps.length);
  const delayTotalMs = Math.max(0, sends - 1) * delayMs;
  // Worst case: each waiting step's whole timeout, then the delay, before the next send.
  const waitTotalMs = waits.slice(0, -1).reduce((n, w) => n + w, 0);
  const lastWait = waits.length ? waits[waits.length - 1]! : 0;
  if (mode === 'separate') {
    let t = 0;
    for (const s of out) {
      s.startMs = roundMs(t);
      t += s.byteCount * charMs + waits[s.index]! + delayMs;
    }
  }
  const totalMs = at * charMs + delayTotalMs + waitTotalMs;
  const timing: SequenceTiming = {
    ...timingReport(settings, at),
    sends, delayMs, delayTotalMs: roundMs(delayTotalMs), totalMs: roundMs(totalMs),
    waitTotalMs: roundMs(waitTotalMs), worstCaseMs: roundMs(totalMs + lastWait),
  };
  return { ok: isClean(findings), mode, bytes, byteCount: at, notations: renderAllNotations(bytes), plcString, steps: out, findings, timing };
}
