/** Concurrent writers and all-or-nothing multi-row writes. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, rs485 } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('vault-conc');
  eng = team.members.engineer;
}, 60_000);

async function count(sql: string, args: string[]): Promise<number> {
  const db = testDb();
  try {
    return Number((await db.execute({ sql, args })).rows[0]!.n);
  } finally {
    db.close();
  }
}

describe('concurrency', () => {
  it('200 concurrent updates to 200 different devices all persist, each with its revision', async () => {
    const m = await makeMachine(eng);
    const devices: any[] = [];
    for (let i = 0; i < 200; i += 20) {
      devices.push(...(await Promise.all(Array.from({ length: 20 }, (_, j) => eng.post('/api/devices', { machineId: m.id, tag: `CV-${i + j}` }).then((r) => expectOk(r, 201))))));
    }
    const results = await Promise.all(devices.map((d, i) => eng.patch(`/api/devices/${d.id}`, { version: d.version, firmware: `fw-${i}` })));
    expect(results.map((r) => r.status)).toEqual(devices.map(() => 200));
    const list = expectOk(await eng.get(`/api/devices?machineId=${m.id}&pageSize=200&sort=tag`));
    const byId = new Map(list.items.map((d: any) => [d.id, d]));
    devices.forEach((d, i) => {
      expect((byId.get(d.id) as any).firmware).toBe(`fw-${i}`);
      expect((byId.get(d.id) as any).version).toBe(2);
    });
    const revs = await count(
      "SELECT count(*) AS n FROM revision WHERE team_id = ? AND entity_type = 'device' AND action = 'update' AND entity_id IN (SELECT id FROM device WHERE machine_id = ?)",
      [team.teamId, m.id],
    );
    expect(revs).toBe(200);
  }, 60_000);

  it('two concurrent updates to the same device: one 200, one 409 with the winner', async () => {
    const d = await makeDevice(eng);
    const [a, b] = await Promise.all([
      eng.patch(`/api/devices/${d.id}`, { version: d.version, location: 'Cabinet A' }),
      team.members.admin.patch(`/api/devices/${d.id}`, { version: d.version, location: 'Cabinet B' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const loser = a.status === 409 ? a : b;
    const winner = a.status === 200 ? a : b;
    expect(loser.body.current.version).toBe(2);
    expect(loser.body.current.location).toBe(winner.body.location);
    const now = expectOk(await eng.get(`/api/devices/${d.id}`));
    expect(now.location).toBe(winner.body.location);
  });
});

describe('multi-row writes are one transaction', () => {
  it('a device whose second port clashes with the first (unique name) leaves no device, port or revision', async () => {
    const m = await makeMachine(eng);
    const tag = `TX-${Date.now()}`;
    const before = await count('SELECT count(*) AS n FROM revision WHERE team_id = ?', [team.teamId]);
    const res = await eng.post('/api/devices', {
      machineId: m.id,
      tag,
      ports: [{ name: 'COM1', settings: rs485() }, { name: 'COM1', settings: rs485() }],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.fields['ports.1.name']).toMatch(/already has this name/);
    expect(await count('SELECT count(*) AS n FROM device WHERE team_id = ? AND tag = ?', [team.teamId, tag])).toBe(0);
    expect(await count('SELECT count(*) AS n FROM port WHERE team_id = ? AND device_id NOT IN (SELECT id FROM device)', [team.teamId])).toBe(0);
    expect(await count('SELECT count(*) AS n FROM revision WHERE team_id = ?', [team.teamId])).toBe(before);
    const search = expectOk(await eng.get(`/api/devices/search?q=${tag}`));
    expect(search.total).toBe(0);
  });

  it('a link naming another team’s port writes neither the link nor any member', async () => {
    const other = await createTeamWithRoles('vault-conc-other');
    const foreign = await makeDevice(other.members.owner);
    const mine = await makeDevice(eng);
    const before = await count('SELECT count(*) AS n FROM link WHERE team_id = ?', [team.teamId]);
    const res = await eng.post('/api/links', {
      machineId: mine.machineId, name: 'Mixed bus', kind: 'rs485-bus',
      members: [{ portId: mine.ports[0].id, role: 'master' }, { portId: foreign.ports[0].id, role: 'slave' }],
    });
    expect(res.status).toBe(404);
    expect(res.body.fields['members.1.portId']).toBeTruthy();
    expect(await count('SELECT count(*) AS n FROM link WHERE team_id = ?', [team.teamId])).toBe(before);
    expect(await count('SELECT count(*) AS n FROM link_member WHERE port_id = ?', [mine.ports[0].id])).toBe(0);
  });

  it('a port renamed onto a sibling’s name answers 422 and changes nothing', async () => {
    const d = await makeDevice(eng);
    const [p0, p1] = d.ports;
    const res = await eng.patch(`/api/ports/${p1.id}`, { version: p1.version, name: p0.name, notes: 'renamed' });
    expect(res.status).toBe(422);
    expect(res.body.fields.name).toMatch(/already has this name/);
    const after = expectOk(await eng.get(`/api/ports/${p1.id}`));
    expect(after).toMatchObject({ name: p1.name, version: p1.version, notes: '' });
  });
});
