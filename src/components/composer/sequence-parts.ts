/** A sequence's compared parts in words, for the conflict notice (loaded with it, only when a save meets a 409). */
import { showValue } from '../../lib/client/conflict';
import type { SavedSequenceStep } from '../../lib/composer/saved-sequence';

const NAMES: Record<string, string> = {
  name: 'Sequence name', purpose: 'Purpose', notes: 'Notes', movesMachinery: 'Moves machinery', portName: 'Port',
  sequence: 'Sequence', mode: 'How it is sent', delayMs: 'Pause between sends', steps: 'Steps',
};

/** Names a compared part for people: `['sequence', 'steps']` is "Steps". */
export function sequencePartLabel(path: readonly string[]): string {
  const last = path[path.length - 1] ?? '';
  return NAMES[last] ?? last;
}

function describeStep(step: SavedSequenceStep, i: number, nameOf: (id: string) => string | undefined): string {
  const name = step.commandId ? nameOf(step.commandId) ?? '(command not in this library)' : 'Inline step';
  const values = Object.entries(step.values).map(([k, v]) => `${k} ${showValue(v)}`).join(', ');
  const wait = step.waitForReplyMs === undefined ? '' : `, waits up to ${step.waitForReplyMs} ms for its reply`;
  return `${i + 1}. ${name}${values ? ` (${values})` : ''}${wait}`;
}

/** A compared value in words: the steps by their commands' names and their own values, a mode and a pause as read. */
export function sequencePartValue(path: readonly string[], value: unknown, nameOf: (id: string) => string | undefined): string {
  const last = path[path.length - 1];
  if (path[0] === 'sequence' && last === 'steps' && Array.isArray(value)) {
    return value.length ? (value as SavedSequenceStep[]).map((s, i) => describeStep(s, i, nameOf)).join(' · ') : 'no steps';
  }
  if (last === 'mode') return value === 'separate' ? 'As separate sends' : value === 'one-string' ? 'As one string' : showValue(value);
  if (last === 'delayMs' && typeof value === 'number') return `${value} ms`;
  return showValue(value);
}
