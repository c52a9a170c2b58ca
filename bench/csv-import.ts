/**
 * CSV import benchmark (not a test): 10,000 rows (one device with one port each) imported end to end through the
 * built server (dist/): the preview, then the apply, as the import panel sends them, while a second client asks for
 * `/api/health` and a device-list page every 50 ms. Target: preview + apply ≤ 2 s, and the server keeps answering
 * (no probe slower than 1 s, none failed). The server's memory (RSS) is read before and after.
 * CSV_ROWS picks the row count; BENCH_JSON=file writes the figures for scripts/perf-table.mjs.
 * Run: node_modules/.bin/tsx bench/csv-import.ts   (build first: node_modules/.bin/astro build)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { freePort } from '../tests/helpers/server';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ROWS = Number(process.env.CSV_ROWS ?? 10_000);
const TARGET_MS = 2_000;
const PROBE_TARGET_MS = 1_000;
const LARGE = { email: 'large@baudbook.test', password: 'baudbook-large-team' };

/** CPU time (user + system) the process has used, in ms: less shaken than wall time by other work on the machine. */
const cpuMs = (pid: number) => {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // utime, stime in clock ticks (100 a second on Linux)
};
const rssMb = (pid: number) => Number(/VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? NaN) / 1024;
const pct = (xs: number[], p: number) => (xs.length ? [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor((p / 100) * xs.length))]! : NaN);

if (!existsSync('dist/server/entry.mjs')) throw new Error('Build first: node_modules/.bin/astro build');
const dir = mkdtempSync(join(tmpdir(), 'baudbook-csv-bench-'));
const url = `file:${join(dir, 'bench.db')}`;
const env = { ...process.env, DATABASE_URL: url, BETTER_AUTH_SECRET: process.env.BETTER_AUTH_SECRET ?? 'bench-secret-not-for-production-0123456789abcdef' };
const children: ChildProcess[] = [];
try {
  // A small team (one site, ten machines, one device) with a signed-up owner: `npm run seed:large -- --devices 1`.
  await new Promise<void>((resolve, reject) => {
    const c = spawn(process.execPath, ['--import', 'tsx', 'scripts/seed-large.ts', '--devices', '1'], { env, stdio: ['ignore', 'ignore', 'inherit'] });
    c.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`seed exited with ${code}`))));
  });
  const port = await freePort();
  const app = `http://127.0.0.1:${port}`;
  let log = '';
  // BENCH_PROFILE=dir writes the server's CPU profile there (node --cpu-prof), to see where the import's time goes.
  const profile = process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE}`] : [];
  const server = spawn(process.execPath, [...profile, 'server/serve.mjs'], { env: { ...env, HOST: '127.0.0.1', PORT: String(port), BASE_URL: app, SEED_DEMO: '0' }, stdio: ['ignore', 'pipe', 'pipe'] });
  children.push(server);
  server.stdout!.on('data', (d) => (log += d));
  server.stderr!.on('data', (d) => (log += d));
  for (let i = 0; ; i++) {
    if (server.exitCode !== null || i > 300) throw new Error(`server did not start:\n${log}`);
    try {
      if ((await fetch(`${app}/api/health`)).ok) break;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const signIn = await fetch(`${app}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin: app }, body: JSON.stringify(LARGE) });
  if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status}`);
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const headers = { cookie, origin: app, 'content-type': 'application/json' };
  const machineId = 'mach_large_0_1';

  const parities = ['N', 'E', 'O'];
  const lines = ['tag,name,maker,model,serial,port,settings,interface,address,termination'];
  for (let i = 0; i < ROWS; i++) {
    lines.push(`BN-${String(i).padStart(5, '0')},Conveyor drive ${i},Quillmoor,QD-${i % 40},SN${100000 + i},RS-485,${[9600, 19200, 38400][i % 3]} 8-${parities[i % 3]}-1,RS-485 2-wire,${(i % 247) + 1},${i % 2 ? 'yes' : 'no'}`);
  }
  const request = {
    machineId, csv: lines.join('\n'), apply: false, skipInvalid: false,
    mapping: { tag: 'tag', name: 'name', maker: 'maker', model: 'model', serialNumber: 'serial', portName: 'port', shorthand: 'settings', interface: 'interface', nodeAddress: 'address', termination: 'termination' },
  };
  await new Promise((r) => setTimeout(r, 1000));
  const rssBefore = rssMb(server.pid!);

  // Probes on their own connection, every 50 ms, while the import runs.
  let importing = true;
  const probes: number[] = [];
  let probeFailures = 0;
  const probeLoop = (async () => {
    while (importing) {
      for (const path of ['/api/health', `/api/devices?machineId=mach_large_0_0&pageSize=5`]) {
        const t = performance.now();
        const r = await fetch(`${app}${path}`, { headers: { cookie } }).catch(() => null);
        if (!r?.ok) probeFailures++;
        await r?.arrayBuffer();
        probes.push(performance.now() - t);
      }
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  const cpu0 = cpuMs(server.pid!);
  const t0 = performance.now();
  const preview = await fetch(`${app}/api/import/csv`, { method: 'POST', headers, body: JSON.stringify(request) });
  const previewBody = (await preview.json()) as { errorCount: number };
  const t1 = performance.now();
  const applied = await fetch(`${app}/api/import/csv`, { method: 'POST', headers, body: JSON.stringify({ ...request, apply: true }) });
  const appliedBody = (await applied.json()) as { devices: number };
  const t2 = performance.now();
  const cpu = cpuMs(server.pid!) - cpu0;
  importing = false;
  await probeLoop;
  const list = (await (await fetch(`${app}/api/devices?machineId=${machineId}&pageSize=1`, { headers: { cookie } })).json()) as { total: number; totalCapped: boolean };
  await new Promise((r) => setTimeout(r, 1000));
  const rssAfter = rssMb(server.pid!);

  const total = t2 - t0;
  const probeMax = Math.max(...probes);
  const ok = preview.ok && applied.status === 201 && appliedBody.devices === ROWS;
  console.log(`CSV import of ${ROWS} rows (${(request.csv.length / 1024 / 1024).toFixed(1)} MB) through the server`);
  console.log(`  preview (parse + check):  ${(t1 - t0).toFixed(0)} ms, ${previewBody.errorCount} errors (${preview.status})`);
  console.log(`  apply (staged + final):   ${(t2 - t1).toFixed(0)} ms, ${appliedBody.devices} devices (${applied.status}); list now says ${list.total}${list.totalCapped ? '+' : ''}`);
  console.log(`  total:                    ${total.toFixed(0)} ms   target ≤ ${TARGET_MS} ms   ${total <= TARGET_MS && ok ? 'PASS' : 'FAIL'}`);
  console.log(`  other requests meanwhile: ${probes.length} answered, p50 ${pct(probes, 50).toFixed(0)} ms, p99 ${pct(probes, 99).toFixed(0)} ms, max ${probeMax.toFixed(0)} ms, ${probeFailures} failed   target max ≤ ${PROBE_TARGET_MS} ms   ${probeMax <= PROBE_TARGET_MS && probeFailures === 0 ? 'PASS' : 'FAIL'}`);
  console.log(`  server CPU meanwhile:      ${cpu.toFixed(0)} ms (the probes' requests included)`);
  console.log(`  server memory:            ${rssBefore.toFixed(0)} MB before, ${rssAfter.toFixed(0)} MB after`);
  if (process.env.BENCH_JSON) {
    writeFileSync(process.env.BENCH_JSON, JSON.stringify({
      date: new Date().toISOString(),
      figures: [
        { figure: `CSV import of ${ROWS.toLocaleString('en')} rows, preview + apply through the server`, target: `≤ ${TARGET_MS / 1000} s`, measured: `${(total / 1000).toFixed(2)} s (preview ${(t1 - t0).toFixed(0)} ms, apply ${(t2 - t1).toFixed(0)} ms)`, baseline: '', ratio: '', pass: total <= TARGET_MS && ok },
        { figure: 'other requests during the import (health, a device list page)', target: `all answered, max ≤ ${PROBE_TARGET_MS} ms`, measured: `${probes.length} answered, p50 ${pct(probes, 50).toFixed(0)} ms, p99 ${pct(probes, 99).toFixed(0)} ms, max ${probeMax.toFixed(0)} ms, ${probeFailures} failed`, baseline: '', ratio: '', pass: probeMax <= PROBE_TARGET_MS && probeFailures === 0 },
        { figure: 'server memory around the import: before / after', target: 'reported', measured: `${rssBefore.toFixed(0)} MB / ${rssAfter.toFixed(0)} MB`, baseline: '', ratio: '', pass: null },
      ],
    }, null, 2));
  }
  if (!(total <= TARGET_MS && ok)) process.exitCode = 1;
} finally {
  for (const c of children) c.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, process.env.BENCH_PROFILE ? 2500 : 300));
  rmSync(dir, { recursive: true, force: true });
}
