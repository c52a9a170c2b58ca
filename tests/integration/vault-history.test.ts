/** Revisions (history, restore, stale restore) and the trash (cascade, restore, purge). */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, rs485 } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('vault-hist');
  eng = team.members.engineer;
}, 60_000);

describe('history', () => {
  it('keeps who changed which field from what to what, and restores an old revision as a new one', async () => {
    const d = await makeDevice(eng);
    const port = d.ports[0];
    const v2 = expectOk(await eng.patch(`/api/ports/${port.id}`, { version: 1, settings: rs485({ baud: 19200 }) }));
    const v3 = expectOk(await eng.patch(`/api/ports/${port.id}`, { version: 2, settings: rs485({ baud: 57600, parity: 'none' }), notes: 'sped up' }));
    expect(v3.shorthand).toBe('57600 8-N-1');
    const hist = expectOk(await team.members.viewer.get(`/api/revisions?entityType=port&entityId=${port.id}`));
    expect(hist.items.map((r: any) => r.version)).toEqual([3, 2, 1]);
    expect(hist.items[0]).toMatchObject({ action: 'update', userName: eng.user!.name });
    expect(hist.items[0].changes).toEqual(
      expect.arrayContaining([{ field: 'settings.baud', from: 19200, to: 57600 }, { field: 'settings.parity', from: 'even', to: 'none' }, { field: 'notes', from: '', to: 'sped up' }]),
    );
    const first = hist.items[2];
    expect(expectOk(await eng.get(`/api/revisions/${first.id}`)).snapshot.settings.baud).toBe(9600);

    const stale = await eng.post(`/api/revisions/${first.id}/restore`, { version: v2.version });
    expect(stale.status).toBe(409);
    expect(stale.body.current.version).toBe(3);
    expect((await eng.post(`/api/revisions/${first.id}/restore`, { version: 'three' })).status).toBe(422);
    expect((await team.members.technician.post(`/api/revisions/${first.id}/restore`, { version: 3 })).status).toBe(403);

    const restored = expectOk(await eng.post(`/api/revisions/${first.id}/restore`, { version: 3 }));
    expect(restored).toMatchObject({ restoredVersion: 1, entityId: port.id });
    const now = expectOk(await eng.get(`/api/ports/${port.id}`));
    expect(now).toMatchObject({ version: 4, shorthand: '9600 8-E-1', notes: '' });
    const after = expectOk(await eng.get(`/api/revisions?entityType=port&entityId=${port.id}`));
    expect(after.items[0]).toMatchObject({ version: 4, action: 'revert', summary: 'Restored version 1' });
  });

  it('answers 404 for another team’s history and needs entityType with entityId', async () => {
    const other = await createTeamWithRoles('vault-hist-other');
    const d = await makeDevice(other.members.owner);
    expect((await eng.get(`/api/revisions?entityType=device&entityId=${d.id}`)).status).toBe(404);
    expect((await eng.get(`/api/revisions?entityId=${d.id}`)).status).toBe(422);
  });
});

describe('trash', () => {
  it('moves a site with its machines, devices, ports and links, restores them together, and purges for good', async () => {
    const d = await makeDevice(eng);
    expectOk(await eng.post('/api/links', { machineId: d.machineId, name: 'Trash bus', kind: 'rs485-bus', members: [{ portId: d.ports[0].id, role: 'master' }] }), 201);
    expectOk(await eng.del(`/api/sites/${d.siteId}`));
    for (const path of [`/api/sites/${d.siteId}`, `/api/machines/${d.machineId}`, `/api/devices/${d.id}`, `/api/ports/${d.ports[0].id}`]) {
      expect((await eng.get(path)).status, path).toBe(404);
    }
    expect(expectOk(await eng.get(`/api/links?machineId=${d.machineId}`)).total).toBe(0);
    const trash = expectOk(await eng.get('/api/trash?type=site'));
    const entry = trash.items.find((i: any) => i.id === d.siteId);
    expect(entry).toMatchObject({ type: 'site', deletedByName: eng.user!.name });
    expect(entry.contents).toBe(2);
    expect(trash.items.some((i: any) => i.id === d.id)).toBe(false);

    // a device cannot come back while its machine is in the trash
    expect((await eng.post(`/api/trash/device/${d.id}`)).status).toBe(404);
    expect((await team.members.technician.get('/api/trash')).status).toBe(403);

    expectOk(await eng.post(`/api/trash/site/${d.siteId}`));
    expect(expectOk(await eng.get(`/api/devices/${d.id}`)).ports).toHaveLength(2);
    expect(expectOk(await eng.get(`/api/links?machineId=${d.machineId}`)).total).toBe(1);

    expectOk(await eng.del(`/api/devices/${d.id}`));
    expect((await eng.del(`/api/trash/device/${d.id}`)).status).toBe(403);
    const purged = expectOk(await team.members.admin.del(`/api/trash/device/${d.id}`));
    expect(purged.purged).toBe(3);
    const db = testDb();
    try {
      const rs = await db.execute({ sql: 'SELECT (SELECT count(*) FROM device WHERE id = ?) + (SELECT count(*) FROM revision WHERE entity_id = ?) AS n', args: [d.id, d.id] });
      expect(Number(rs.rows[0]!.n)).toBe(0);
    } finally {
      db.close();
    }
    expect((await eng.post(`/api/trash/device/${d.id}`)).status).toBe(404);
  });

  it('refuses an unknown record type and restoring a port while its device is trashed', async () => {
    const d = await makeDevice(eng);
    expectOk(await eng.del(`/api/ports/${d.ports[1].id}`));
    expectOk(await eng.del(`/api/devices/${d.id}`));
    const res = await eng.post(`/api/trash/port/${d.ports[1].id}`);
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/device is in the trash/);
    expect((await eng.post(`/api/trash/rack/${d.id}`)).status).toBe(404);
  });

  it('does not let a restored revision bring a trashed record back', async () => {
    const d = await makeDevice(eng);
    const hist = expectOk(await eng.get(`/api/revisions?entityType=device&entityId=${d.id}`));
    expectOk(await eng.del(`/api/devices/${d.id}`));
    const res = await eng.post(`/api/revisions/${hist.items[0].id}/restore`, { version: 2 });
    expect(res.status).toBe(409);
  });
});
