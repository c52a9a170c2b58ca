/**
 * One rule for port names on a device and device tags on a machine, everywhere: unique ignoring the letter
 * case of A–Z. The API refuses what the imports refuse, the database indexes enforce the same, and the
 * migrations rename old clashes.
 */
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createClient } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { startServer } from '../helpers/server';
import { expectOk, makeDevice, makeMachine, rs485 } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;
beforeAll(async () => {
  team = await createTeamWithRoles('port-names');
  eng = team.members.engineer;
}, 60_000);

describe('port names on one device', () => {
  it('refuses two names that differ only in letter case, on create, add, rename and in profiles', async () => {
    const m = await makeMachine(eng);
    const both = await eng.post('/api/devices', { machineId: m.id, tag: 'PN-1', ports: [{ name: 'C' }, { name: 'c' }] });
    expect(both.status).toBe(422);
    expect(both.body.fields['ports.1.name']).toMatch(/already has this name/);
    expect(expectOk(await eng.get(`/api/devices?machineId=${m.id}`)).total).toBe(0);

    const d = await makeDevice(eng, m.id);
    const added = await eng.post('/api/ports', { deviceId: d.id, name: 'SERVICE' });
    expect(added.status).toBe(422);
    expect(added.body.fields.name).toMatch(/already has this name/);
    const renamed = await eng.patch(`/api/ports/${d.ports[0].id}`, { version: 1, name: 'service' });
    expect(renamed.status).toBe(422);
    // its own name in other letters is a rename, not a clash
    expect(expectOk(await eng.patch(`/api/ports/${d.ports[1].id}`, { version: 1, name: 'SERVICE' })).name).toBe('SERVICE');

    const profile = await eng.post('/api/profiles', { name: 'Two COMs', ports: [{ name: 'Com1' }, { name: 'COM1' }] });
    expect(profile.status).toBe(422);
    expect(profile.body.fields['ports.1.name']).toMatch(/already has this name/);
  });

  it('keeps names that differ in more than letter case', async () => {
    const d = expectOk(await eng.post('/api/devices', { machineId: (await makeMachine(eng)).id, tag: 'PN-2', ports: [{ name: 'COM1' }, { name: 'COM 1' }, { name: 'Ä' }, { name: 'ä' }] }), 201);
    expect(d.ports.map((p: { name: string }) => p.name)).toEqual(['COM1', 'COM 1', 'Ä', 'ä']);
  });

  it('imports its own CSV export again, names in any letter case included', async () => {
    const m = await makeMachine(eng);
    await makeDevice(eng, m.id, { tag: 'PN-3', ports: [{ name: 'Bus', settings: rs485() }, { name: 'bus 2', settings: rs485({ nodeAddress: 2 }) }] });
    const csv = String((await eng.request('GET', `/api/export/csv?table=ports&machineId=${m.id}`)).body).replace(/^\ufeff/, '');
    const target = await makeMachine(eng);
    const done = expectOk(await eng.post('/api/import/csv', { machineId: target.id, csv, mapping: { tag: 'deviceTag', portName: 'portName', shorthand: 'shorthand' }, apply: true }), 201);
    expect(done).toMatchObject({ errorCount: 0, devices: 1, ports: 2 });
  });
});

describe('device tags on one machine', () => {
  it('refuses a tag another device of the machine has in other letters, on create, move and rename', async () => {
    const m = await makeMachine(eng);
    const first = await makeDevice(eng, m.id, { tag: 'DRV-1' });
    const second = await eng.post('/api/devices', { machineId: m.id, tag: 'drv-1' });
    expect(second.status).toBe(422);
    expect(second.body.fields.tag).toMatch(/already has this tag/);
    const elsewhere = await makeDevice(eng, undefined, { tag: 'drv-1' });
    const moved = await eng.patch(`/api/devices/${elsewhere.id}`, { version: 1, machineId: m.id });
    expect(moved.status).toBe(422);
    expect(moved.body.fields.tag).toMatch(/already has this tag/);
    const other = await makeDevice(eng, m.id, { tag: 'DRV-2' });
    expect((await eng.patch(`/api/devices/${other.id}`, { version: 1, tag: 'Drv-1' })).status).toBe(422);
    expect(expectOk(await eng.patch(`/api/devices/${first.id}`, { version: 1, tag: 'drv-1' })).tag).toBe('drv-1');
  });

  it('refuses bringing back a device, from the trash or an old revision, whose tag was taken meanwhile', async () => {
    const m = await makeMachine(eng);
    const d = await makeDevice(eng, m.id, { tag: 'T-1' });
    expectOk(await eng.del(`/api/devices/${d.id}`));
    await makeDevice(eng, m.id, { tag: 't-1' });
    const back = await eng.post(`/api/trash/device/${d.id}`);
    expect(back.status).toBe(409);
    expect(back.body.error).toMatch(/same tag/);

    const r = await makeDevice(eng, m.id, { tag: 'R-1' });
    const [v1] = expectOk(await eng.get(`/api/revisions?entityType=device&entityId=${r.id}`)).items;
    expectOk(await eng.patch(`/api/devices/${r.id}`, { version: 1, tag: 'R-2' }));
    await makeDevice(eng, m.id, { tag: 'r-1' });
    const restored = await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 });
    expect(restored.status).toBe(422);
    expect(restored.body.fields.tag).toMatch(/already has this tag/);
  });

  it('refuses an export document with two devices of one machine tagged alike, and a new device whose tag is taken here', async () => {
    const owner = team.members.owner;
    const d = await makeDevice(owner, undefined, { tag: 'IMP-1' });
    const doc = expectOk(await owner.get(`/api/export?siteId=${d.siteId}`));
    const twice = { ...doc, devices: [...doc.devices, { ...doc.devices[0], id: 'dev_twin', tag: 'imp-1' }] };
    const res = await eng.post('/api/import', { document: twice });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatch(/two devices of machine .* have this tag/);

    const other = await createTeamWithRoles('port-names-import');
    expectOk(await other.members.owner.post('/api/import', { document: doc, apply: true }), 201);
    const later = { ...doc, devices: [{ ...doc.devices[0], id: 'dev_later', tag: 'Imp-1' }], ports: [], links: [], commands: [] };
    const clash = await other.members.owner.post('/api/import', { document: later, apply: true });
    expect(clash.status).toBe(409);
    expect(clash.body.error).toMatch(/tagged Imp-1 is already on the machine/);
  });
});

describe('the migrations to names unique ignoring case', () => {
  it('renames later clashing ports deterministically, with a revision, and the index then refuses new clashes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'baudbook-migrate-'));
    const before = join(dir, 'drizzle-0005');
    mkdirSync(join(before, 'meta'), { recursive: true });
    const journal = JSON.parse(readFileSync('drizzle/meta/_journal.json', 'utf8'));
    journal.entries = journal.entries.filter((e: { idx: number }) => e.idx <= 5);
    writeFileSync(join(before, 'meta/_journal.json'), JSON.stringify(journal));
    for (const f of readdirSync('drizzle')) if (/^000[0-5]_.*\.sql$/.test(f)) copyFileSync(join('drizzle', f), join(before, f));
    const url = `file:${join(dir, 'old.db')}`;
    const client = createClient({ url });
    let server: Awaited<ReturnType<typeof startServer>> | null = null;
    try {
      await migrate(drizzle(client), { migrationsFolder: before });
      const now = Date.now();
      const port = (id: string, device: string, name: string, position: number, deleted = false) => ({
        sql: `INSERT INTO port (id, team_id, device_id, name, position, settings, wiring, notes, version, created_at, updated_at, deleted_at, trash_id)
              VALUES (?, 't1', ?, ?, ?, '{"baud":9600}', '[]', '', 1, ?, ?, ?, ?)`,
        args: [id, device, name, position, now, now, deleted ? now : null, deleted ? id : null],
      });
      await client.batch([
        { sql: `INSERT INTO team (id, name, created_at) VALUES ('t1', 'Old team', ?)`, args: [now] },
        { sql: `INSERT INTO site (id, team_id, name, created_at, updated_at) VALUES ('s1', 't1', 'Old site', ?, ?)`, args: [now, now] },
        { sql: `INSERT INTO machine (id, team_id, site_id, name, created_at, updated_at) VALUES ('m1', 't1', 's1', 'Old line', ?, ?)`, args: [now, now] },
        { sql: `INSERT INTO device (id, team_id, machine_id, tag, created_at, updated_at) VALUES ('d1', 't1', 'm1', 'OLD-1', ?, ?), ('d2', 't1', 'm1', 'OLD-2', ?, ?), ('d3', 't1', 'm1', 'old-1', ?, ?)`, args: [now, now, now, now, now + 1, now + 1] },
        port('p1', 'd1', 'RS-485', 0),
        port('p2', 'd1', 'rs-485', 1),
        port('p3', 'd1', 'Rs-485 (2)', 2),
        port('p4', 'd1', 'C', 3),
        port('p5', 'd1', 'c', 4),
        port('p6', 'd1', 'c', 5, true),
        port('p7', 'd2', 'c', 0),
        port('p8', 'd2', 'A', 2),
        port('p9', 'd2', 'a', 1),
      ], 'write');
      const rowid = Number((await client.execute(`SELECT rowid FROM port WHERE id = 'p2'`)).rows[0]!.rowid);
      client.close();

      server = await startServer({ DATABASE_URL: url });
      const after = createClient({ url });
      try {
        const rows = (await after.execute('SELECT id, name, version FROM port ORDER BY id')).rows.map((r) => [r.id, r.name, Number(r.version)]);
        expect(rows).toEqual([
          ['p1', 'RS-485', 1],
          ['p2', `rs-485 (duplicate ${rowid})`, 2],
          ['p3', 'Rs-485 (2)', 1],
          ['p4', 'C', 1],
          ['p5', 'c (2)', 2],
          ['p6', 'c', 1],
          ['p7', 'c', 1],
          ['p8', 'A (2)', 2],
          ['p9', 'a', 1],
        ]);
        const revs = (await after.execute(`SELECT entity_id, version, action, changes, snapshot FROM revision WHERE entity_type = 'port' ORDER BY entity_id`)).rows;
        expect(revs.map((r) => [r.entity_id, Number(r.version), r.action])).toEqual([['p2', 2, 'update'], ['p5', 2, 'update'], ['p8', 2, 'update']]);
        expect(JSON.parse(String(revs[1]!.changes))).toEqual([{ field: 'name', from: 'c', to: 'c (2)' }]);
        expect(JSON.parse(String(revs[1]!.snapshot))).toMatchObject({ name: 'c (2)', position: 4, settings: { baud: 9600 }, wiring: [] });
        const devices = (await after.execute('SELECT id, tag, version FROM device ORDER BY id')).rows.map((r) => [r.id, r.tag, Number(r.version)]);
        expect(devices).toEqual([['d1', 'OLD-1', 1], ['d2', 'OLD-2', 1], ['d3', 'old-1 (2)', 2]]);
        const devRev = (await after.execute(`SELECT changes, snapshot FROM revision WHERE entity_id = 'd3'`)).rows;
        expect(JSON.parse(String(devRev[0]!.changes))).toEqual([{ field: 'tag', from: 'old-1', to: 'old-1 (2)' }]);
        expect(JSON.parse(String(devRev[0]!.snapshot))).toMatchObject({ machineId: 'm1', tag: 'old-1 (2)', profileId: null });
        expect((await after.execute(`SELECT tag FROM device_search WHERE device_id = 'd3'`)).rows[0]!.tag).toBe('old-1 (2)');
        await expect(after.execute(`INSERT INTO device (id, team_id, machine_id, tag, created_at, updated_at) VALUES ('d4', 't1', 'm1', 'old-2', 0, 0)`)).rejects.toMatchObject({ code: 'SQLITE_CONSTRAINT' });
        await expect(after.execute(`INSERT INTO port (id, team_id, device_id, name, settings, wiring, created_at, updated_at) VALUES ('p10', 't1', 'd2', 'C', '{}', '[]', 0, 0)`)).rejects.toMatchObject({ code: 'SQLITE_CONSTRAINT' });
      } finally {
        after.close();
      }
    } finally {
      await server?.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
