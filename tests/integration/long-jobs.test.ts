/**
 * Long jobs never stall other requests: while a large CSV import runs, health checks and device-list
 * reads are answered, and the import still writes all its rows or none.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, TestClient, type TeamFixture } from '../helpers/client';
import { expectOk, makeMachine } from './vault-fixtures';

const ROWS = 10_000;
const mapping = { tag: 'Tag', name: 'Name', portName: 'Port', shorthand: 'Settings', nodeAddress: 'Address' };

/** One device with one RS-485 port per row; tags are unique within the file. */
export function bigCsv(rows: number, prefix: string): string {
  const lines = ['Tag,Name,Port,Settings,Address'];
  for (let i = 0; i < rows; i++) lines.push(`${prefix}-${String(i).padStart(6, '0')},Conveyor drive ${i},RS-485,${[9600, 19200, 38400][i % 3]} 8-${'NEO'[i % 3]}-1,${(i % 247) + 1}`);
  return lines.join('\n');
}

let team: TeamFixture;
beforeAll(async () => {
  team = await createTeamWithRoles('long-jobs');
}, 60_000);

describe('a large CSV import', () => {
  it('leaves health checks and device-list reads answering while it runs, and shows its rows all at once', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const other = await makeMachine(eng);
    const reader = team.members.viewer;
    const probe = new TestClient();

    let importDone = false;
    const importing = eng.post('/api/import/csv', { machineId: m.id, csv: bigCsv(ROWS, 'LJ'), mapping, apply: true }).finally(() => {
      importDone = true;
    });
    const health: boolean[] = [];
    const lists: { beforeImport: boolean; total: number }[] = [];
    const healthLoop = (async () => {
      while (!importDone) {
        const res = await probe.get('/api/health');
        expect(res.status).toBe(200);
        health.push(!importDone);
      }
    })();
    const listLoop = (async () => {
      while (!importDone) {
        const res = await reader.get(`/api/devices?machineId=${m.id}&pageSize=5`);
        expect(res.status).toBe(200);
        lists.push({ beforeImport: !importDone, total: res.body.total });
        expectOk(await reader.get(`/api/devices?machineId=${other.id}&pageSize=5`));
      }
    })();
    const done = expectOk(await importing, 201);
    await Promise.all([healthLoop, listLoop]);

    expect(done).toMatchObject({ applied: true, rows: ROWS, devices: ROWS, ports: ROWS, errorCount: 0 });
    // Answered while the import was still running (not just before it started or after it ended).
    expect(health.filter(Boolean).length).toBeGreaterThanOrEqual(20);
    expect(lists.filter((l) => l.beforeImport).length).toBeGreaterThanOrEqual(5);
    // Never a part of the import: nothing, or (in the last moments) everything.
    for (const l of lists) expect([0, ROWS]).toContain(l.total);
    expect(expectOk(await reader.get(`/api/devices?machineId=${m.id}&pageSize=5`)).total).toBe(ROWS);
  }, 60_000);
});
