/**
 * The shortcuts of a CSV import's reading give what the long way gives: a row read with the settings checks of
 * earlier rows equals the row read alone, and a creation revision's changes equal a diff from nothing.
 */
import { describe, expect, it } from 'vitest';
import { readCsvRow, type CsvMapping, type SettingsChecks } from '../../src/lib/field/csv';
import { changesFromNothing, diffSnapshots } from '../../src/lib/server/records/diff';

const mapping: CsvMapping = { tag: 'Tag', portName: 'Port', shorthand: 'Settings', nodeAddress: 'Address', handshake: 'Handshake', rtsMode: 'RTS' };
const rows = [
  { Tag: 'A-1', Port: 'Bus', Settings: '9600 8-N-1', Address: '1', Handshake: '', RTS: '' },
  { Tag: 'A-2', Port: 'Bus', Settings: '9600 8-N-1', Address: '1', Handshake: '', RTS: '' },
  { Tag: 'A-3', Port: 'Bus', Settings: '19200 8-E-1', Address: '247', Handshake: '', RTS: '' },
  // Refused by the settings schema (handshake rts-cts with RTS raised while transmitting), twice.
  { Tag: 'A-4', Port: 'Bus', Settings: '9600 8-N-1', Address: '1', Handshake: 'rts-cts', RTS: 'transmit' },
  { Tag: 'A-5', Port: 'Bus', Settings: '9600 8-N-1', Address: '1', Handshake: 'rts-cts', RTS: 'transmit' },
  { Tag: 'A-6', Port: 'Bus', Settings: '9600 8-N-1', Address: '0', Handshake: '', RTS: '' },
  { Tag: 'A-7', Port: 'Bus', Settings: '9600 8-N-1', Address: '65536', Handshake: '', RTS: '' },
];

describe('settings checks kept while reading a file', () => {
  it('give each row exactly what reading it alone gives, errors included', () => {
    const checks: SettingsChecks = new Map();
    for (const r of rows) expect(readCsvRow(r, mapping, checks)).toEqual(readCsvRow(r, mapping));
    // Five distinct settings among seven rows.
    expect(checks.size).toBe(5);
  });

  it('share one frozen settings object between rows with the same settings, so no row can change another', () => {
    const checks: SettingsChecks = new Map();
    const [a, b] = [readCsvRow(rows[0]!, mapping, checks), readCsvRow(rows[1]!, mapping, checks)];
    if (!a.ok || !b.ok) throw new Error('rows A-1 and A-2 are valid');
    expect(a.value.port!.settings).toBe(b.value.port!.settings);
    expect(Object.isFrozen(a.value.port!.settings)).toBe(true);
    expect(Object.isFrozen(a.value.port!.settings.frameRules)).toBe(true);
    expect(() => Object.assign(a.value.port!.settings, { baud: 1 })).toThrow(TypeError);
    // 9600 8-N-1, address 1 (from the row itself).
    expect(a.value.port!.settings).toMatchObject({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, nodeAddress: 1 });
  });

  it('keep the refusal of an address out of range, by the row it is on', () => {
    const checks: SettingsChecks = new Map();
    readCsvRow(rows[5]!, mapping, checks);
    const r = readCsvRow(rows[6]!, mapping, checks);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.column)).toEqual(['Address']);
  });
});

describe('changes of a creation revision', () => {
  const snapshots: Record<string, unknown>[] = [
    {},
    { tag: 'A-1', name: '', notes: null, profileId: undefined, version: 1, echo: false, zero: 0 },
    { settings: { baud: 9600, frameRules: { terminator: '\r\n' } }, wiring: [], bridges: [['a', 'b']] },
    { bad: Number.NaN, inf: Number.POSITIVE_INFINITY, when: new Date(0), bytes: '\u0000\u007f\u0080\u00ff' },
  ];
  it('are the diff from nothing (every field with a value, from null)', () => {
    for (const s of snapshots) expect(changesFromNothing(s)).toEqual(diffSnapshots({}, s));
  });
  it('leave out empty fields and take objects whole', () => {
    expect(changesFromNothing(snapshots[1]!)).toEqual([
      { field: 'tag', from: null, to: 'A-1' }, { field: 'name', from: null, to: '' }, { field: 'version', from: null, to: 1 },
      { field: 'echo', from: null, to: false }, { field: 'zero', from: null, to: 0 },
    ]);
    expect(changesFromNothing(snapshots[2]!).map((c) => c.field)).toEqual(['settings', 'wiring', 'bridges']);
  });
});
