/** JSON export and import (validation, idempotence, round trip) and CSV import and export. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, makeLink, makeMachine, makeProfile, makeSite } from './vault-fixtures';
import { makeCommand } from './command-fixtures';
import { withoutIds } from '../../src/lib/field/export-check';

let source: TeamFixture;
let target: TeamFixture;
beforeAll(async () => {
  [source, target] = await Promise.all([createTeamWithRoles('export'), createTeamWithRoles('import')]);
}, 60_000);

async function siteTree(c: TeamFixture['members']['owner']) {
  const site = await makeSite(c);
  const m = await makeMachine(c, site.id);
  const profile = await makeProfile(c);
  const a = await makeDevice(c, m.id, { profileId: profile.id, tag: 'RT-A' });
  const b = await makeDevice(c, m.id, { tag: 'RT-B', ports: [{ name: 'Bus', settings: { interface: 'rs485-2w', baud: 19200, parity: 'even', nodeAddress: 7, termination: true }, wiring: [{ pin: '1', signal: 'D+', colour: 'orange' }] }] });
  await makeLink(c, m.id, [{ portId: a.ports[0].id, role: 'master' }, { portId: b.ports[0].id, role: 'slave' }]);
  await makeCommand(c, { deviceId: a.id });
  await makeCommand(c, { profileId: profile.id });
  return { site, m };
}

async function count(teamId: string, table: string): Promise<number> {
  const db = testDb();
  try {
    return Number((await db.execute({ sql: `SELECT count(*) AS n FROM ${table} WHERE team_id = ?`, args: [teamId] })).rows[0]!.n);
  } finally {
    db.close();
  }
}

describe('JSON export and import', () => {
  it('round-trips: export, import elsewhere, export again gives the same document apart from ids and times', async () => {
    const { site } = await siteTree(source.members.engineer);
    const first = expectOk(await source.members.engineer.get(`/api/export?siteId=${site.id}`));
    expect(first).toMatchObject({ format: 'baudbook-export', version: 2, source: { scope: 'site' } });
    expect(first.devices).toHaveLength(2);
    expect(first.commands).toHaveLength(2);
    expect(first.links[0].members).toHaveLength(2);

    const preview = expectOk(await target.members.engineer.post('/api/import', { document: first }));
    expect(preview.applied).toBe(false);
    expect(preview.counts.devices).toEqual({ create: 2, existing: 0 });
    expect(await count(target.teamId, 'device')).toBe(0);

    const applied = expectOk(await target.members.engineer.post('/api/import', { document: first, apply: true }), 201);
    expect(applied.counts.ports).toEqual({ create: 3, existing: 0 });
    const importedSite = expectOk(await target.members.engineer.get('/api/sites?pageSize=5')).items[0];
    const second = expectOk(await target.members.engineer.get(`/api/export?siteId=${importedSite.id}`));
    expect(second.devices[0].id).not.toBe(first.devices[0].id);
    expect(withoutIds(second)).toEqual(withoutIds(first));
    const revs = expectOk(await target.members.engineer.get(`/api/revisions?entityType=device&entityId=${second.devices[0].id}`));
    expect(revs.items[0].summary).toMatch(/^Imported from/);
  });

  it('imports the same file twice without duplicating anything', async () => {
    const fresh = await createTeamWithRoles('import-twice');
    await siteTree(source.members.owner);
    const doc = expectOk(await source.members.owner.get('/api/export'));
    expectOk(await fresh.members.admin.post('/api/import', { document: doc, apply: true }), 201);
    const before = await Promise.all(['site', 'machine', 'device', 'port', 'link', 'device_profile', 'command', 'revision'].map((t) => count(fresh.teamId, t)));
    const again = expectOk(await fresh.members.admin.post('/api/import', { document: doc, apply: true }), 201);
    for (const c of Object.values(again.counts) as { create: number }[]) expect(c.create).toBe(0);
    expect(again.counts.sites.existing).toBe(doc.sites.length);
    const after = await Promise.all(['site', 'machine', 'device', 'port', 'link', 'device_profile', 'command', 'revision'].map((t) => count(fresh.teamId, t)));
    expect(after).toEqual(before);
  });

  it('refuses documents that are not ours, of another version, malformed or with dangling references; nothing is written', async () => {
    const eng = target.members.engineer;
    const devicesBefore = await count(target.teamId, 'device');
    const base = expectOk(await source.members.owner.get('/api/export'));
    const bad = [
      { format: 'something-else', version: 1 },
      { ...base, version: 3 },
      { ...base, devices: [{ ...base.devices[0], tag: '' }] },
      { ...base, ports: [...base.ports, { ...base.ports[0], id: 'port_dangling', deviceId: 'dev_missing', name: 'Extra' }] },
      { ...base, devices: [...base.devices, { ...base.devices[0] }] },
    ];
    for (const document of bad) {
      const res = await eng.post('/api/import', { document, apply: true });
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(res.body.error).toMatch(/document/);
    }
    expect(await count(target.teamId, 'device')).toBe(devicesBefore);
  });
});

describe('CSV import and export', () => {
  const header = 'Tag,Device name,Maker,Port,Settings,Address,Termination\n';
  const mapping = { tag: 'Tag', name: 'Device name', maker: 'Maker', portName: 'Port', shorthand: 'Settings', nodeAddress: 'Address', termination: 'Termination' };

  it('previews with per-row errors, writes nothing until confirmed, then imports valid rows', async () => {
    const eng = source.members.engineer;
    const m = await makeMachine(eng);
    const csv = header + [
      'CSV-1,Filler drive,Quillmoor,RS-485,9600 8-E-1,3,yes',
      'CSV-1,,,Service,19200 8-N-1,,no',
      'CSV-2,Label printer,Tallowby,COM1,9600 9-N-1,,no',
      ',No tag,,COM1,9600 8-N-1,,',
      'CSV-3,Scale,Tallowby,COM1,4800 7-E-1,,maybe',
    ].join('\n');
    const preview = expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping }));
    expect(preview).toMatchObject({ applied: false, rows: 5, devices: 1, ports: 2, errorCount: 3 });
    expect(preview.errors.map((e: { row: number }) => e.row)).toEqual([4, 5, 6]);
    expect(preview.errors[0].column).toBe('Settings');
    expect(preview.errors[2].message).toMatch(/maybe/);
    const refused = await eng.post('/api/import/csv', { machineId: m.id, csv, mapping, apply: true });
    expect(refused.status).toBe(422);
    expect(expectOk(await eng.get(`/api/devices?machineId=${m.id}`)).total).toBe(0);
    const done = expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping, apply: true, skipInvalid: true }), 201);
    expect(done).toMatchObject({ applied: true, devices: 1, ports: 2 });
    const list = expectOk(await eng.get(`/api/devices?machineId=${m.id}`));
    expect(list.items[0]).toMatchObject({ tag: 'CSV-1', name: 'Filler drive', maker: 'Quillmoor' });
    expect(list.items[0].ports.map((p: { shorthand: string }) => p.shorthand)).toEqual(['9600 8-E-1', '19200 8-N-1']);
    const again = expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping }));
    expect(again.errors.some((e: { message: string }) => /already on/.test(e.message))).toBe(true);
  });

  it('checks the vault again at the apply when the same body was previewed: a device added meanwhile is refused or left out', async () => {
    // The preview's reading of the rows is kept for an apply of the same body; what depends on the vault is not.
    const eng = source.members.engineer;
    const m = await makeMachine(eng);
    const csv = header + ['PV-1,Drive one,Quillmoor,Bus,9600 8-E-1,3,yes', 'PV-2,Drive two,Quillmoor,Bus,9600 8-E-1,4,no', 'PV-3,Drive three,Quillmoor,Bus,19200 8-N-1,5,no'].join('\n');
    expect(expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping }))).toMatchObject({ devices: 3, errorCount: 0 });
    await makeDevice(eng, m.id, { tag: 'pv-2' });
    const refused = await eng.post('/api/import/csv', { machineId: m.id, csv, mapping, apply: true });
    expect(refused.status, JSON.stringify(refused.body)).toBe(422);
    expect(refused.body.preview.errors).toEqual([{ row: 3, column: 'Tag', message: expect.stringMatching(/PV-2 is already on/) }]);
    expect(expectOk(await eng.get(`/api/devices?machineId=${m.id}`)).total).toBe(1);

    // Previewed again, then the machine goes to the trash before the apply.
    expect(expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping })).errorCount).toBe(1);
    expectOk(await eng.del(`/api/machines/${m.id}`));
    expect((await eng.post('/api/import/csv', { machineId: m.id, csv, mapping, apply: true, skipInvalid: true })).status).toBe(404);

    // Previewed into another machine, whose clashing device is moved to the trash before the apply: all three go in.
    const other = await makeMachine(eng);
    const clash = await makeDevice(eng, other.id, { tag: 'PV-3' });
    expect(expectOk(await eng.post('/api/import/csv', { machineId: other.id, csv, mapping })).errorCount).toBe(1);
    expectOk(await eng.del(`/api/devices/${clash.id}`));
    const done = expectOk(await eng.post('/api/import/csv', { machineId: other.id, csv, mapping, apply: true, skipInvalid: true }), 201);
    expect(done).toMatchObject({ applied: true, devices: 3, ports: 3, errorCount: 0 });
    const list = expectOk(await eng.get(`/api/devices?machineId=${other.id}&sort=tag`));
    expect(list.items.map((d: { tag: string }) => d.tag)).toEqual(['PV-1', 'PV-2', 'PV-3']);
    expect(list.items.map((d: { ports: { shorthand: string }[] }) => d.ports[0]!.shorthand)).toEqual(['9600 8-E-1', '9600 8-E-1', '19200 8-N-1']);
  });

  it('refuses a mapping to a missing column', async () => {
    const m = await makeMachine(source.members.engineer);
    const res = await source.members.engineer.post('/api/import/csv', { machineId: m.id, csv: header + 'X,,,,,,\n', mapping: { tag: 'Device tag' } });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatch(/no column "Device tag"/);
  });

  it('exports a vault list as CSV with its filters', async () => {
    const eng = source.members.engineer;
    const m = await makeMachine(eng);
    await makeDevice(eng, m.id, { tag: '=HYPERLINK("x")' });
    await makeDevice(eng, m.id, { tag: 'CSVX-2' });
    const res = await eng.request('GET', `/api/export/csv?table=devices&machineId=${m.id}&sort=tag&dir=desc`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/attachment; filename="devices-/);
    const lines = String(res.body).replace(/^\ufeff/, '').trim().split('\r\n');
    expect(lines).toHaveLength(3);
    expect(lines[1]).toContain('CSVX-2');
    expect(lines[2]).toContain(`'=HYPERLINK`);
    const ports = await eng.request('GET', `/api/export/csv?table=ports&machineId=${m.id}`);
    expect(String(ports.body).trim().split('\r\n')).toHaveLength(5);
    expect((await eng.get('/api/export/csv?table=users')).status).toBe(422);
    expect((await eng.get('/api/export/csv?table=devices&colour=red')).status).toBe(422);
  });
});
