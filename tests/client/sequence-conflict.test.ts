/**
 * A sequence's save meeting a 409 (docs/decisions/003): compared field by field, its send mode and pause apart
 * and its steps as one part; only my changes are re-sent, `sequence` whole as the API takes it. Expected values
 * written by hand from the three versions below.
 */
import { describe, expect, it } from 'vitest';
import { changedFields, compareVersions } from '../../src/lib/client/conflict';
import type { SavedSequence } from '../../src/lib/composer/saved-sequence';
import { changedSequenceFields, sequenceDraftOf, type SequenceDraft } from '../../src/components/composer/sequence-conflict';
import { sequencePartLabel, sequencePartValue } from '../../src/components/composer/sequence-parts';

const steps = [{ commandId: 'cmd_a', values: {} }, { commandId: 'cmd_b', values: { speed: '0.5' } }];
const seq = (over: Partial<SavedSequence> = {}): SavedSequence => ({ mode: 'one-string', delayMs: 0, steps, ...over });
const draft = (over: Partial<SequenceDraft> = {}): SequenceDraft => ({
  name: 'Four-move', purpose: '', notes: '', movesMachinery: true, portName: 'Service RS-232', sequence: seq(), ...over,
});
const names: Record<string, string> = { cmd_a: 'Acceleration', cmd_b: 'Velocity' };
const nameOf = (id: string) => names[id];

function conflict(base: SequenceDraft, mine: SequenceDraft, theirs: SequenceDraft) {
  const c = compareVersions(sequenceDraftOf(base), sequenceDraftOf(mine), sequenceDraftOf(theirs));
  return { ...c, body: changedSequenceFields(sequenceDraftOf(theirs), c.merged) };
}

describe('saving a sequence', () => {
  it('sends only the fields changed since it was opened, the sequence whole', () => {
    const base = draft();
    expect(changedSequenceFields(base, draft({ notes: 'ramp first' }))).toEqual({ notes: 'ramp first' });
    expect(changedSequenceFields(base, draft({ sequence: seq({ mode: 'separate', delayMs: 5 }) }))).toEqual({ sequence: seq({ mode: 'separate', delayMs: 5 }) });
    expect(changedSequenceFields(base, draft())).toEqual({});
  });

  it('counts no pause for one string, whatever was stored', () => {
    expect(sequenceDraftOf({ ...draft(), sequence: seq({ delayMs: 40 }) }).sequence.delayMs).toBe(0);
    expect(sequenceDraftOf({ ...draft(), sequence: seq({ mode: 'separate', delayMs: 40 }) }).sequence.delayMs).toBe(40);
    expect(changedSequenceFields(draft(), { ...draft(), sequence: sequenceDraftOf({ ...draft(), sequence: seq({ delayMs: 40 }) }).sequence })).toEqual({});
  });
});

describe('a sequence conflict', () => {
  it('keeps their send mode and pause and re-sends the sequence with my steps, and my name', () => {
    const base = draft();
    const mine = draft({ name: 'Four-move (slow)', sequence: seq({ steps: [...steps].reverse() }) });
    const theirs = draft({ sequence: seq({ mode: 'separate', delayMs: 5 }), purpose: 'index the table' });
    const { rows, merged, body, minePaths } = conflict(base, mine, theirs);
    expect(rows.map((r) => [r.path.join('/'), r.theirsChanged, r.mineChanged, r.clash])).toEqual([
      ['name', false, true, false],
      ['purpose', true, false, false],
      ['sequence/mode', true, false, false],
      ['sequence/delayMs', true, false, false],
      ['sequence/steps', false, true, false],
    ]);
    expect(merged).toEqual(draft({ name: 'Four-move (slow)', purpose: 'index the table', sequence: { mode: 'separate', delayMs: 5, steps: [...steps].reverse() } }));
    expect(body).toEqual({ name: 'Four-move (slow)', sequence: { mode: 'separate', delayMs: 5, steps: [...steps].reverse() } });
    expect(changedFields({ ...merged }, minePaths)).toEqual(body);
  });

  it('says when both changed the steps, and mine replace theirs there', () => {
    const base = draft();
    const mine = draft({ sequence: seq({ steps: [steps[0]!] }) });
    const theirs = draft({ sequence: seq({ steps: [...steps, { template: { version: 1, segments: [] }, values: { angle: 45 } }] }) });
    const { rows, merged } = conflict(base, mine, theirs);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ path: ['sequence', 'steps'], clash: true });
    expect(merged.sequence.steps).toEqual([steps[0]]);
  });

  it('sends nothing of the sequence when only they changed it', () => {
    const { body } = conflict(draft(), draft({ notes: 'mine' }), draft({ sequence: seq({ steps: [steps[1]!] }) }));
    expect(body).toEqual({ notes: 'mine' });
  });
});

describe('a sequence in words', () => {
  it('names each part and reads the steps by their commands and values', () => {
    expect(sequencePartLabel(['name'])).toBe('Sequence name');
    expect(sequencePartLabel(['sequence', 'steps'])).toBe('Steps');
    expect(sequencePartLabel(['sequence', 'delayMs'])).toBe('Pause between sends');
    expect(sequencePartValue(['sequence', 'steps'], [...steps, { template: { version: 1, segments: [] }, values: { angle: 45 }, waitForReplyMs: 500 }, { commandId: 'cmd_gone', values: {} }], nameOf))
      .toBe('1. Acceleration · 2. Velocity (speed 0.5) · 3. Inline step (angle 45), waits up to 500 ms for its reply · 4. (command not in this library)');
    expect(sequencePartValue(['sequence', 'steps'], [], nameOf)).toBe('no steps');
    expect(sequencePartValue(['sequence', 'mode'], 'separate', nameOf)).toBe('As separate sends');
    expect(sequencePartValue(['sequence', 'delayMs'], 5, nameOf)).toBe('5 ms');
    expect(sequencePartValue(['movesMachinery'], true, nameOf)).toBe('on');
  });
});
