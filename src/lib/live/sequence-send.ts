/**
 * Sending a saved sequence over the live link: its steps resolved against the device's library (a gap, a step
 * whose command is in the trash or purged, makes it unsendable, with the reason), then sent as one string (one
 * exchange, the reply split per step by `decodeSequenceReply`) or as separate sends (step by step, each step
 * that expects a reply waiting for it or its timeout, the sequence's pause between sends, a timeout or a stop
 * ending the run). Every byte goes through `LiveLink.exchange`, so the exchange log holds the whole run.
 */
import { assembleSaved, describeSteps, sequenceInputs, type SavedSequence, type StepCommand, type StepInfo } from '../composer/saved-sequence';
import type { SequenceMode } from '../frame/sequence-limits';
import { decodeSequenceReply, type SequenceReply, type StepReply } from '../frame/sequence-reply';
import type { FieldValues, Template } from '../frame/template';
import type { Exchange, LiveLink } from './session';

/** A library entry as the live link has it (a single command, or a sequence with `sequence` set). */
export interface SequenceLibraryEntry {
  id: string;
  name: string;
  movesMachinery: boolean;
  template: Template;
  fieldValues: FieldValues;
  replyTemplate: Template | null;
  sequence?: SavedSequence | null;
  /** The server's view of each step (names, and the gap where a step's command is in the trash or purged). */
  steps?: StepInfo[];
}

export interface LiveSequenceStep {
  index: number;
  /** The step's command name, or `Inline step`. */
  name: string;
  bytes: Uint8Array;
  replyTemplate: Template | null;
  /** The step's own reply timeout (separate sends), ms; absent = the port's response timeout. */
  waitForReplyMs?: number;
  /** The step's command is marked as moving machinery. */
  movesMachinery: boolean;
}

export interface LiveSequence {
  id: string;
  name: string;
  mode: SequenceMode;
  /** Pause between two separate sends, ms. */
  delayMs: number;
  steps: LiveSequenceStep[];
  /** The whole string (every step's bytes in order). */
  bytes: Uint8Array;
  /** The sequence is marked as moving machinery, or one of its steps' commands is. */
  movesMachinery: boolean;
  /** Why it cannot be sent (a gap, or values that make no valid frame); null when it can. */
  refusal: string | null;
}

/** The device's saved sequences, resolved against its library (single commands, by id). */
export function liveSequences(library: readonly SequenceLibraryEntry[]): LiveSequence[] {
  const singles = new Map(library.filter((c) => !c.sequence).map((c) => [c.id, c]));
  const lookup = (id: string): StepCommand | undefined => {
    const c = singles.get(id);
    return c && { id: c.id, name: c.name, template: c.template, fieldValues: c.fieldValues, replyTemplate: c.replyTemplate, isSequence: false, trashed: false };
  };
  return library.flatMap((c) => (c.sequence ? [resolve(c, c.sequence, lookup, singles)] : []));
}

function resolve(c: SequenceLibraryEntry, seq: SavedSequence, lookup: (id: string) => StepCommand | undefined, singles: Map<string, SequenceLibraryEntry>): LiveSequence {
  const local = describeSteps(seq, lookup);
  // The server knows the trash; the library list does not (a trashed command is simply absent from it).
  const info = local.map((l, i) => {
    const s = c.steps?.[i];
    return s && s.commandId === l.commandId ? { ...l, name: s.name, gap: s.gap ?? l.gap } : l;
  });
  const assembled = assembleSaved(seq, lookup);
  const inputs = sequenceInputs(seq, lookup);
  const steps = assembled.steps.map((s, i): LiveSequenceStep => {
    const wait = inputs[i]?.waitForReplyMs;
    const commandId = seq.steps[i]?.commandId;
    return {
      index: i, name: info[i]?.name ?? `Step ${i + 1}`, bytes: assembled.bytes.slice(s.start, s.end), replyTemplate: inputs[i]?.reply ?? null,
      ...(wait !== undefined && wait > 0 ? { waitForReplyMs: wait } : {}),
      movesMachinery: commandId ? singles.get(commandId)?.movesMachinery ?? false : false,
    };
  });
  const gap = info.find((i) => i.gap)?.gap ?? null;
  const error = assembled.findings.find((f) => f.severity === 'error');
  const refusal = gap ?? (error ? `${error.message} Fix the sequence in its composer first.` : steps.length === 0 ? 'The sequence has no steps.' : null);
  return {
    id: c.id, name: c.name, mode: seq.mode, delayMs: seq.mode === 'separate' ? seq.delayMs : 0, steps, bytes: assembled.bytes,
    movesMachinery: c.movesMachinery || steps.some((s) => s.movesMachinery), refusal,
  };
}

/** What became of a step: `sent` (no reply expected), `answered`, `timed-out`, or `not-sent` (stopped before it). */
export type StepOutcome = 'waiting' | 'sending' | 'sent' | 'answered' | 'timed-out' | 'not-sent';

export interface StepProgress {
  index: number;
  name: string;
  outcome: StepOutcome;
  /** Separate sends: the step's own exchange, and when it was sent (ms since the link opened). */
  exchange?: Exchange;
  sentAtMs?: number;
  /** The timeout the step waited for its reply, ms (separate sends). */
  timeoutMs?: number;
  /** One string: the step's part of the whole reply, decoded against its reply template. */
  reply?: StepReply;
  replyTemplate: Template | null;
}

export interface SequenceRun {
  sequence: { id: string; name: string };
  mode: SequenceMode;
  delayMs: number;
  steps: StepProgress[];
  /** One string: the one exchange of the whole string. */
  whole: Exchange | null;
  /** One string: the whole reply split per step. */
  decoded: SequenceReply | null;
  running: boolean;
  /** Why the run ended early, in words; null when every step went out. */
  stopped: { by: 'timeout' | 'stop' | 'error'; message: string } | null;
}

export interface RunOptions {
  /** Default: the sequence's saved mode. */
  mode?: SequenceMode;
  /** Aborted: no further step is sent (the step on the line finishes). */
  signal?: AbortSignal;
  /** Called with a fresh copy after every change. */
  progress?: (run: SequenceRun) => void;
  /** The pause between separate sends (tests pass their own). */
  sleep?: (ms: number) => Promise<void>;
}

const defaultSleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
const stepLabel = (seq: LiveSequence, s: LiveSequenceStep) => `${seq.name}, step ${s.index + 1} of ${seq.steps.length}: ${s.name}`;

/** The no-reply message of a step, naming it. */
export const noReplyMessage = (s: { index: number; name: string }, timeoutMs: number, rest: boolean) =>
  `Step ${s.index + 1} (${s.name}): no reply within the response timeout (${timeoutMs} ms)${rest ? '; the steps after it were not sent' : ''}.`;

/**
 * Sends `seq` over `link` and reports each step's progress. Refuses (throws) a sequence with a refusal. The
 * machinery confirmation is the caller's: this sends what it is given.
 */
export async function runSequence(link: LiveLink, seq: LiveSequence, options: RunOptions = {}): Promise<SequenceRun> {
  if (seq.refusal) throw new Error(`"${seq.name}" cannot be sent: ${seq.refusal}`);
  const mode = options.mode ?? seq.mode;
  const sleep = options.sleep ?? defaultSleep;
  const run: SequenceRun = {
    sequence: { id: seq.id, name: seq.name }, mode, delayMs: mode === 'separate' ? seq.delayMs : 0,
    steps: seq.steps.map((s) => ({ index: s.index, name: s.name, outcome: 'waiting', replyTemplate: s.replyTemplate })),
    whole: null, decoded: null, running: true, stopped: null,
  };
  const tell = () => options.progress?.({ ...run, steps: run.steps.map((s) => ({ ...s })) });
  tell();
  if (mode === 'one-string') await oneString(link, seq, run, tell);
  else await separately(link, seq, run, tell, options.signal, sleep);
  run.running = false;
  link.note(`Sequence "${seq.name}" (${mode === 'one-string' ? 'one string' : 'separate sends'}): ${run.steps.map((s) => `step ${s.index + 1} ${s.outcome}`).join(', ')}${run.stopped ? `. ${run.stopped.message}` : '.'}`);
  tell();
  return run;
}

async function oneString(link: LiveLink, seq: LiveSequence, run: SequenceRun, tell: () => void) {
  for (const s of run.steps) s.outcome = 'sending';
  tell();
  const replies = seq.steps.map((s) => s.replyTemplate);
  const x = await link.exchange(seq.bytes, `${seq.name} (one string, ${seq.steps.length} steps)`, { steps: replies });
  run.whole = x;
  const decoded = replies.some((t) => t) ? decodeSequenceReply(replies, x.reply) : null;
  run.decoded = decoded;
  for (const s of run.steps) {
    const r = decoded?.steps.find((d) => d.step === s.index);
    if (!s.replyTemplate) s.outcome = 'sent';
    else if (r && r.end > r.start) {
      s.outcome = 'answered';
      s.reply = r;
    } else s.outcome = 'timed-out';
  }
  const silent = run.steps.find((s) => s.outcome === 'timed-out');
  if (silent) run.stopped = { by: 'timeout', message: noReplyMessage(silent, link.settings.responseTimeoutMs, false) };
}

async function separately(link: LiveLink, seq: LiveSequence, run: SequenceRun, tell: () => void, signal: AbortSignal | undefined, sleep: (ms: number) => Promise<void>) {
  const notSent = (from: number) => { for (const s of run.steps.slice(from)) s.outcome = 'not-sent'; };
  for (const step of seq.steps) {
    const p = run.steps[step.index]!;
    if (signal?.aborted) {
      notSent(step.index);
      run.stopped = { by: 'stop', message: `Stopped before step ${step.index + 1} (${step.name}); it and the steps after it were not sent.` };
      return;
    }
    p.outcome = 'sending';
    tell();
    const timeoutMs = step.waitForReplyMs ?? link.settings.responseTimeoutMs;
    let x: Exchange;
    p.sentAtMs = link.elapsed();
    try {
      x = await link.exchange(step.bytes, stepLabel(seq, step), step.replyTemplate, { timeoutMs, expectReply: step.replyTemplate !== null });
    } catch (e) {
      notSent(step.index);
      run.stopped = { by: 'error', message: `Step ${step.index + 1} (${step.name}) could not be sent: ${e instanceof Error ? e.message : String(e)}` };
      return;
    }
    p.exchange = x;
    if (step.replyTemplate) p.timeoutMs = timeoutMs;
    if (step.replyTemplate && x.endedBy === 'timeout') {
      p.outcome = 'timed-out';
      notSent(step.index + 1);
      run.stopped = { by: 'timeout', message: noReplyMessage(step, timeoutMs, step.index < seq.steps.length - 1) };
      return;
    }
    p.outcome = step.replyTemplate ? 'answered' : 'sent';
    tell();
    if (step.index < seq.steps.length - 1 && run.delayMs > 0) await sleep(run.delayMs);
  }
}
