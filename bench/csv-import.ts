/**
 * CSV import benchmark: 10,000 rows (one device with one port each) through the import service
 * against a temporary database — parse, map, check every row, then write devices, ports and their
 * revisions in one transaction. Target: under 10 s for the whole preview + apply.
 * Run: node_modules/.bin/tsx bench/csv-import.ts
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ROWS = Number(process.env.CSV_ROWS ?? 10_000);
const TARGET_MS = 10_000;
const dir = mkdtempSync(join(tmpdir(), 'baudbook-csv-bench-'));
process.env.DATABASE_URL = `file:${join(dir, 'bench.db')}`;
process.env.BETTER_AUTH_SECRET ??= 'bench-secret-not-for-production';

const { ensureDatabase } = await import('../src/db/migrate');
const { db, client } = await import('../src/db/client');
const schema = await import('../src/db/schema');
const { previewCsvImport, applyCsvImport } = await import('../src/lib/server/field/csv-import');

await ensureDatabase();
await db.insert(schema.user).values({ id: 'usr_bench', name: 'Bench Runner', email: 'bench@example.test' });
await db.insert(schema.team).values({ id: 'team_bench', name: 'Bench team' });
await db.insert(schema.site).values({ id: 'site_bench', teamId: 'team_bench', name: 'Bench plant' });
await db.insert(schema.machine).values({ id: 'mach_bench', teamId: 'team_bench', siteId: 'site_bench', name: 'Bench line' });
const ctx = { user: { id: 'usr_bench', name: 'Bench Runner', email: 'bench@example.test' }, team: { id: 'team_bench', name: 'Bench team' }, role: 'owner' as const };

const parities = ['N', 'E', 'O'];
const lines = ['tag,name,maker,model,serial,port,settings,interface,address,termination'];
for (let i = 0; i < ROWS; i++) {
  lines.push(`BN-${String(i).padStart(5, '0')},Conveyor drive ${i},Quillmoor,QD-${i % 40},SN${100000 + i},RS-485,${[9600, 19200, 38400][i % 3]} 8-${parities[i % 3]}-1,RS-485 2-wire,${(i % 247) + 1},${i % 2 ? 'yes' : 'no'}`);
}
const request = {
  machineId: 'mach_bench', csv: lines.join('\n'), apply: false, skipInvalid: false,
  mapping: { tag: 'tag', name: 'name', maker: 'maker', model: 'model', serialNumber: 'serial', portName: 'port', shorthand: 'settings', interface: 'interface', nodeAddress: 'address', termination: 'termination' },
};

const t0 = performance.now();
const preview = await previewCsvImport(ctx, request);
const t1 = performance.now();
const applied = await applyCsvImport(ctx, { ...request, apply: true });
const t2 = performance.now();
const [{ n }] = (await client.execute("SELECT count(*) AS n FROM port WHERE team_id = 'team_bench'")).rows as unknown as { n: number }[];
client.close();
rmSync(dir, { recursive: true, force: true });

const total = t2 - t0;
console.log(`CSV import of ${ROWS} rows (${(request.csv.length / 1024 / 1024).toFixed(1)} MB)`);
console.log(`  preview (parse + check):      ${(t1 - t0).toFixed(0)} ms, ${preview.errorCount} errors`);
console.log(`  apply (check + write, 1 tx):  ${(t2 - t1).toFixed(0)} ms, ${applied.devices} devices, ${Number(n)} ports stored`);
console.log(`  total:                        ${total.toFixed(0)} ms   target < ${TARGET_MS} ms   ${total < TARGET_MS && Number(n) === ROWS ? 'PASS' : 'FAIL'}`);
if (Number(n) !== ROWS) process.exitCode = 1;
