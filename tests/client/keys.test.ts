/** The one key module: each factory's keys sit under its prefix, and no two requests (data shapes) share a key. */
import { describe, expect, it } from 'vitest';
import { commandKeys, fieldKeys, teamKeys, vaultKeys } from '../../src/lib/client/keys';

const under = (key: readonly unknown[], prefix: readonly unknown[]) => prefix.every((p, i) => key[i] === p);

describe('query keys', () => {
  const samples = {
    members: teamKeys.members('team_1'),
    devicesPage: vaultKeys.list('devices', { pageSize: 200, sort: 'tag' }),
    devicesTable: vaultKeys.list('devices', { params: 'page=1' }),
    device: vaultKeys.record('device', 'dev_1'),
    history: vaultKeys.history('device', 'dev_1', 1),
    search12: vaultKeys.search('DRV', 12),
    search8: vaultKeys.search('DRV', 8),
    trash: vaultKeys.trash(1),
    commands: commandKeys.list({ kind: 'device', id: 'dev_1' }),
    trashedCommands: commandKeys.list({ kind: 'device', id: 'dev_1' }, true),
    commandHistory: commandKeys.history('cmd_1'),
    copyTargets: commandKeys.copyTargets(),
    log: fieldKeys.log('dev_1'),
    attachments: fieldKeys.attachments('device', 'dev_1'),
    shares: fieldKeys.shares(),
  };

  it('gives every request its own key', () => {
    const seen = Object.values(samples).map((k) => JSON.stringify(k));
    expect(new Set(seen).size).toBe(seen.length);
  });

  it('keeps each entity under the prefix its saves invalidate', () => {
    for (const k of [samples.devicesPage, samples.device, samples.history, samples.search8, samples.trash]) expect(under(k, vaultKeys.all())).toBe(true);
    expect(under(samples.history, vaultKeys.historyOf('device', 'dev_1'))).toBe(true);
    for (const k of [samples.commands, samples.commandHistory, samples.copyTargets]) expect(under(k, commandKeys.all())).toBe(true);
    // The copy choices (devices and profiles mapped to options) are not a page of devices.
    expect(under(samples.copyTargets, vaultKeys.all())).toBe(false);
  });
});
