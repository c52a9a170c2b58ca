/**
 * A sequence as the save and the conflict notice compare it (docs/decisions/003): its fields by name, and its
 * `sequence` part by part: how it is sent, the pause between sends, and the steps compared as one part (steps
 * have no id of their own that would survive a reorder, so a change to any step is a change to "Steps").
 * The API takes `sequence` whole, so a re-apply sends it with their send mode and pause where only my steps
 * changed, and the other way round.
 */
import { same } from '../../lib/client/conflict';
import type { SavedSequence } from '../../lib/composer/saved-sequence';
import type { Template } from '../../lib/frame/template';
import type { DraftCompare } from './SaveBar';

/** The editable part of a sequence, as the sequence composer holds it. */
export interface SequenceDraft {
  name: string;
  purpose: string;
  notes: string;
  movesMachinery: boolean;
  portName: string;
  sequence: SavedSequence;
}

export const SEQUENCE_DRAFT_KEYS = ['name', 'purpose', 'notes', 'movesMachinery', 'portName', 'sequence'] as const;

const EMPTY: SavedSequence = { mode: 'one-string', delayMs: 0, steps: [] };

/**
 * The draft of a sequence (a saved command, or the composer's state), with the pause counted only when the
 * steps are sent separately: as one string there is none, whatever was stored.
 */
export function sequenceDraftOf(c: Omit<SequenceDraft, 'sequence'> & { sequence: SavedSequence | null }): SequenceDraft {
  const s = c.sequence ?? EMPTY;
  return {
    name: c.name,
    purpose: c.purpose,
    notes: c.notes,
    movesMachinery: c.movesMachinery,
    portName: c.portName,
    sequence: { mode: s.mode, delayMs: s.mode === 'separate' ? s.delayMs : 0, steps: s.steps },
  };
}

/** The fields of `draft` that differ from `base`: all that a save sends (`sequence` whole, as the API takes it). */
export function changedSequenceFields(base: SequenceDraft, draft: SequenceDraft): Partial<SequenceDraft> {
  return Object.fromEntries(SEQUENCE_DRAFT_KEYS.filter((k) => !same(base[k], draft[k])).map((k) => [k, draft[k]]));
}

/** A sequence as the API answers it. */
export type SavedSequenceCommand = Omit<SequenceDraft, 'sequence'> & { id: string; version: number; sequence: SavedSequence | null };

const NO_TEMPLATE: Template = { version: 1, segments: [] };

/** How the save bar compares and saves a sequence: part by part, a new one with an empty request template. */
export const sequenceCompare: DraftCompare<SequenceDraft, SavedSequenceCommand, SequenceDraft> = {
  shapeOf: sequenceDraftOf,
  changed: changedSequenceFields,
  reapply: (c) => ({ base: c.theirs, mine: c.merged }),
  createDefaults: { template: NO_TEMPLATE },
};
