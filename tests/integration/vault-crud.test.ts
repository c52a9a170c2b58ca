/** Every vault record type: create, read, update, delete — valid, invalid (nothing written) and stale (409). */
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeSite, rs485, uid } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;
let parents: { siteId: string; machineId: string; deviceId: string; portId: string };

beforeAll(async () => {
  team = await createTeamWithRoles('vault-crud');
  eng = team.members.engineer;
  const d = await makeDevice(eng);
  parents = { siteId: d.siteId, machineId: d.machineId, deviceId: d.id, portId: d.ports[0].id };
}, 60_000);

async function rowCount(table: string): Promise<number> {
  const db = testDb();
  try {
    const rs = await db.execute({ sql: `SELECT count(*) AS n FROM ${table} WHERE team_id = ?`, args: [team.teamId] });
    return Number(rs.rows[0]!.n);
  } finally {
    db.close();
  }
}

interface Kind {
  path: string;
  table: string;
  valid: () => Record<string, unknown>;
  /** Each invalid body and the field its message must name. */
  invalid: () => [Record<string, unknown>, string][];
  patch: Record<string, unknown>;
  badPatch: [Record<string, unknown>, string];
}

const kinds: Record<string, Kind> = {
  site: {
    path: '/api/sites', table: 'site',
    valid: () => ({ name: `Creamery ${uid()}`, customer: 'Invented Dairy', address: '1 Churn Lane' }),
    invalid: () => [[{ name: '' }, 'name'], [{ name: 'x', colour: 'red' }, '_'], [{ name: 'x'.repeat(121) }, 'name']],
    patch: { customer: 'Renamed customer' },
    badPatch: [{ notes: 5 }, 'notes'],
  },
  machine: {
    path: '/api/machines', table: 'machine',
    valid: () => ({ siteId: parents.siteId, name: `Filler ${uid()}`, code: 'L2' }),
    invalid: () => [[{ siteId: parents.siteId }, 'name'], [{ name: 'x' }, 'siteId'], [{ siteId: parents.siteId, name: 'x', speed: 3 }, '_']],
    patch: { code: 'L3' },
    badPatch: [{ code: 'x'.repeat(61) }, 'code'],
  },
  device: {
    path: '/api/devices', table: 'device',
    valid: () => ({ machineId: parents.machineId, tag: `SCL-${uid()}`, role: 'scale', ports: [{ name: 'COM1', settings: { baud: 4800 } }] }),
    invalid: () => [
      [{ machineId: parents.machineId, tag: 'X', role: 'toaster' }, 'role'],
      [{ machineId: parents.machineId, tag: 'X', ports: [{ name: 'A', settings: { baud: -1 } }] }, 'ports.0.settings.baud'],
      [{ machineId: parents.machineId, tag: 'X', ports: [{ name: 'A', settings: { dataBits: 9 } }] }, 'ports.0.settings.dataBits'],
      [{ machineId: parents.machineId, tag: 'X', ports: [{ name: 'A', settings: { stopBits: 3 } }] }, 'ports.0.settings.stopBits'],
      [{ machineId: parents.machineId, tag: 'X', ports: [{ name: 'A', settings: { parity: 'maybe' } }] }, 'ports.0.settings.parity'],
      [{ machineId: parents.machineId, tag: 'X', ports: [{ name: 'A', settings: { frameRules: { sparkle: 1 } } }] }, 'ports.0.settings.frameRules'],
      [{ machineId: parents.machineId, tag: '' }, 'tag'],
    ],
    patch: { firmware: '2.4.1', location: 'Cabinet 2, rail B' },
    badPatch: [{ role: 'toaster' }, 'role'],
  },
  port: {
    path: '/api/ports', table: 'port',
    valid: () => ({ deviceId: parents.deviceId, name: `Aux ${uid()}`, settings: rs485({ nodeAddress: 7 }), wiring: [{ pin: '1', signal: 'D+', colour: 'white' }] }),
    invalid: () => [
      [{ deviceId: parents.deviceId, name: 'T', settings: { interface: 'tcp' } }, 'settings.tcpHost'],
      [{ deviceId: parents.deviceId, name: 'T', settings: { nodeAddress: 70000 } }, 'settings.nodeAddress'],
      [{ deviceId: parents.deviceId, name: 'T', wiring: [{ pin: '1', signal: 'TX', colour: 'red', gauge: 22 }] }, 'wiring.0'],
      [{ deviceId: parents.deviceId, name: 'T', settings: { retries: 101 } }, 'settings.retries'],
    ],
    patch: { notes: 'Checked on site' },
    badPatch: [{ settings: { baud: 0 } }, 'settings.baud'],
  },
  link: {
    path: '/api/links', table: 'link',
    valid: () => ({ machineId: parents.machineId, name: `Bus ${uid()}`, kind: 'rs485-bus', cableType: 'shielded twisted pair', cableLengthM: 40, members: [{ portId: parents.portId, role: 'master' }] }),
    invalid: () => [
      [{ machineId: parents.machineId, name: 'L', kind: 'mesh' }, 'kind'],
      [{ machineId: parents.machineId, name: 'L', kind: 'rs485-bus', cableLengthM: -2 }, 'cableLengthM'],
      [{ machineId: parents.machineId, name: 'L', kind: 'rs485-bus', members: [{ portId: parents.portId, role: 'boss' }] }, 'members.0.role'],
      [{ machineId: parents.machineId, name: 'L', kind: 'rs485-bus', members: [{ portId: parents.portId, role: 'master' }, { portId: parents.portId, role: 'slave' }] }, 'members'],
    ],
    patch: { cableLengthM: 55 },
    badPatch: [{ kind: 'mesh' }, 'kind'],
  },
  profile: {
    path: '/api/profiles', table: 'device_profile',
    valid: () => ({ name: `Checkweigher ${uid()}`, role: 'scale', maker: 'Tallowby', ports: [{ name: 'COM', settings: { baud: 2400, parity: 'even', dataBits: 7 } }] }),
    invalid: () => [[{ name: 'P', ports: [{ name: 'C', settings: { baud: 1.5 } }] }, 'ports.0.settings.baud'], [{ name: '' }, 'name']],
    patch: { model: 'TS-10' },
    badPatch: [{ ports: 'none' }, 'ports'],
  },
};

describe.each(Object.entries(kinds))('%s', (_name, k) => {
  let created: any;

  it('creates with valid input (201) and lists it', async () => {
    created = expectOk(await eng.post(k.path, k.valid()), 201);
    expect(created.version).toBe(1);
    const got = expectOk(await eng.get(`${k.path}/${created.id}`));
    expect(got.id).toBe(created.id);
  });

  it('refuses invalid input with a message per field and writes nothing', async () => {
    for (const [body, field] of k.invalid()) {
      const before = await rowCount(k.table);
      const res = await eng.post(k.path, body);
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(Object.keys(res.body.fields), JSON.stringify(res.body)).toContain(field);
      expect(typeof res.body.fields[field]).toBe('string');
      expect(await rowCount(k.table)).toBe(before);
    }
  });

  it('updates with the current version and bumps it', async () => {
    const res = expectOk(await eng.patch(`${k.path}/${created.id}`, { version: created.version, ...k.patch }));
    expect(res.version).toBe(created.version + 1);
    for (const [f, v] of Object.entries(k.patch)) expect(res[f]).toEqual(v);
    created = res;
  });

  it('refuses an invalid update (422) and leaves the record as it was', async () => {
    const res = await eng.patch(`${k.path}/${created.id}`, { version: created.version, ...k.badPatch[0] });
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(Object.keys(res.body.fields)).toContain(k.badPatch[1]);
    const unknown = await eng.patch(`${k.path}/${created.id}`, { version: created.version, bogus: 1 });
    expect(unknown.status).toBe(422);
    const missingVersion = await eng.patch(`${k.path}/${created.id}`, k.patch);
    expect(missingVersion.status).toBe(422);
    expect(missingVersion.body.fields.version).toBeTruthy();
    const after = expectOk(await eng.get(`${k.path}/${created.id}`));
    expect(after.version).toBe(created.version);
  });

  it('answers a stale version with 409 and the current record', async () => {
    const res = await eng.patch(`${k.path}/${created.id}`, { version: created.version - 1, notes: 'late edit' });
    expect(res.status).toBe(409);
    expect(res.body.current.id).toBe(created.id);
    expect(res.body.current.version).toBe(created.version);
    const after = expectOk(await eng.get(`${k.path}/${created.id}`));
    expect(after.notes).not.toBe('late edit');
  });

  it('forbids a viewer to change it (403) and hides it from another team (404)', async () => {
    expect((await team.members.viewer.patch(`${k.path}/${created.id}`, { version: created.version, ...k.patch })).status).toBe(403);
    expect((await team.members.technician.del(`${k.path}/${created.id}`)).status).toBe(403);
    const outsider = (await createOtherTeam()).members.owner;
    expect((await outsider.get(`${k.path}/${created.id}`)).status).toBe(404);
    expect((await outsider.patch(`${k.path}/${created.id}`, { version: created.version, ...k.patch })).status).toBe(404);
  });

  it('deletes to the trash: 409 on a stale version, then gone from reads', async () => {
    const stale = await eng.del(`${k.path}/${created.id}?version=${created.version - 1}`);
    expect(stale.status).toBe(409);
    expect(stale.body.current.version).toBe(created.version);
    expectOk(await eng.del(`${k.path}/${created.id}?version=${created.version}`));
    expect((await eng.get(`${k.path}/${created.id}`)).status).toBe(404);
    const trash = expectOk(await eng.get(`/api/trash?pageSize=200`));
    expect(trash.items.map((i: { id: string }) => i.id)).toContain(created.id);
  });
});

let other: TeamFixture | null = null;
async function createOtherTeam() {
  other ??= await createTeamWithRoles('vault-crud-other');
  return other;
}

describe('lists', () => {
  it('pages, sorts and filters on the server', async () => {
    const m = await makeMachine(eng);
    for (const tag of ['B-2', 'A-1', 'C-3']) expectOk(await eng.post('/api/devices', { machineId: m.id, tag, role: tag === 'C-3' ? 'printer' : 'drive' }), 201);
    const page1 = expectOk(await eng.get(`/api/devices?machineId=${m.id}&sort=tag&dir=desc&pageSize=2`));
    expect(page1.total).toBe(3);
    expect(page1.items.map((d: { tag: string }) => d.tag)).toEqual(['C-3', 'B-2']);
    const page2 = expectOk(await eng.get(`/api/devices?machineId=${m.id}&sort=tag&dir=desc&pageSize=2&page=2`));
    expect(page2.items.map((d: { tag: string }) => d.tag)).toEqual(['A-1']);
    const printers = expectOk(await eng.get(`/api/devices?machineId=${m.id}&role=printer`));
    expect(printers.items.map((d: { tag: string }) => d.tag)).toEqual(['C-3']);
    const bySite = expectOk(await eng.get(`/api/devices?siteId=${m.siteId}&sort=tag`));
    expect(bySite.total).toBe(3);
  });

  it('orders by every sort field both ways, pages without gaps, and leaves out the trash', async () => {
    const u = uid();
    const word = `Sorter${u}`;
    const zeta = await makeSite(eng, `Zeta ${u}`);
    const alpha = await makeSite(eng, `Alpha ${u}`);
    const inZeta = expectOk(await eng.post('/api/machines', { siteId: zeta.id, name: `Aline ${u}` }), 201);
    const inAlpha = expectOk(await eng.post('/api/machines', { siteId: alpha.id, name: `Zline ${u}` }), 201);
    const specs = [
      { machineId: inZeta.id, tag: `K-${u}`, role: 'scale', maker: 'Brindle', model: 'B-2', serialNumber: 'S-9' },
      { machineId: inAlpha.id, tag: `B-${u}`, role: 'drive', maker: 'Aldous', model: 'Z-1', serialNumber: 'S-1' },
      { machineId: inZeta.id, tag: `X-${u}`, role: 'plc', maker: 'Brindle', model: 'A-7', serialNumber: 'S-5' },
      { machineId: inAlpha.id, tag: `D-${u}`, role: 'drive', maker: 'Corvel', model: 'B-2', serialNumber: 'S-5' },
      { machineId: inZeta.id, tag: `T-${u}`, role: 'reader', maker: 'Aldous', model: 'M-3', serialNumber: 'S-0' },
    ];
    const made: any[] = [];
    for (const [i, s] of specs.entries()) {
      made.push(expectOk(await eng.post('/api/devices', {
        ...s,
        name: `${word} ${'edcba'[i]}`,
        ports: [{ name: 'P1', settings: rs485({ baud: 9600 }) }, { name: 'P2', settings: { interface: 'rs232', baud: 19200 } }, { name: 'P3', settings: { interface: 'rs232', baud: 38400 } }],
      }), 201));
    }
    // One device in the trash, and the middle port of another: neither may appear.
    expectOk(await eng.del(`/api/devices/${made[4].id}?version=${made[4].version}`));
    expectOk(await eng.del(`/api/ports/${made[0].ports[1].id}?version=${made[0].ports[1].version}`));

    const all = expectOk(await eng.get(`/api/devices?q=${word}&pageSize=200`));
    expect(all.total).toBe(4);
    expect(all.items.map((d: { id: string }) => d.id)).not.toContain(made[4].id);
    const first = all.items.find((d: { id: string }) => d.id === made[0].id);
    expect(first).toMatchObject({ tag: `K-${u}`, machineId: inZeta.id, machineName: `Aline ${u}`, siteId: zeta.id, siteName: `Zeta ${u}`, version: 1 });
    expect(first.updatedAt).toBe(made[0].updatedAt); // the same ISO text as the device's own answer
    expect(first.ports.map((p: { name: string; shorthand: string }) => `${p.name} ${p.shorthand}`)).toEqual(['P1 9600 8-E-1', 'P3 38400 8-N-1']);

    // Byte order with id breaking ties in the same direction (docs/api.md: the list is read off an index, forwards or
    // backwards), as SQLite's BINARY collation compares ASCII text.
    const cmp = (a: string | number, b: string | number) => (a < b ? -1 : a > b ? 1 : 0);
    const keyOf = (d: Record<string, string>, sort: string) => (sort === 'updatedAt' ? new Date(d.updatedAt).getTime() : d[sort]!);
    for (const sort of ['tag', 'name', 'role', 'maker', 'model', 'serialNumber', 'machineName', 'siteName', 'updatedAt']) {
      for (const dir of ['asc', 'desc'] as const) {
        const expected = [...all.items]
          .sort((a, b) => (dir === 'asc' ? 1 : -1) * (cmp(keyOf(a, sort), keyOf(b, sort)) || cmp(a.id, b.id)))
          .map((d: { id: string }) => d.id);
        const got = expectOk(await eng.get(`/api/devices?q=${word}&sort=${sort}&dir=${dir}&pageSize=200`));
        expect(got.items.map((d: { id: string }) => d.id), `${sort} ${dir}`).toEqual(expected);
        const paged: string[] = [];
        for (let page = 1; page <= 3; page++) {
          const p = expectOk(await eng.get(`/api/devices?q=${word}&sort=${sort}&dir=${dir}&pageSize=3&page=${page}`));
          expect(p.total).toBe(4);
          paged.push(...p.items.map((d: { id: string }) => d.id));
        }
        expect(paged, `${sort} ${dir} in pages of 3`).toEqual(expected);
      }
    }
    const bySite = expectOk(await eng.get(`/api/devices?q=${word}&siteId=${alpha.id}&sort=tag`));
    expect(bySite.items.map((d: { tag: string }) => d.tag)).toEqual([`B-${u}`, `D-${u}`]);
    expect(bySite.total).toBe(2);
    const past = expectOk(await eng.get(`/api/devices?q=${word}&page=9`));
    expect(past).toMatchObject({ items: [], total: 4, page: 9 });
  });

  it('refuses unknown sort fields, page sizes over 200 and unknown parameters', async () => {
    for (const q of ['sort=password', 'pageSize=201', 'page=0', 'dir=up', 'colour=red']) {
      const res = await eng.get(`/api/devices?${q}`);
      expect(res.status, q).toBe(422);
      expect(Object.keys(res.body.fields).length).toBeGreaterThan(0);
    }
    expect((await eng.get('/api/ports')).status).toBe(422);
  });

  it('shows the shorthand and the text block of each port', async () => {
    const d = await makeDevice(eng);
    expect(d.ports[0].shorthand).toBe('9600 8-E-1');
    expect(d.ports[0].text).toContain('Parity: Even');
    const list = expectOk(await eng.get(`/api/devices?machineId=${d.machineId}`));
    expect(list.items[0].ports.map((p: { shorthand: string }) => p.shorthand)).toEqual(['9600 8-E-1', '19200 8-N-1']);
  });

  it('gives every port the same shorthand in the list as on the device', async () => {
    // The list builds shorthands in SQL, the device answer in JS: both must agree on every parity,
    // stop bits, data bits and interface, and on TCP's host and port.
    const settings: Record<string, unknown>[] = [];
    for (const parity of ['none', 'even', 'odd', 'mark', 'space']) {
      for (const stopBits of [1, 1.5, 2]) settings.push({ interface: 'rs232', baud: 1200, dataBits: 7, parity, stopBits });
    }
    settings.push({ interface: 'ttl', baud: 110, dataBits: 5 }, { interface: 'usb-vcp', baud: 100_000_000, dataBits: 6 });
    settings.push({ interface: 'tcp', tcpHost: 'gw-7.fernhollow.test', tcpPort: 4001, baud: 74880 });
    settings.push(rs485({ baud: 250000, parity: 'odd', stopBits: 2 }));
    const fromDevices: string[] = [];
    const fromList: string[] = [];
    const interfaces: [string, string][] = [];
    const list = async () => expectOk(await eng.get(`/api/devices?machineId=${parents.machineId}&pageSize=200`));
    for (let start = 0; start < settings.length; start += 16) { // at most 16 ports a device
      const d = expectOk(await eng.post('/api/devices', {
        machineId: parents.machineId, tag: `SH-${uid()}`,
        ports: settings.slice(start, start + 16).map((s, i) => ({ name: `P${String(start + i).padStart(2, '0')}`, settings: s })),
      }), 201);
      fromDevices.push(...d.ports.map((p: { name: string; shorthand: string }) => `${p.name} ${p.shorthand}`));
      const item = (await list()).items.find((i: { id: string }) => i.id === d.id);
      fromList.push(...item.ports.map((p: { name: string; shorthand: string }) => `${p.name} ${p.shorthand}`));
      for (const [i, p] of item.ports.entries()) interfaces.push([p.interface, d.ports[i].settings.interface]);
    }
    expect(fromDevices).toHaveLength(settings.length);
    expect(fromDevices).toContain('P00 1200 7-N-1');
    expect(fromDevices).toContain('P04 1200 7-E-1.5');
    expect(fromDevices).toContain('P14 1200 7-S-2');
    expect(fromDevices).toContain('P17 TCP gw-7.fernhollow.test:4001');
    expect(fromList).toEqual(fromDevices);
    for (const [inList, onDevice] of interfaces) expect(inList).toBe(onDevice);
  });

  it('writes a TCP port as its address alike in the list, on the device, on the card and in both CSV exports', async () => {
    const m = await makeMachine(eng);
    const settings = { interface: 'tcp', tcpHost: '192.168.0.10', tcpPort: 502, baud: 19200, parity: 'even', protocol: 'modbus-rtu' };
    const d = await makeDevice(eng, m.id, { tag: `TCP-${uid()}`, ports: [{ name: 'Ethernet', settings }] });
    const want = 'TCP 192.168.0.10:502';
    const csv = async (table: string) => {
      const res = await eng.request('GET', `/api/export/csv?table=${table}&machineId=${m.id}`);
      expect(res.status).toBe(200);
      return Papa.parse<Record<string, string>>(String(res.body).replace(/^\ufeff/, ''), { header: true, skipEmptyLines: true }).data;
    };
    const list = expectOk(await eng.get(`/api/devices?machineId=${m.id}`));
    expect(list.items[0].ports[0].shorthand).toBe(want);
    expect((await csv('ports'))[0]!.shorthand).toBe(want);
    expect((await csv('devices'))[0]!.ports).toBe(`Ethernet: ${want}`);
    expect(d.ports[0].shorthand).toBe(want);
    expect(d.ports[0].text).toContain(`Port: ${want}\nInterface: Serial over TCP\nBaud rate: 19200\nData bits: 8\nParity: Even\n`);
    const card = await eng.get(`/field/devices/${d.id}`);
    expect(card.status).toBe(200);
    expect(card.body).toContain(`>${want}</p>`);
  });

  it('lists sites and machines with their counts', async () => {
    const s = await makeSite(eng);
    const m = expectOk(await eng.post('/api/machines', { siteId: s.id, name: 'Palletiser' }), 201);
    await makeDevice(eng, m.id);
    const sites = expectOk(await eng.get(`/api/sites?q=${encodeURIComponent(s.name)}`));
    expect(sites.items[0]).toMatchObject({ id: s.id, machineCount: 1, deviceCount: 1 });
    const machines = expectOk(await eng.get(`/api/machines?siteId=${s.id}`));
    expect(machines.items[0]).toMatchObject({ id: m.id, deviceCount: 1, siteName: s.name });
  });
});
