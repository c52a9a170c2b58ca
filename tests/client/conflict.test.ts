/** The one conflict path (docs/decisions/003): which parts each side changed, the rows shown, the re-apply payload. */
import { describe, expect, it } from 'vitest';
import { changedFields, changedPaths, compareVersions, keyed, mergedList, mergeOrder, reapply, reordered, same, setAt, showValue } from '../../src/lib/client/conflict';

const port = (over: Record<string, unknown> = {}, settings: Record<string, unknown> = {}) => ({
  name: 'RS-485',
  settings: { interface: 'rs485-2w', baud: 9600, parity: 'even', nodeAddress: 3, frameRules: { terminator: '0D', byteSet: '8-bit' }, ...settings },
  wiring: [{ pin: '1', signal: 'D+', colour: 'red' }],
  notes: '',
  ...over,
});

describe('changed paths', () => {
  it('names each changed leaf; arrays are compared whole; a missing key equals undefined', () => {
    const base = port();
    const next = port({ wiring: [{ pin: '1', signal: 'D+', colour: 'orange' }] }, { baud: 19200, frameRules: { terminator: '0D 0A', byteSet: '8-bit' }, tcpHost: undefined });
    expect(changedPaths(base, next)).toEqual([['settings', 'baud'], ['settings', 'frameRules', 'terminator'], ['wiring']]);
    expect(changedPaths(base, structuredClone(base))).toEqual([]);
  });

  it('stops at the level the form edits (a segment is one part)', () => {
    const a = { template: { s1: { type: 'literal', bytes: '41' } } };
    const b = { template: { s1: { type: 'literal', bytes: '42' } } };
    expect(changedPaths(a, b)).toEqual([['template', 's1', 'bytes']]);
    expect(changedPaths(a, b, (p) => p.length === 2)).toEqual([['template', 's1']]);
  });

  it('treats a value that turns into an object (or back) as one part', () => {
    expect(changedPaths({ reply: null }, { reply: { a: 1 } })).toEqual([['reply']]);
    expect(same(Number.NaN, Number.NaN)).toBe(true);
    expect(same({ a: 1, b: undefined }, { a: 1 })).toBe(true);
    expect(same([1, 2], [2, 1])).toBe(false);
  });
});

describe('comparing mine with theirs', () => {
  it('keeps their parity and my baud: the re-apply sends only my field, whole, with their change inside', () => {
    const base = port();
    const mine = port({}, { baud: 19200 });
    const theirs = port({ notes: 'swapped unit' }, { parity: 'none' });
    const c = compareVersions(base, mine, theirs);
    expect(c.minePaths).toEqual([['settings', 'baud']]);
    expect(c.rows).toEqual([
      { path: ['settings', 'baud'], base: 9600, theirs: 9600, mine: 19200, theirsChanged: false, mineChanged: true, clash: false },
      { path: ['settings', 'parity'], base: 'even', theirs: 'none', mine: 'even', theirsChanged: true, mineChanged: false, clash: false },
      { path: ['notes'], base: '', theirs: 'swapped unit', mine: '', theirsChanged: true, mineChanged: false, clash: false },
    ]);
    expect(c.merged).toEqual(port({ notes: 'swapped unit' }, { baud: 19200, parity: 'none' }));
    // The API replaces `settings` as a whole: it goes whole, and `notes` (theirs only) is not sent at all.
    expect(changedFields(c.merged as Record<string, unknown>, c.minePaths)).toEqual({ settings: { ...theirs.settings, baud: 19200 } });
  });

  it('marks a part both changed differently as a clash, and the same change as none', () => {
    const base = { location: 'A', firmware: '1.0', name: 'Scale' };
    const mine = { location: 'B', firmware: '1.1', name: 'Scale' };
    const theirs = { location: 'C', firmware: '1.1', name: 'Scale 2' };
    const c = compareVersions(base, mine, theirs);
    expect(c.rows.map((r) => [r.path[0], r.theirsChanged, r.mineChanged, r.clash])).toEqual([
      ['location', true, true, true],
      ['firmware', true, true, false],
      ['name', true, false, false],
    ]);
    expect(c.merged).toEqual({ location: 'B', firmware: '1.1', name: 'Scale 2' });
    expect(changedFields(c.merged, c.minePaths)).toEqual({ location: 'B', firmware: '1.1' });
  });

  it('shows an item they removed and I edited as one row, and puts my whole item back', () => {
    const base = { members: keyed([{ portId: 'p1', role: 'master' }, { portId: 'p2', role: 'slave' }], (m) => m.portId) };
    const mine = { members: { ...base.members, p2: { portId: 'p2', role: 'peer' } } };
    const theirs = { members: { p1: base.members.p1 } };
    const c = compareVersions(base, mine, theirs);
    expect(c.rows).toEqual([
      { path: ['members', 'p2'], base: { portId: 'p2', role: 'slave' }, theirs: undefined, mine: { portId: 'p2', role: 'peer' }, theirsChanged: true, mineChanged: true, clash: true },
    ]);
    expect(c.merged).toEqual(mine);
  });

  it('removes what I removed and keeps what they added', () => {
    const base = { members: { p1: { role: 'master' }, p2: { role: 'slave' } } };
    const mine = { members: { p1: { role: 'master' } } };
    const theirs = { members: { p1: { role: 'master' }, p2: { role: 'slave' }, p3: { role: 'slave' } } };
    expect(compareVersions(base, mine, theirs).merged).toEqual({ members: { p1: { role: 'master' }, p3: { role: 'slave' } } });
  });

  it('re-applies nothing of theirs over mine when I changed nothing', () => {
    const base = { a: 1, b: 2 };
    const c = compareVersions(base, { ...base }, { a: 5, b: 2 });
    expect(c.minePaths).toEqual([]);
    expect(c.merged).toEqual({ a: 5, b: 2 });
    expect(changedFields(c.merged, c.minePaths)).toEqual({});
  });

  it('sets and removes by path without touching the original', () => {
    const o = { a: { b: 1, c: 2 } };
    expect(setAt(o, ['a', 'b'], undefined)).toEqual({ a: { c: 2 } });
    expect(setAt(o, ['x', 'y'], 0x00)).toEqual({ a: { b: 1, c: 2 }, x: { y: 0 } });
    expect(o).toEqual({ a: { b: 1, c: 2 } });
    expect(reapply({ k: 'mine' }, { k: 'theirs', j: 1 }, [['k']])).toEqual({ k: 'mine', j: 1 });
  });
});

describe('the order of a merged list', () => {
  const all = (...ids: string[]) => new Set(ids);
  it('keeps their order and additions, drops my removals, puts my additions after the item they follow in mine', () => {
    expect(mergeOrder(['a', 'b', 'c'], ['a', 'x', 'b'], ['a', 'b', 'c', 'y'], all('a', 'x', 'b', 'y'))).toEqual(['a', 'x', 'b', 'y']);
    expect(mergeOrder(['a', 'b'], ['x', 'a', 'b'], ['b'], all('x', 'b'))).toEqual(['x', 'b']);
  });

  it('follows my order where I moved items, and tells a move from an addition', () => {
    expect(reordered(['a', 'b', 'c'], ['a', 'b', 'c', 'd'])).toBe(false);
    expect(reordered(['a', 'b', 'c'], ['b', 'a', 'c'])).toBe(true);
    expect(mergeOrder(['a', 'b', 'c'], ['c', 'b', 'a'], ['a', 'b', 'z', 'c'], all('a', 'b', 'c', 'z'))).toEqual(['c', 'b', 'z', 'a']);
  });

  it('puts an item I edited and they removed back where it was in mine', () => {
    const merged = { a: 'A', b: 'B2', c: 'C' };
    expect(mergedList(merged, { base: ['a', 'b', 'c'], mine: ['a', 'b', 'c'], theirs: ['a', 'c'] })).toEqual(['A', 'B2', 'C']);
  });

  it('works with empty lists', () => {
    expect(mergeOrder([], [], [], all())).toEqual([]);
    expect(mergeOrder([], ['a'], [], all('a'))).toEqual(['a']);
  });
});

describe('showing values', () => {
  it('reads blanks as a dash, booleans as on/off, objects as JSON', () => {
    expect([showValue(''), showValue(null), showValue(undefined), showValue(true), showValue(false), showValue(0), showValue({ a: 1 })]).toEqual(['—', '—', '—', 'on', 'off', '0', '{"a":1}']);
  });
});
