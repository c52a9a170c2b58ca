/**
 * Saved sequences: a library command whose bytes are other commands' strings in order. Each step is a
 * reference to a library command of the same device or profile (its template as it is now, the step's values
 * over the command's saved values, its reply template) or an inline step with its own template. A step whose
 * command is in the trash or purged is a gap: it stays in the sequence, named, with an error finding.
 */
import { assembleSequence, type AssembledSequence, type SequenceOptions, type SequenceStepInput } from '../frame/sequence';
import type { SequenceMode } from '../frame/sequence-limits';
import type { FieldValues, Template } from '../frame/template';

export interface SavedSequenceStep {
  /** A library command of the same owner (device or profile), by id. */
  commandId?: string;
  /** An inline step's own template (never with `commandId`). */
  template?: Template;
  /** The step's values: over the referenced command's saved values, or the inline template's. */
  values: FieldValues;
  /** An inline step's reply template (a reference step expects its command's reply); null = none. */
  replyTemplate?: Template | null;
  /** `separate` only: wait for this step's reply, at most this long (ms), before the next send. */
  waitForReplyMs?: number;
}

export interface SavedSequence {
  mode: SequenceMode;
  /** `separate` only: idle time between two sends, ms. */
  delayMs: number;
  steps: SavedSequenceStep[];
}

/** A command a step can point at, as the caller found it (absent from the lookup = purged or never there). */
export interface StepCommand {
  id: string;
  name: string;
  template: Template;
  fieldValues: FieldValues;
  replyTemplate: Template | null;
  /** True when the command is itself a sequence (not usable as a step). */
  isSequence: boolean;
  /** True when it is in the trash. */
  trashed: boolean;
}

export type StepState = 'ok' | 'trash' | 'purged' | 'sequence';

/** A step as shown: what it is, and the gap when its command cannot be used. */
export interface StepInfo {
  index: number;
  kind: 'command' | 'inline';
  commandId: string | null;
  /** The command's name, or `Inline step`; `(purged command)` when it is gone. */
  name: string;
  state: StepState;
  /** Why the step cannot be sent, in words (present only for a gap). */
  gap?: string;
}

const EMPTY: Template = { version: 1, segments: [] };

/** What each step is, and for a reference whose command cannot be used, the gap in words. */
export function describeSteps(seq: SavedSequence, lookup: (id: string) => StepCommand | undefined): StepInfo[] {
  return seq.steps.map((s, index) => {
    if (!s.commandId) return { index, kind: 'inline', commandId: null, name: 'Inline step', state: 'ok' };
    const c = lookup(s.commandId);
    const at = `Step ${index + 1}`;
    if (!c) return { index, kind: 'command', commandId: s.commandId, name: '(purged command)', state: 'purged', gap: `${at}: its command was purged from the trash; replace the step or remove it.` };
    if (c.trashed) return { index, kind: 'command', commandId: c.id, name: c.name, state: 'trash', gap: `${at}: the command "${c.name}" is in the trash; restore it or replace the step.` };
    if (c.isSequence) return { index, kind: 'command', commandId: c.id, name: c.name, state: 'sequence', gap: `${at}: "${c.name}" is itself a sequence; a step must be a single command. Replace the step.` };
    return { index, kind: 'command', commandId: c.id, name: c.name, state: 'ok' };
  });
}

/** The engine's input for each step: a gap gives an empty step (so indexes and spans stay in place). */
export function sequenceInputs(seq: SavedSequence, lookup: (id: string) => StepCommand | undefined): SequenceStepInput[] {
  const info = describeSteps(seq, lookup);
  return seq.steps.map((s, i) => {
    const wait = s.waitForReplyMs === undefined ? {} : { waitForReplyMs: s.waitForReplyMs };
    if (!s.commandId) return { template: s.template ?? EMPTY, values: s.values, reply: s.replyTemplate ?? null, ...wait };
    if (info[i]!.state !== 'ok') return { template: EMPTY, values: {} };
    const c = lookup(s.commandId)!;
    return { template: c.template, values: { ...c.fieldValues, ...s.values }, reply: c.replyTemplate, ...wait };
  });
}

/**
 * Assembles a saved sequence as the composer and the card show it. A gap step takes no bytes, and its own
 * findings are replaced by one error (`step-command-missing`) saying what to do, so the preview never
 * silently drops it.
 */
export function assembleSaved(seq: SavedSequence, lookup: (id: string) => StepCommand | undefined, options: Omit<SequenceOptions, 'mode' | 'delayMs'> = {}): AssembledSequence & { info: StepInfo[] } {
  const info = describeSteps(seq, lookup);
  const s = assembleSequence(sequenceInputs(seq, lookup), { ...options, mode: seq.mode, ...(seq.mode === 'separate' ? { delayMs: seq.delayMs } : {}) });
  if (!info.some((i) => i.gap)) return { ...s, info };
  for (const step of s.steps) {
    const gap = info[step.index]!.gap;
    if (gap) step.findings = [{ severity: 'error', code: 'step-command-missing', step: step.index, message: gap }];
  }
  const findings = s.steps.flatMap((x) => x.findings).concat(s.findings.filter((f) => f.step === undefined));
  return { ...s, ok: false, findings, info };
}

/** Every command id the sequence's steps point at. */
export const referencedIds = (seq: SavedSequence | null | undefined): string[] => (seq ? seq.steps.flatMap((s) => (s.commandId ? [s.commandId] : [])) : []);
