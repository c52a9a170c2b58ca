/**
 * CSV export guards text cells a spreadsheet would run as formulas (OWASP "CSV Injection": cells starting with
 * = + - @, tab or carriage return get a leading apostrophe), keeps numbers numeric, and the CSV import takes
 * the guard off again, so a team's own export imports unchanged.
 */
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, rs485 } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;
beforeAll(async () => {
  team = await createTeamWithRoles('csv-guard');
  eng = team.members.engineer;
}, 60_000);

/** Text values that start a formula, with the cell each must come out as. */
const RISKY: [string, string][] = [
  [`-2+3+cmd|' /C calc'!A0`, `'-2+3+cmd|' /C calc'!A0`],
  ['=SUM(A1:A2)', `'=SUM(A1:A2)`],
  ['+41 55 123', `'+41 55 123`],
  ['@SUM(1)', `'@SUM(1)`],
  ['-5', `'-5`],
  ['-x', `'-x`],
  [`'=already`, `''=already`],
];

async function csvOf(path: string): Promise<Record<string, string>[]> {
  const res = await eng.request('GET', path);
  expect(res.status).toBe(200);
  return Papa.parse<Record<string, string>>(String(res.body).replace(/^\ufeff/, ''), { header: true, skipEmptyLines: true }).data;
}

describe('CSV export guard', () => {
  it('puts an apostrophe before every text cell that starts with = + - @ (also after an apostrophe)', async () => {
    const m = await makeMachine(eng);
    for (const [i, [value]] of RISKY.entries()) {
      await makeDevice(eng, m.id, { tag: `G-${i}`, name: value, maker: value, ports: [{ name: value, settings: rs485({ nodeAddress: i + 1 }) }] });
    }
    const devices = await csvOf(`/api/export/csv?table=devices&machineId=${m.id}&sort=tag`);
    const ports = await csvOf(`/api/export/csv?table=ports&machineId=${m.id}`);
    for (const [i, [value, cell]] of RISKY.entries()) {
      const d = devices.find((r) => r.tag === `G-${i}`)!;
      expect(d.name, value).toBe(cell);
      expect(d.maker, value).toBe(cell);
      expect(ports.find((r) => r.deviceTag === `G-${i}`)!.portName, value).toBe(cell);
    }
  });

  it('guards cells that start with a tab or a carriage return', async () => {
    const d = await makeDevice(eng);
    const db = testDb();
    try {
      await db.execute({ sql: 'UPDATE device SET name = ?, maker = ? WHERE id = ?', args: ['\t=1+1', '\r=1+1', d.id] });
    } finally {
      db.close();
    }
    const [row] = await csvOf(`/api/export/csv?table=devices&machineId=${d.machineId}`);
    expect(row!.name).toBe(`'\t=1+1`);
    expect(row!.maker).toBe(`'\r=1+1`);
  });

  it('keeps numbers numeric: baud, data bits, address, counts and versions', async () => {
    const m = await makeMachine(eng);
    await makeDevice(eng, m.id, { tag: 'NUM-1', ports: [{ name: 'Bus', settings: rs485({ baud: 115200, nodeAddress: 247 }) }] });
    const [p] = await csvOf(`/api/export/csv?table=ports&machineId=${m.id}`);
    expect(p).toMatchObject({ baud: '115200', dataBits: '8', stopBits: '1', nodeAddress: '247', version: '1', portName: 'Bus' });
    const machines = await csvOf(`/api/export/csv?table=machines&siteId=${m.siteId}`);
    expect(machines[0]).toMatchObject({ devices: '1', links: '0' });
  });

  it('imports a team’s own export unchanged: the guard comes off again', async () => {
    const m = await makeMachine(eng);
    for (const [i, [value]] of RISKY.entries()) {
      await makeDevice(eng, m.id, { tag: `${value}#${i}`, ports: [{ name: value, settings: rs485({ baud: 19200, nodeAddress: i + 1 }) }] });
    }
    const res = await eng.request('GET', `/api/export/csv?table=ports&machineId=${m.id}`);
    const csv = String(res.body).replace(/^\ufeff/, '');
    const target = await makeMachine(eng);
    const mapping = { tag: 'deviceTag', portName: 'portName', shorthand: 'shorthand', interface: 'interface', nodeAddress: 'nodeAddress', termination: 'termination', protocol: 'protocol' };
    const done = expectOk(await eng.post('/api/import/csv', { machineId: target.id, csv, mapping, apply: true }), 201);
    expect(done).toMatchObject({ applied: true, errorCount: 0, devices: RISKY.length, ports: RISKY.length });
    const list = expectOk(await eng.get(`/api/devices?machineId=${target.id}&pageSize=50`));
    const imported = new Map(list.items.map((d: { tag: string; ports: { name: string; shorthand: string }[] }) => [d.tag, d.ports]));
    for (const [i, [value]] of RISKY.entries()) {
      const ports = imported.get(`${value}#${i}`) as { name: string; shorthand: string }[] | undefined;
      expect(ports?.map((p) => p.name), value).toEqual([value]);
      expect(ports?.[0]?.shorthand).toBe('19200 8-E-1');
    }
  });
});
