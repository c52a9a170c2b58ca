/**
 * Long jobs never stall other requests: while a large CSV import runs, health checks and device-list
 * reads are answered, and the import still writes all its rows or none.
 */
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { createClient, type Client } from '@libsql/client';
import { createTeamWithRoles, testDb, TestClient, type TeamFixture } from '../helpers/client';
import { startServer } from '../helpers/server';
import { expectOk, makeMachine, makeSite, rs485 } from './vault-fixtures';

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
    const lists: { beforeImport: boolean; total: number; capped: boolean; first?: string; last?: string }[] = [];
    const healthLoop = (async () => {
      while (!importDone) {
        const res = await probe.get('/api/health');
        expect(res.status).toBe(200);
        health.push(!importDone);
      }
    })();
    const listLoop = (async () => {
      while (!importDone) {
        // The list's total stops at 1,000 (docs/api.md), so a full list is also checked at both ends of the tag order.
        const res = await reader.get(`/api/devices?machineId=${m.id}&pageSize=1&sort=tag&dir=asc`);
        expect(res.status).toBe(200);
        const last = res.body.total ? expectOk(await reader.get(`/api/devices?machineId=${m.id}&pageSize=1&sort=tag&dir=desc`)).items[0]?.tag : undefined;
        lists.push({ beforeImport: !importDone, total: res.body.total, capped: res.body.totalCapped, first: res.body.items[0]?.tag, last });
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
    const everything = { total: 1000, capped: true, first: 'LJ-000000', last: `LJ-${String(ROWS - 1).padStart(6, '0')}` };
    for (const l of lists) if (l.total !== 0) expect(l).toMatchObject(everything);
    expect(expectOk(await reader.get(`/api/devices?machineId=${m.id}&pageSize=5`))).toMatchObject({ total: 1000, totalCapped: true });
    expect(await countRows(`SELECT count(*) AS n FROM device WHERE machine_id = ? AND deleted_at IS NULL`, [m.id])).toBe(ROWS);
  }, 60_000);
});

const jobIds = async (c: TestClient): Promise<string[]> => expectOk(await c.get('/api/import/jobs')).items.map((j: { id: string }) => j.id);

/** Polls the team's import list until an import not in `known` has begun staging rows (past the checking half). */
async function untilStaging(c: TestClient, rows: number, known: string[]): Promise<{ id: string; done: number; total: number }> {
  for (;;) {
    const job = expectOk(await c.get('/api/import/jobs')).items.find((j: { id: string }) => !known.includes(j.id));
    if (job && job.state === 'checking' && job.done > rows) return job;
    if (job && job.state !== 'checking') throw new Error(`the import reached ${job.state} before the test could step in`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

async function count(db: Client, sql: string, args: string[]): Promise<number> {
  return Number((await db.execute({ sql, args })).rows[0]!.n);
}

async function countRows(sql: string, args: string[]): Promise<number> {
  const db = testDb();
  try {
    return await count(db, sql, args);
  } finally {
    db.close();
  }
}


/** Everything a reader can see of an import's rows, read while it stages them; `answeredBy` is when the last answer came. */
async function readWhileStaging(eng: TestClient, viewer: TestClient, machineId: string, jobId: string, prefix: string) {
  const db = testDb();
  try {
    const hiddenDevices = await count(db, 'SELECT count(*) AS n FROM device WHERE machine_id = ? AND trash_id = ? AND deleted_at IS NOT NULL', [machineId, jobId]);
    const hiddenPorts = await count(db, 'SELECT count(*) AS n FROM port WHERE trash_id = ?', [jobId]);
    const searchRows = await count(db, `SELECT count(*) AS n FROM device_search WHERE tag LIKE '${prefix}-%'`, []);
    const listTotal = expectOk(await viewer.get(`/api/devices?machineId=${machineId}&pageSize=5`)).total;
    const filteredTotal = expectOk(await viewer.get(`/api/devices?q=${prefix}-000001&pageSize=5`)).total;
    const searchItems = expectOk(await viewer.get(`/api/devices/search?q=${prefix}-000001`)).items.length;
    const searchTotal = expectOk(await viewer.get(`/api/devices/search?q=${prefix}`)).total;
    const inTrash = expectOk(await eng.get('/api/trash')).items.some((i: { label: string }) => i.label.startsWith(`${prefix}-`));
    const portsCsv = String((await eng.get(`/api/export/csv?table=ports&machineId=${machineId}`)).body);
    const inExport = expectOk(await eng.get(`/api/export`)).devices.some((d: { tag: string }) => d.tag.startsWith(`${prefix}-`));
    // Their history is written with them, stamped with the job: the team's history shows none of it yet.
    // (The newest page first: whatever of the job's history it could show was written before the stamped rows are read.)
    const historyPage = expectOk(await viewer.get('/api/revisions?pageSize=100')).items as { id: string }[];
    const staged = new Set((await db.execute({ sql: 'SELECT id FROM revision WHERE job_id = ?', args: [jobId] })).rows.map((r) => String(r.id)));
    const historyShowsStaged = historyPage.some((r) => staged.has(r.id));
    const oneStaged = [...staged][0];
    const stagedRevisionStatus = oneStaged ? (await viewer.get(`/api/revisions/${oneStaged}`)).status : null;
    return {
      prefix, hiddenDevices, hiddenPorts, searchRows, listTotal, filteredTotal, searchItems, searchTotal, inTrash, portsCsv, inExport,
      stagedHistory: staged.size, historyShowsStaged, oneStaged, stagedRevisionStatus, answeredBy: Date.now(),
    };
  } finally {
    db.close();
  }
}

describe('all rows or none', () => {
  it('an import whose final check fails (a clashing device added meanwhile) writes nothing and clears its staged rows', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const revisions = () => count(testDb(), "SELECT count(*) AS n FROM revision WHERE team_id = ? AND summary = 'Imported from CSV'", [team.teamId]);
    const revisionsBefore = await revisions();
    const known = await jobIds(eng);
    const importing = eng.post('/api/import/csv', { machineId: m.id, csv: bigCsv(ROWS, 'AN'), mapping, apply: true });
    const job = await untilStaging(team.members.admin, ROWS, known);
    expect(job.total).toBe(ROWS * 2);
    // Added by someone else while the file is being staged: the same tag as the file's last row.
    expectOk(await team.members.admin.post('/api/devices', { machineId: m.id, tag: `AN-${String(ROWS - 1).padStart(6, '0')}`, ports: [{ name: 'Bus', settings: rs485() }] }), 201);
    const res = await importing;
    expect(res.status, JSON.stringify(res.body)).toBe(409);
    expect(res.body.error).toMatch(/was added to .* while the file was imported; nothing was imported/);

    expect(expectOk(await eng.get(`/api/devices?machineId=${m.id}`)).total).toBe(1);
    const after = expectOk(await eng.get('/api/import/jobs')).items.find((j: { id: string }) => j.id === job.id);
    expect(after).toMatchObject({ state: 'failed', kind: 'csv-import' });
    expect(after.message).toMatch(/nothing was imported/);
    const db = testDb();
    try {
      expect(await count(db, 'SELECT count(*) AS n FROM job_row WHERE job_id = ?', [job.id])).toBe(0);
      expect(await count(db, "SELECT count(*) AS n FROM device WHERE machine_id = ? AND tag LIKE 'AN-%'", [m.id])).toBe(1);
      expect(await revisions()).toBe(revisionsBefore);
    } finally {
      db.close();
    }
  }, 60_000);

  it('an import interrupted by a server stop shows nothing; the next start removes what it wrote once it has been silent long enough', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'long-jobs-'));
    const databaseUrl = `file:${join(dir, 'shared.db')}`;
    const first = await startServer({ DATABASE_URL: databaseUrl });
    const db = createClient({ url: databaseUrl });
    try {
      const owner = await new TestClient(first.baseUrl).signUp('interrupted');
      expectOk(await owner.post('/api/teams', { name: 'Interrupted imports' }), 201);
      const site = await makeSite(owner);
      const m = expectOk(await owner.post('/api/machines', { siteId: site.id, name: 'Line 1' }), 201);
      const importing = owner.post('/api/import/csv', { machineId: m.id, csv: bigCsv(ROWS, 'IN'), mapping, apply: true }).catch((err: Error) => err);
      const job = await untilStaging(owner, ROWS, []);
      // Stopped once writing has begun: records out of sight, and their history stamped with the job.
      while ((await count(db, 'SELECT count(*) AS n FROM revision WHERE job_id = ?', [job.id])) === 0) await new Promise((r) => setTimeout(r, 10));
      await first.stop();
      expect(await importing).toBeInstanceOf(Error);

      // Written so far: devices out of sight (the job's stamp) and their history (stamped too); none of it shown.
      expect(await count(db, 'SELECT count(*) AS n FROM device WHERE machine_id = ? AND trash_id = ? AND deleted_at IS NOT NULL', [m.id, job.id])).toBeGreaterThan(0);
      expect(await count(db, 'SELECT count(*) AS n FROM revision WHERE job_id = ?', [job.id])).toBeGreaterThan(0);
      expect(await count(db, 'SELECT count(*) AS n FROM device WHERE machine_id = ? AND deleted_at IS NULL', [m.id])).toBe(0);
      expect(await count(db, "SELECT count(*) AS n FROM device_search WHERE tag LIKE 'IN-%'", [])).toBeGreaterThan(0);
      // Silent for longer than a running job ever is (every batch touches the job).
      await db.execute({ sql: 'UPDATE job SET updated_at = updated_at - 11 * 60 * 1000 WHERE id = ?', args: [job.id] });

      const second = await startServer({ DATABASE_URL: databaseUrl });
      try {
        expect(await count(db, 'SELECT count(*) AS n FROM job_row WHERE job_id = ?', [job.id])).toBe(0);
        expect(await count(db, 'SELECT count(*) AS n FROM revision WHERE job_id = ?', [job.id])).toBe(0);
        expect(await count(db, 'SELECT count(*) AS n FROM device WHERE machine_id = ?', [m.id])).toBe(0);
        expect(await count(db, 'SELECT count(*) AS n FROM port WHERE trash_id = ?', [job.id])).toBe(0);
        // Their search rows went with them.
        expect(await count(db, "SELECT count(*) AS n FROM device_search WHERE tag LIKE 'IN-%'", [])).toBe(0);
        const again = new TestClient(second.baseUrl);
        again.cookies = owner.cookies;
        const listed = expectOk(await again.get('/api/import/jobs')).items[0];
        expect(listed).toMatchObject({ id: job.id, state: 'failed' });
        expect(listed.message).toMatch(/Interrupted/);
      } finally {
        await second.stop();
      }
    } finally {
      db.close();
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});

describe('records written before the final transaction', () => {
  it('stay out of sight of every list, search, export and the trash until the import commits, then all show with their history', async () => {
    // A team of its own, so the export read meanwhile holds this import alone.
    const own = await createTeamWithRoles('out-of-sight');
    const eng = own.members.engineer;
    const viewer = own.members.viewer;
    // What every reader sees while the import stages its rows. The checks count only if all of them were answered
    // before the final transaction began (the job's finish time is stamped inside it, before its commit); an
    // import quick enough to commit meanwhile proves nothing, so a larger one is tried.
    let seen: Awaited<ReturnType<typeof readWhileStaging>> | undefined;
    let rows = ROWS;
    let m!: { id: string };
    let jobId = '';
    for (let attempt = 0; attempt < 3 && !seen; attempt++, rows *= 2) {
      m = await makeMachine(eng);
      const known = await jobIds(eng);
      const importing = eng.post('/api/import/csv', { machineId: m.id, csv: bigCsv(rows, `O${attempt}`), mapping, apply: true });
      const job = await untilStaging(own.members.admin, rows + rows / 4, known).catch(() => null);
      const read = job ? await readWhileStaging(eng, viewer, m.id, job.id, `O${attempt}`) : null;
      expectOk(await importing, 201);
      if (!job || !read) continue;
      if (read.answeredBy < await countRows('SELECT finished_at AS n FROM job WHERE id = ?', [job.id])) {
        seen = read;
        jobId = job.id;
      }
    }
    if (!seen) throw new Error('every import committed before the checks were done; none could be checked');
    const prefix = seen.prefix;
    rows /= 2;
    // A quarter of the file is written, out of sight: stamped with the job's id like the trash stamps a record.
    expect(seen.hiddenDevices).toBeGreaterThanOrEqual(rows / 4);
    expect(seen.hiddenPorts).toBeGreaterThanOrEqual(rows / 4);
    // Their search rows are written with them (so showing them adds none); a search reads live devices only.
    expect(seen.searchRows).toBeGreaterThanOrEqual(rows / 4);
    expect(seen.listTotal).toBe(0);
    expect(seen.filteredTotal).toBe(0);
    expect(seen.searchItems).toBe(0);
    expect(seen.searchTotal).toBe(0);
    expect(seen.inTrash).toBe(false);
    expect(seen.inExport).toBe(false);
    expect(seen.portsCsv).not.toMatch(new RegExp(`${prefix}-0`));
    // Their history: written (a device's and its port's creation revisions with them), listed nowhere, not found by id.
    expect(seen.stagedHistory).toBeGreaterThanOrEqual(rows / 2);
    expect(seen.historyShowsStaged).toBe(false);
    expect(seen.stagedRevisionStatus).toBe(404);

    expect(expectOk(await viewer.get(`/api/devices?machineId=${m.id}&pageSize=5`))).toMatchObject({ total: 1000, totalCapped: true });
    // The commit that marked the job done shows its history: the revision read by id before is there now.
    expect(expectOk(await viewer.get(`/api/revisions/${seen.oneStaged}`))).toMatchObject({ id: seen.oneStaged, summary: 'Imported from CSV', version: 1 });
    expect(expectOk(await viewer.get(`/api/revisions/${seen.oneStaged}`))).not.toHaveProperty('jobId');
    expect(expectOk(await viewer.get(`/api/devices?q=${prefix}-000001&pageSize=5`)).total).toBe(1);
    const after = testDb();
    try {
      expect(await count(after, 'SELECT count(*) AS n FROM device WHERE trash_id = ? OR (machine_id = ? AND deleted_at IS NOT NULL)', [jobId, m.id])).toBe(0);
      // Every device and port has its creation revision, committed with it; the stage is empty.
      expect(await count(after, "SELECT count(*) AS n FROM revision r JOIN device d ON d.id = r.entity_id WHERE d.machine_id = ? AND r.summary = 'Imported from CSV'", [m.id])).toBe(rows);
      expect(await count(after, "SELECT count(*) AS n FROM revision r JOIN port p ON p.id = r.entity_id JOIN device d ON d.id = p.device_id WHERE d.machine_id = ? AND r.summary = 'Imported from CSV'", [m.id])).toBe(rows);
      expect(await count(after, 'SELECT count(*) AS n FROM job_row WHERE job_id = ?', [jobId])).toBe(0);
      // One search row per device: written while staging, none added when shown.
      expect(await count(after, `SELECT count(*) AS n FROM device_search WHERE tag LIKE '${prefix}-%'`, [])).toBe(rows);
    } finally {
      after.close();
    }
  }, 180_000);

  it('history an earlier version left staged for a committed import (its server stopped mid-move) is moved at the next start', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'long-jobs-history-'));
    const databaseUrl = `file:${join(dir, 'shared.db')}`;
    const first = await startServer({ DATABASE_URL: databaseUrl });
    const db = createClient({ url: databaseUrl });
    try {
      const owner = await new TestClient(first.baseUrl).signUp('history-resume');
      expectOk(await owner.post('/api/teams', { name: 'History resumes' }), 201);
      const site = await makeSite(owner);
      const m = expectOk(await owner.post('/api/machines', { siteId: site.id, name: 'Line 1' }), 201);
      expectOk(await owner.post('/api/import/csv', { machineId: m.id, csv: bigCsv(1200, 'HR'), mapping, apply: true }), 201);
      await first.stop();
      const [job] = (await db.execute("SELECT id FROM job WHERE kind = 'csv-import' AND state = 'done'")).rows;
      const imported = "SELECT count(*) AS n FROM revision WHERE summary = 'Imported from CSV'";
      expect(await count(db, imported, [])).toBe(2400);
      // As an earlier version, which moved a job's history out of the stage after the commit, left it when its
      // server stopped during the move: part of it moved, the rest staged.
      const columns = (await db.execute('PRAGMA table_info(revision)')).rows.map((r) => String(r.name));
      await db.execute({
        sql: `INSERT INTO job_row (job_id, target, seq, data) SELECT ?, 'revision', (SELECT count(*) FROM revision r2 WHERE r2.rowid < revision.rowid), json_array(${columns.join(', ')}) FROM revision WHERE summary = 'Imported from CSV' AND rowid > (SELECT min(rowid) + 499 FROM revision WHERE summary = 'Imported from CSV')`,
        args: [String(job!.id)],
      });
      await db.execute("DELETE FROM revision WHERE summary = 'Imported from CSV' AND rowid > (SELECT min(rowid) + 499 FROM revision WHERE summary = 'Imported from CSV')");
      expect(await count(db, imported, [])).toBe(500);

      const second = await startServer({ DATABASE_URL: databaseUrl });
      try {
        expect(await count(db, imported, [])).toBe(2400);
        expect(await count(db, 'SELECT count(DISTINCT entity_id) AS n FROM revision WHERE summary = ?', ['Imported from CSV'])).toBe(2400);
        expect(await count(db, 'SELECT count(*) AS n FROM job_row', [])).toBe(0);
        const again = new TestClient(second.baseUrl);
        again.cookies = owner.cookies;
        const d = expectOk(await again.get(`/api/devices?machineId=${m.id}&pageSize=1&sort=tag`)).items[0];
        const history = expectOk(await again.get(`/api/revisions?entityType=device&entityId=${d.id}`)).items;
        expect(history.map((r: { summary: string; version: number }) => [r.summary, r.version])).toEqual([['Imported from CSV', 1]]);
      } finally {
        await second.stop();
      }
    } finally {
      db.close();
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});

describe('JSON import as a staged job', () => {
  it('two imports of one document at once create its records once; a loser is refused at the final check with nothing written', async () => {
    const [from, into] = await Promise.all([createTeamWithRoles('json-from'), createTeamWithRoles('json-into')]);
    const m = await makeMachine(from.members.owner);
    expectOk(await from.members.owner.post('/api/import/csv', { machineId: m.id, csv: bigCsv(2000, 'JS'), mapping, apply: true }), 201);
    const doc = expectOk(await from.members.owner.get('/api/export'));
    expect(doc.devices).toHaveLength(2000);

    const replies = await Promise.all([into.members.admin, into.members.engineer].map((c) => c.post('/api/import', { document: doc, apply: true })));
    for (const r of replies) expect([201, 409], JSON.stringify(r.body)).toContain(r.status);
    expect(replies.some((r) => r.status === 201 && r.body.counts.devices.create === 2000)).toBe(true);
    for (const r of replies.filter((x) => x.status === 409)) expect(r.body.error).toMatch(/nothing was written/);
    const db = testDb();
    try {
      for (const [table, n] of [['device', 2000], ['port', 2000], ['machine', 1], ['import_map', 4002]] as const) {
        expect(await count(db, `SELECT count(*) AS n FROM ${table} WHERE team_id = ?`, [into.teamId]), table).toBe(n);
      }
      expect(await count(db, 'SELECT count(*) AS n FROM job_row j JOIN job ON job.id = j.job_id WHERE job.team_id = ?', [into.teamId])).toBe(0);
    } finally {
      db.close();
    }
    const jobs = expectOk(await into.members.admin.get('/api/import/jobs')).items;
    expect(jobs.map((j: { kind: string }) => j.kind)).toEqual(['json-import', 'json-import']);
    expect(jobs.filter((j: { state: string }) => j.state === 'done').length).toBeGreaterThanOrEqual(1);
  }, 90_000);
});

describe('a parent moved to the trash while an import runs', () => {
  it('refuses the import at its final check and leaves nothing of it', async () => {
    const [from, into] = await Promise.all([createTeamWithRoles('json-parent-from'), createTeamWithRoles('json-parent-into')]);
    const m = await makeMachine(from.members.owner);
    // First the machine alone, so the second document adds devices under a machine already imported.
    const first = expectOk(await from.members.owner.get('/api/export'));
    expectOk(await into.members.admin.post('/api/import', { document: first, apply: true }), 201);
    const target = expectOk(await into.members.admin.get('/api/machines?pageSize=5')).items.find((x: { name: string }) => x.name === m.name);
    expectOk(await from.members.owner.post('/api/import/csv', { machineId: m.id, csv: bigCsv(6000, 'TP'), mapping, apply: true }), 201);
    const doc = expectOk(await from.members.owner.get('/api/export'));
    const known = await jobIds(into.members.admin);
    const importing = into.members.admin.post('/api/import', { document: doc, apply: true });
    await untilStaging(into.members.admin, 1000, known);
    expectOk(await into.members.admin.del(`/api/machines/${target.id}`));
    const res = await importing;
    expect(res.status, JSON.stringify(res.body)).toBe(409);
    expect(res.body.error).toMatch(/nothing was (imported|written)/);
    const db = testDb();
    try {
      expect(await count(db, 'SELECT count(*) AS n FROM device WHERE team_id = ?', [into.teamId])).toBe(0);
      expect(await count(db, 'SELECT count(*) AS n FROM port WHERE team_id = ?', [into.teamId])).toBe(0);
      expect(await count(db, "SELECT count(*) AS n FROM device_search WHERE team = 't' || lower(hex(?))", [into.teamId])).toBe(0);
      expect(await count(db, "SELECT count(*) AS n FROM job_row j JOIN job ON job.id = j.job_id WHERE job.team_id = ?", [into.teamId])).toBe(0);
    } finally {
      db.close();
    }
  }, 120_000);
});

describe('the write-ahead log', () => {
  it('is copied into the database file by the checkpointer within seconds, long before the log would fill 1,000 pages', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'checkpoint-'));
    const path = join(dir, 'app.db');
    const server = await startServer({ DATABASE_URL: `file:${path}` });
    try {
      const owner = await new TestClient(server.baseUrl).signUp('checkpointed');
      expectOk(await owner.post('/api/teams', { name: 'Checkpointed' }), 201);
      const site = await makeSite(owner);
      // The database file alone (a copy without its -wal file) shows only what a checkpoint has copied into it.
      const inFile = async () => {
        const copy = join(dir, `copy-${Date.now()}.db`);
        copyFileSync(path, copy);
        const c = createClient({ url: `file:${copy}` });
        try {
          return await count(c, 'SELECT count(*) AS n FROM site WHERE id = ?', [site.id]);
        } catch {
          return 0; // not even the tables are in the file yet
        } finally {
          c.close();
        }
      };
      const deadline = Date.now() + 10_000;
      let found = await inFile();
      while (!found && Date.now() < deadline) {
        await new Promise((r) => setTimeout(r, 250));
        found = await inFile();
      }
      expect(found).toBe(1);
    } finally {
      await server.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
