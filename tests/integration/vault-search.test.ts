/** Team-wide device search: every field, prefixes, other teams, trash. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, uid } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;
let device: any;
const u = uid();

beforeAll(async () => {
  team = await createTeamWithRoles('vault-search');
  eng = team.members.engineer;
  const site = expectOk(await eng.post('/api/sites', { name: `Marrowgate Tileworks ${u}` }), 201);
  const machine = expectOk(await eng.post('/api/machines', { siteId: site.id, name: `Kiln${u} Conveyor` }), 201);
  device = expectOk(
    await eng.post('/api/devices', { machineId: machine.id, tag: `SRCH-${u}`, name: `Glaze${u} feeder`, maker: `Brindlecott${u}`, model: `BX${u}`, serialNumber: `SN${u}Q` }),
    201,
  );
}, 60_000);

const ids = (body: any) => body.items.map((d: { id: string }) => d.id);

describe('search', () => {
  it.each([
    ['tag', () => `SRCH-${u}`],
    ['name', () => `glaze${u}`],
    ['maker', () => `brindlecott${u}`],
    ['model', () => `BX${u}`],
    ['serialNumber', () => `SN${u}Q`],
    ['siteName', () => `marrowgate ${u}`],
    ['machineName', () => `Kiln${u}`],
  ])('finds a device by %s', async (field, q) => {
    const res = expectOk(await team.members.viewer.get(`/api/devices/search?q=${encodeURIComponent(q())}`));
    expect(ids(res)).toContain(device.id);
    expect(res.items.find((i: any) => i.id === device.id).matched).toContain(field);
  });

  it('matches word prefixes and follows renames of the site', async () => {
    expect(ids(expectOk(await eng.get(`/api/devices/search?q=brindle`)))).toContain(device.id);
    const site = expectOk(await eng.get(`/api/sites/${device.siteId}`));
    expectOk(await eng.patch(`/api/sites/${site.id}`, { version: site.version, name: `Oakhurst Pottery ${u}` }));
    expect(ids(expectOk(await eng.get(`/api/devices/search?q=oakhurst ${u}`)))).toContain(device.id);
    expect(ids(expectOk(await eng.get(`/api/devices/search?q=marrowgate ${u}`)))).not.toContain(device.id);
  });

  it('filters the device list with the same index', async () => {
    const res = expectOk(await eng.get(`/api/devices?q=${encodeURIComponent(`Glaze${u}`)}`));
    expect(ids(res)).toEqual([device.id]);
  });

  it('never shows another team’s devices, nor trashed ones', async () => {
    const outsider = (await createTeamWithRoles('vault-search-other')).members.owner;
    expect(expectOk(await outsider.get(`/api/devices/search?q=SRCH-${u}`)).total).toBe(0);
    const extra = expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag: `GONE-${u}` }), 201);
    expect(expectOk(await eng.get(`/api/devices/search?q=GONE-${u}`)).total).toBe(1);
    expectOk(await eng.del(`/api/devices/${extra.id}`));
    expect(expectOk(await eng.get(`/api/devices/search?q=GONE-${u}`)).total).toBe(0);
    expectOk(await eng.post(`/api/trash/device/${extra.id}`));
    expect(expectOk(await eng.get(`/api/devices/search?q=GONE-${u}`)).total).toBe(1);
  });

  it('keeps exactly one search row per live device through edits, trash, restore and purge', async () => {
    const db = testDb();
    const rows = async (id: string) => Number((await db.execute({ sql: 'SELECT count(*) AS n FROM device_search WHERE device_id = ?', args: [id] })).rows[0]!.n);
    try {
      let d = expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag: `KEEP-${u}` }), 201);
      d = expectOk(await eng.patch(`/api/devices/${d.id}`, { version: d.version, tag: `KEPT-${u}` }));
      expect(await rows(d.id)).toBe(1);
      expect(expectOk(await eng.get(`/api/devices/search?q=KEPT-${u}`)).total).toBe(1);
      expect(expectOk(await eng.get(`/api/devices/search?q=KEEP-${u}`)).total).toBe(0);
      expectOk(await eng.del(`/api/devices/${d.id}`));
      expect(await rows(d.id)).toBe(0);
      expectOk(await eng.post(`/api/trash/device/${d.id}`));
      expect(await rows(d.id)).toBe(1);
      d = expectOk(await eng.get(`/api/devices/${d.id}`));
      expectOk(await eng.patch(`/api/devices/${d.id}`, { version: d.version, name: `Renamed${u}` }));
      expect(await rows(d.id)).toBe(1);
      expect(ids(expectOk(await eng.get(`/api/devices/search?q=Renamed${u}`)))).toEqual([d.id]);
      expectOk(await eng.del(`/api/devices/${d.id}`));
      expectOk(await team.members.admin.del(`/api/trash/device/${d.id}`));
      expect(await rows(d.id)).toBe(0);
      expect(expectOk(await eng.get(`/api/devices/search?q=KEPT-${u}`)).total).toBe(0);
    } finally {
      db.close();
    }
  });

  it('refuses an empty or symbol-only query and unknown parameters (422)', async () => {
    for (const q of ['', '%%%', '"*']) {
      const res = await eng.get(`/api/devices/search?q=${encodeURIComponent(q)}`);
      expect(res.status, q).toBe(422);
      expect(res.body.fields.q).toBeTruthy();
    }
    expect((await eng.get('/api/devices/search?q=a&limit=5')).status).toBe(422);
    expect((await eng.get('/api/devices/search?q=a&pageSize=500')).status).toBe(422);
  });
});
