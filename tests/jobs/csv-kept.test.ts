import { expect, it } from 'vitest';
import { keepChecked, takeChecked, type CheckedFile } from '../../src/lib/server/field/csv-file-check';
import type { CsvImportRequest } from '../../src/lib/schemas/field';

/** A preview's reading is kept for the apply of the very same body: same person, same mapping, the same text. */
const req = (csv: string, mapping: Record<string, string> = { tag: 'Tag' }): CsvImportRequest =>
  ({ machineId: 'mach_a', csv, mapping, apply: false, skipInvalid: false });
const file = (n: number): CheckedFile => ({ parseErrors: [], rows: Array.from({ length: n }, () => ({ ok: false, errors: [] })) });

it('gives the kept reading back once, for the same text only', () => {
  const reading = file(2);
  keepChecked('team_1', 'user_1', req('Tag\nA-1\nA-2'), reading, 1_000);
  // Another text of the same length, another mapping, another member: not theirs.
  expect(takeChecked('team_1', 'user_1', req('Tag\nA-1\nA-3'), 1_001)).toBeUndefined();
  expect(takeChecked('team_1', 'user_1', req('Tag\nA-1\nA-2', { tag: 'Tag', name: 'Tag' }), 1_001)).toBeUndefined();
  expect(takeChecked('team_1', 'user_2', req('Tag\nA-1\nA-2'), 1_001)).toBeUndefined();
  // The same body (a text equal to it, not the same string object) finds it, once.
  expect(takeChecked('team_1', 'user_1', req(['Tag', 'A-1', 'A-2'].join('\n')), 1_002)).toBe(reading);
  expect(takeChecked('team_1', 'user_1', req('Tag\nA-1\nA-2'), 1_003)).toBeUndefined();
});

it('a newer preview of another text of the same length replaces the older one', () => {
  keepChecked('team_1', 'user_1', req('Tag\nB-1'), file(1), 1_000);
  const newer = file(1);
  keepChecked('team_1', 'user_1', req('Tag\nB-2'), newer, 1_001);
  expect(takeChecked('team_1', 'user_1', req('Tag\nB-1'), 1_002)).toBeUndefined();
  expect(takeChecked('team_1', 'user_1', req('Tag\nB-2'), 1_002)).toBe(newer);
});

it('forgets a reading after ten minutes', () => {
  keepChecked('team_1', 'user_1', req('Tag\nC-1'), file(1), 0);
  expect(takeChecked('team_1', 'user_1', req('Tag\nC-1'), 10 * 60_000 + 1)).toBeUndefined();
});

it('keeps at most about two of the largest files\' text: the oldest goes first', () => {
  const big = (n: number) => `Tag\n${'x'.repeat(8 * 1024 * 1024 + n)}`;
  const [a, b, c] = [file(1), file(1), file(1)];
  keepChecked('team_2', 'user_1', req(big(1)), a, 1_000);
  keepChecked('team_2', 'user_1', req(big(2)), b, 1_001);
  keepChecked('team_2', 'user_1', req(big(3)), c, 1_002);
  expect(takeChecked('team_2', 'user_1', req(big(1)), 1_003)).toBeUndefined();
  expect(takeChecked('team_2', 'user_1', req(big(2)), 1_003)).toBe(b);
  expect(takeChecked('team_2', 'user_1', req(big(3)), 1_003)).toBe(c);
});
