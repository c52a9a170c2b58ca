/**
 * Writes that are not edits (moving to the trash, restoring a revision) meeting a 409: the notice shows their change
 * alone, counted from the version the user was looking at, and nothing of the record's bookkeeping.
 */
import { describe, expect, it } from 'vitest';
import { compareVersions } from '../../src/lib/client/conflict';
import { revisionPartLabel, revisionPartValue, snapshotShape } from '../../src/components/vault/revision-parts';
import { commandShape, orderRows, segmentIsLeaf } from '../../src/components/composer/command-conflict';
import { draftOf, type CommandDraft } from '../../src/components/composer/types';
import type { Segment, Template } from '../../src/lib/frame/template';

/** What the user saw and sends again: "mine" is the version seen, so only their change can show. */
const theirChange = <S,>(seen: S, theirs: S, isLeaf?: Parameters<typeof compareVersions>[3]) => compareVersions(seen, seen, theirs, isLeaf);
const rowsOf = (c: ReturnType<typeof theirChange>) => c.rows.map((r) => [r.path.join('.'), r.base, r.theirs, r.theirsChanged, r.mineChanged, r.clash]);

describe('restoring a vault revision over a newer version', () => {
  // A port revision's snapshot, and the port row the 409 answers with (version, dates, owner and position too).
  const seen = { name: 'Aux', position: 0, settings: { interface: 'rs232', baud: 9600, parity: 'none' }, wiring: [], notes: '' };
  const row = {
    id: 'port_1', teamId: 'team_1', deviceId: 'dev_1', version: 3, updatedAt: '2026-01-02T03:04:05.000Z', updatedBy: 'user_2',
    deletedAt: null, trashId: null, ...seen, settings: { ...seen.settings, baud: 19200 }, notes: 'swapped unit',
  };

  it('compares only the fields a revision keeps, setting by setting, and names them as the port form does', () => {
    const shape = snapshotShape(seen);
    expect(Object.keys(shape(row))).toEqual(['name', 'position', 'settings', 'wiring', 'notes']);
    const c = theirChange(shape(seen), shape(row));
    expect(rowsOf(c)).toEqual([
      ['settings.baud', 9600, 19200, true, false, false],
      ['notes', '', 'swapped unit', true, false, false],
    ]);
    expect(c.minePaths).toEqual([]);
    expect(c.rows.map((r) => revisionPartLabel('port', r.path))).toEqual(['Baud rate', 'Notes']);
    expect(revisionPartValue('port', ['settings', 'interface'], 'rs232')).toBe('RS-232');
    expect(revisionPartValue('port', ['notes'], '')).toBe('—');
  });

  it('names other records’ parts by field, as the history table does, and counts a field they emptied', () => {
    const device = { machineId: 'mach_1', profileId: null, tag: 'DRV-1', location: 'Cabinet 2', firmware: '1.4' };
    const shape = snapshotShape(device);
    const c = theirChange(shape(device), shape({ ...device, version: 7, location: null, updatedAt: 'now' }));
    expect(rowsOf(c)).toEqual([['location', 'Cabinet 2', null, true, false, false]]);
    expect(revisionPartLabel('device', c.rows[0]!.path)).toBe('location');
    expect(revisionPartValue('device', c.rows[0]!.path, null)).toBe('—');
  });

  it('has no rows when the newer version changed nothing the revision keeps', () => {
    const shape = snapshotShape(seen);
    expect(theirChange(shape(seen), shape({ ...seen, version: 4, updatedAt: 'later' })).rows).toEqual([]);
  });
});

describe('moving a command to the trash, or restoring one, over a newer version', () => {
  const lit = (id: string, bytes: string): Segment => ({ type: 'literal', id, bytes });
  const tpl = (...segments: Segment[]): Template => ({ version: 1, segments });
  const listed: CommandDraft & { id: string; version: number } = {
    id: 'cmd_1', version: 2, name: 'Jog +1°', purpose: 'jog forward', notes: '', movesMachinery: true, safeToRepeat: false, setsUpDevice: false,
    template: tpl(lit('s1', '31'), lit('s2', '00 7F 80 FF'), { type: 'terminator', id: 'end', bytes: '0D' } as Segment),
    fieldValues: {}, replyTemplate: null, portName: 'RS-232', rawUnits: {}, presets: [],
  };
  // The 409's command: their purpose and their segment order, with the row's own columns besides.
  const current = {
    ...listed, version: 3, teamId: 'team_1', deviceId: 'dev_1', profileId: null, updatedAt: 'now', updatedBy: 'user_2', deletedAt: null,
    purpose: 'jog forward 1°', template: tpl(lit('s2', '00 7F 80 FF'), lit('s1', '31'), { type: 'terminator', id: 'end', bytes: '0D' } as Segment),
  };

  it('shows their purpose and their segment move as their change, and nothing as mine', () => {
    const [seen, theirs] = [draftOf(listed), draftOf(current)];
    const c = compareVersions(commandShape(seen), commandShape(seen), commandShape(theirs), segmentIsLeaf);
    expect(rowsOf(c)).toEqual([['purpose', 'jog forward', 'jog forward 1°', true, false, false]]);
    expect(orderRows(seen, seen, theirs).map((r) => [r.path, r.theirs, r.theirsChanged, r.mineChanged, r.clash]))
      .toEqual([[['template', ''], ['s2', 's1', 'end'], true, false, false]]);
    expect(c.minePaths).toEqual([]);
  });
});
