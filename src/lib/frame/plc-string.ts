/**
 * A string against the PLC STRING it is assigned to: its length in characters (one per byte) now and with every
 * field at its widest, against the STRING's declared length. Used by the composer for one command and by
 * sequences (./sequence.ts) for the whole string or each step.
 */
import type { Finding } from './findings';
import { type UnlimitedField, longestFrame } from './longest';
import type { Template } from './template';

/** A finding with `range` in whole-string offsets; `step` (0-based) names the step it came from. */
export interface SequenceFinding extends Finding {
  step?: number;
}

export const stepName = (i: number) => `Step ${i + 1}`;
export const isCapacity = (c: number) => Number.isInteger(c) && c >= 1;

/** A field without a width limit, and the step it is in. */
type StepField = UnlimitedField & { step?: number };
/** The widest case of a string: its bytes (null = unbounded) and the fields that have no limit. */
export interface Widest {
  byteCount: number | null;
  unlimited: StepField[];
}

const listFields = (fields: readonly StepField[]) =>
  fields.map((f) => (f.step === undefined ? `"${f.label}"` : `"${f.label}" (${stepName(f.step).toLowerCase()})`)).join(', ');

/**
 * The capacity findings for one PLC string of `length` bytes starting at `at`: the actual string too long,
 * else the widest case too long (or unbounded). `what` names the string in the messages.
 */
export function capacityFindings(
  what: string, at: number, length: number, longest: Widest, capacity: number, advice: string,
): SequenceFinding[] {
  if (length > capacity) {
    return [{
      severity: 'error', code: 'plc-string-too-long', range: [at + capacity, at + length],
      message: `${what} is ${length} characters; the PLC string holds ${capacity}. Declare it STRING[${length}] or longer${advice}.`,
    }];
  }
  const numbers = longest.unlimited.filter((f) => f.countedAs !== null);
  const counted = numbers.length ? ` ${listFields(numbers)} ${numbers.length === 1 ? 'has' : 'have'} no width and no min and max, so ${numbers.length === 1 ? 'it is' : 'they are'} counted at ${numbers[0]!.countedAs} characters.` : '';
  if (longest.byteCount === null) {
    const texts = longest.unlimited.filter((f) => f.countedAs === null);
    return [{
      severity: 'error', code: 'plc-string-may-overflow',
      message: `${what} has no upper length: text field ${listFields(texts)} has no maxLength. Give ${texts.length === 1 ? 'it' : 'each'} a maxLength so the string always fits the ${capacity} characters the PLC string holds (the values given make ${length}).${counted}`,
    }];
  }
  if (longest.byteCount > capacity) {
    return [{
      severity: 'error', code: 'plc-string-may-overflow',
      message: `With every field at its widest, ${what.toLowerCase()} is ${longest.byteCount} characters, more than the ${capacity} the PLC string holds (the values given make ${length}). Narrow the fields (width, min and max, maxLength) or declare STRING[${longest.byteCount}].${counted}`,
    }];
  }
  return [];
}

/** One command's string against a PLC STRING that holds `capacity` characters (null = not recorded: no findings). */
export function plcStringFit(template: Template, byteCount: number, capacity: number | null): { capacity: number | null; length: number; longestLength: number | null; findings: SequenceFinding[] } {
  const longest = longestFrame(template);
  const findings = capacity !== null && isCapacity(capacity) ? capacityFindings('The string', 0, byteCount, longest, capacity, '') : [];
  return { capacity, length: byteCount, longestLength: longest.byteCount, findings };
}

