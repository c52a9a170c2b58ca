/** Team-wide search: devices by every field (role too), commands and port notes, prefixes, other teams, trash; list paging. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, uid } from './vault-fixtures';
import { jogBody } from './command-fixtures';

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

describe('search scoped by team in the index', () => {
  it('stores each device row with its team as an indexed token, so a query names the team (migration 0021)', async () => {
    const db = testDb();
    try {
      // Expected token: "t" + hex of the team id's UTF-8 bytes (docs/api.md, "Search"); hex from Node's Buffer, not the app.
      const token = `t${Buffer.from(team.teamId, 'utf8').toString('hex')}`;
      const r = await db.execute({ sql: `SELECT device_id FROM device_search WHERE device_search MATCH ?`, args: [`team : "${token}" AND tag : "srch"*`] });
      expect(r.rows.map((x) => x.device_id)).toContain(device.id);
    } finally {
      db.close();
    }
  });

  it('finds a device by its role (a converter is found by "converter" the same way)', async () => {
    const d = expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag: `ROLE-${u}`, name: `Weigher${u}`, role: 'scale' }), 201);
    const res = expectOk(await eng.get(`/api/devices/search?q=${encodeURIComponent(`scale weigher${u}`)}`));
    expect(ids(res)).toEqual([d.id]);
    expect(res.items[0].matched).toEqual(expect.arrayContaining(['role', 'name']));
    expect(res.totalCapped).toBe(false);
  });
});

describe('search order and words', () => {
  it('puts devices whose tag holds every typed word first, then the rest, each by tag; only the last word may be cut short', async () => {
    // Expected order from docs/api.md ("Search"): tag matches first, then tag order.
    const inTag = expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag: `ZQ-${u}`, name: 'Feeder' }), 201);
    const inMaker = expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag: `AQ-${u}`, maker: 'Zq Works' }), 201);
    const res = expectOk(await eng.get(`/api/devices/search?q=${encodeURIComponent(`zq ${u}`)}`));
    expect(ids(res)).toEqual([inTag.id, inMaker.id]);
    // Earlier words are whole words; the last is the start of a word.
    expect(ids(expectOk(await eng.get(`/api/devices/search?q=${encodeURIComponent(`works ${u.slice(0, 3)}`)}`)))).toContain(inMaker.id);
    expect(ids(expectOk(await eng.get(`/api/devices/search?q=${encodeURIComponent(`wor ${u}`)}`)))).toEqual([]);
  });
});

describe('search of commands and port notes (/api/search)', () => {
  it('finds a command by its name and by the text it sends, and no longer once it is in the trash', async () => {
    // The literal bytes 31 21 53 54 4F 50 spell "1!STOP" in ASCII (our demo syntax; ASCII table, from memory).
    const body = jogBody({ deviceId: device.id }, { name: `Halt${u} conveyor`, template: { version: 1, segments: [{ type: 'literal', id: 'head', bytes: '31 21 53 54 4F 50' }, { type: 'terminator', id: 'cr', bytes: '0D' }] }, fieldValues: {}, rawUnits: {} });
    const cmd = expectOk(await eng.post('/api/commands', body), 201);
    const byName = expectOk(await team.members.viewer.get(`/api/search?q=${encodeURIComponent(`halt${u}`)}`));
    expect(byName.records.items.map((r: any) => [r.kind, r.id, r.deviceTag, r.href])).toEqual([['command', cmd.id, device.tag, `/vault/devices/${device.id}/commands/${cmd.id}`]]);
    const byText = expectOk(await eng.get(`/api/search?q=${encodeURIComponent(`stop halt${u}`)}`));
    expect(byText.records.items.map((r: any) => r.id)).toEqual([cmd.id]);
    const outsider = (await createTeamWithRoles('vault-search-cmd-other')).members.owner;
    expect(expectOk(await outsider.get(`/api/search?q=halt${u}`)).records.items).toEqual([]);
    expectOk(await eng.del(`/api/commands/${cmd.id}`));
    expect(expectOk(await eng.get(`/api/search?q=halt${u}`)).records.items).toEqual([]);
  });

  it('finds a port by its notes, follows edits of the notes, and also answers devices', async () => {
    const port = expectOk(await eng.post('/api/ports', { deviceId: device.id, name: `Aux${u}`, notes: `Shared with the label printer${u} via splitter` }), 201);
    const found = expectOk(await eng.get(`/api/search?q=${encodeURIComponent(`splitter printer${u}`)}`));
    expect(found.records.items.map((r: any) => [r.kind, r.id, r.deviceTag])).toEqual([['port', port.id, device.tag]]);
    expect(found.devices).toMatchObject({ items: [], total: 0, totalCapped: false });
    expectOk(await eng.patch(`/api/ports/${port.id}`, { version: port.version, notes: 'Moved to the panel' }));
    expect(expectOk(await eng.get(`/api/search?q=splitter printer${u}`)).records.items).toEqual([]);
    expect(expectOk(await eng.get(`/api/search?q=${encodeURIComponent(`SRCH-${u}`)}`)).devices.items.map((d: any) => d.id)).toEqual([device.id]);
  });

  it('refuses an empty query and unknown parameters (422)', async () => {
    expect((await eng.get('/api/search?q=%25%25')).status).toBe(422);
    expect((await eng.get('/api/search?q=a&page=2')).status).toBe(422);
    expect((await eng.get('/api/search?q=a&limit=51')).status).toBe(422);
  });
});

describe('device list paging by cursor', () => {
  it('walks every device of a machine page by page with `next`, in tag order both ways, and refuses a bad cursor', async () => {
    const tags = ['PG-A', 'PG-B', 'PG-C', 'PG-D', 'PG-E'].map((t) => `${t}${u}`);
    for (const tag of [...tags].reverse()) expectOk(await eng.post('/api/devices', { machineId: device.machineId, tag }), 201);
    for (const dir of ['asc', 'desc'] as const) {
      const seen: string[] = [];
      let after: string | null = null;
      for (let i = 0; i < 10; i++) {
        const res: any = expectOk(await eng.get(`/api/devices?machineId=${device.machineId}&q=PG&pageSize=2&sort=tag&dir=${dir}${after ? `&after=${encodeURIComponent(after)}` : ''}`));
        expect(res).toMatchObject({ total: 5, totalCapped: false, pageSize: 2 });
        seen.push(...res.items.map((d: any) => d.tag));
        after = res.next;
        if (!after) break;
      }
      // Expected: the tags sorted by plain text order (A–E), reversed for desc.
      expect(seen).toEqual(dir === 'asc' ? tags : [...tags].reverse());
    }
    const bad = await eng.get(`/api/devices?after=${encodeURIComponent('not a cursor')}`);
    expect(bad.status).toBe(422);
    expect(bad.body.fields.after).toBeTruthy();
  });
});
