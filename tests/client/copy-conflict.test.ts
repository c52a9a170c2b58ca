/** Copying settings onto a port someone saved after the preview: their change beside what copying sets. */
import { describe, expect, it } from 'vitest';
import { copyConflictRows, staleTargets, type CopyPreview } from '../../src/components/vault/copy-conflict';

const pair = (targetPortId: string, targetVersion: number, changes: CopyPreview['pairs'][number]['changes']) =>
  ({ sourceLabel: 'DRV-201 RS-485', targetPortId, targetLabel: `DRV-203 ${targetPortId}`, targetVersion, changes });

describe('copy conflict rows', () => {
  const previewed: CopyPreview = {
    applied: false, unmatched: [],
    pairs: [
      pair('p1', 4, [{ field: 'settings.baud', from: 19200, to: 9600 }, { field: 'settings.parity', from: 'none', to: 'even' }]),
      pair('p2', 1, [{ field: 'settings.baud', from: 19200, to: 9600 }]),
    ],
  };

  it('compares only the targets saved since the preview, setting by setting', () => {
    // Someone set p1's parity to even (as the source has it) and its stop bits to 2; p2 is untouched.
    const fresh: CopyPreview = {
      applied: false, unmatched: [],
      pairs: [
        pair('p1', 5, [{ field: 'settings.baud', from: 19200, to: 9600 }, { field: 'settings.stopBits', from: 2, to: 1 }]),
        pair('p2', 1, [{ field: 'settings.baud', from: 19200, to: 9600 }]),
      ],
    };
    expect(staleTargets(previewed, fresh).map((p) => p.targetPortId)).toEqual(['p1']);
    expect(copyConflictRows(previewed, fresh)).toEqual([
      { path: ['p1', 'settings.baud'], base: 19200, theirs: 19200, mine: 9600, theirsChanged: false, mineChanged: true, clash: false },
      { path: ['p1', 'settings.parity'], base: 'none', theirs: 'even', mine: 'even', theirsChanged: true, mineChanged: false, clash: false },
      { path: ['p1', 'settings.stopBits'], base: 1, theirs: 2, mine: 1, theirsChanged: true, mineChanged: true, clash: true },
    ]);
  });

  it('has no rows when nothing was saved since', () => {
    expect(copyConflictRows(previewed, previewed)).toEqual([]);
  });
});
