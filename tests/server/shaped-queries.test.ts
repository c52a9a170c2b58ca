/**
 * The device list's and the device search's statements are built once per shape (order, filters, paging; the number
 * of words) with placeholders, their values filled in per request (src/lib/server/vault/shaped-sql.ts). Whatever the options, the text and arguments must be exactly what drizzle builds from the same
 * statement with the values in place (the way every request built it before).
 */
import { describe, expect, it } from 'vitest';
import { SQLiteSyncDialect } from 'drizzle-orm/sqlite-core';
import type { SQL } from 'drizzle-orm';
import { deviceListQuery, deviceListStatement, DEVICE_SORTS, type DeviceListOptions } from '../../src/lib/server/vault/device-list-sql';
import { deviceSearchQuery, deviceSearchStatement } from '../../src/lib/server/vault/search-sql';

const dialect = new SQLiteSyncDialect();
const built = (statement: SQL) => {
  const q = dialect.sqlToQuery(statement);
  return { sql: q.sql, args: q.params };
};
const direct = (teamId: string, opts: DeviceListOptions) => built(deviceListStatement(teamId, opts));

const base: DeviceListOptions = { page: 1, pageSize: 50, sort: 'tag', dir: 'asc' };
const cases: [string, DeviceListOptions][] = [
  ...DEVICE_SORTS.flatMap((sort) => (['asc', 'desc'] as const).map((dir): [string, DeviceListOptions] => [`${sort} ${dir}`, { ...base, sort, dir }])),
  ['page 3 of 20', { ...base, page: 3, pageSize: 20 }],
  ['after a text key', { ...base, after: ['DRV-120', 'dev_abc'] }],
  ['after a time, newest first', { ...base, sort: 'updatedAt', dir: 'desc', after: [1764950400000, 'dev_x'] }],
  ['machine, role and words', { ...base, machineId: 'mach_1', role: 'drive', q: 'kiln drv 20' }],
  ['site, by site name', { ...base, sort: 'siteName', siteId: 'site_9', page: 2 }],
  ['words with nothing searchable', { ...base, q: '  -- ' }],
  ['an unknown order falls back to tag', { ...base, sort: 'constructor' }],
];

describe('deviceListQuery', () => {
  it.each(cases)('%s: the same text and arguments as building the statement with its values', (_name, opts) => {
    expect(deviceListQuery('team_a', opts)).toEqual(direct('team_a', opts));
  });

  it('reuses one text per shape: another team, page or cursor changes only the arguments', () => {
    const a = deviceListQuery('team_a', { ...base, after: ['A', 'dev_1'] });
    const b = deviceListQuery('team_b', { ...base, pageSize: 20, after: ['Z', 'dev_9'] });
    expect(b.sql).toBe(a.sql);
    expect(b.args).toEqual(direct('team_b', { ...base, pageSize: 20, after: ['Z', 'dev_9'] }).args);
    expect(b.args).not.toEqual(a.args);
  });
});

describe('deviceSearchQuery', () => {
  it.each([
    ['one word', 'kiln'], ['a prefix', 'DRV-20'], ['three words', 'plant 7 li'], ['eight words and more (the first eight)', 'a b c d e f g h i j'],
    ['letters of other scripts', 'Größe Ölpumpe'],
  ])('%s: the same text and arguments as building the statement with its values', (_name, q) => {
    expect(deviceSearchQuery('team_a', q, 20, 40)).toEqual(built(deviceSearchStatement('team_a', q, 20, 40)!));
  });

  it('is null when nothing searchable was typed, as the statement is', () => {
    expect(deviceSearchQuery('team_a', ' -- ', 20, 0)).toBeNull();
    expect(deviceSearchStatement('team_a', ' -- ', 20, 0)).toBeNull();
  });

  it('reuses one text per number of words', () => {
    const a = deviceSearchQuery('team_a', 'kiln 3', 20, 0)!;
    const b = deviceSearchQuery('team_b', 'press 9', 50, 50)!;
    expect(b.sql).toBe(a.sql);
    expect(b.args).toEqual(built(deviceSearchStatement('team_b', 'press 9', 50, 50)!).args);
  });
});
