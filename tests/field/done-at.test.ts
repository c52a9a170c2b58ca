/** When the work was done, as a phone reports it: the limits against the server's clock (docs/decisions/017). */
import { describe, expect, it } from 'vitest';
import { doneAtProblem } from '../../src/lib/field/done-at';

const NOW = new Date('2026-12-03T06:00:00.000Z');
const at = (iso: string) => new Date(iso);

describe('doneAtProblem', () => {
  it('takes the present, a time just inside 5 minutes ahead, and one just inside 90 days back', () => {
    expect(doneAtProblem(NOW, NOW)).toBeNull();
    expect(doneAtProblem(at('2026-12-03T06:05:00.000Z'), NOW)).toBeNull();
    // 90 days before 3 December 2026 06:00 UTC is 4 September 2026 06:00 UTC (counted by hand: 26 days of September after the 4th, 31 of October, 30 of November, 3 of December).
    expect(doneAtProblem(at('2026-09-04T06:00:00.000Z'), NOW)).toBeNull();
  });

  it('refuses a time a millisecond past either limit, naming what to do', () => {
    expect(doneAtProblem(at('2026-12-03T06:05:00.001Z'), NOW)).toMatch(/ahead of the server's clock .*check the phone's date and time/);
    expect(doneAtProblem(at('2026-09-04T05:59:59.999Z'), NOW)).toMatch(/more than 90 days ago/);
    expect(doneAtProblem(at('2027-12-03T06:00:00.000Z'), NOW)).toMatch(/525600 minutes ahead/);
  });
});
