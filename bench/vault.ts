/**
 * Vault endpoint benchmark (not a test): the built server (dist/) against a bare node:http +
 * @libsql/client baseline answering the same statements, at 10,000 and at 100,000 devices, each in a database of
 * its own. The 100,000-device database is seeded once and kept (BENCH_DB_DIR, default /tmp/bench-db-100k): a copy
 * of it is migrated per set of migrations and copied again for each run. Both scales' servers are up at once and
 * the endpoints are measured on all of them in turns (`measureEndpoints`). Then, one scale at a time: signed-in vault pages, a
 * JSON export of the whole team (the server's memory while it runs) and the server's memory at rest and after load.
 * BENCH_SCALES=10000,100000 picks the sizes; BENCH_ENDPOINTS=search (say) only those endpoints, without the pages; BENCH_JSON=file writes the figures for scripts/perf-table.mjs.
 * Run: node_modules/.bin/tsx bench/vault.ts   (build first: node_modules/.bin/astro build)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { createServer } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from '../tests/helpers/server';
import { createClient, type InArgs } from '@libsql/client';
import { SQLiteAsyncDialect } from 'drizzle-orm/sqlite-core';
// @ts-expect-error autocannon ships no type declarations (and none are installed)
import autocannon from 'autocannon';
import { deviceSearchStatement, SEARCH_CAP } from '../src/lib/server/vault/search-sql';

const SEARCHES = ['DRV-001', 'quillmoor 12', 'plant 7 line 3', 'SN12', 'printer 4'];
const SCALES = (process.env.BENCH_SCALES ?? '10000,100000').split(',').map(Number);
const DB_DIR = process.env.BENCH_DB_DIR ?? '/tmp/bench-db-100k';
const LARGE = { teamId: 'team_large_10k', email: 'large@baudbook.test', password: 'baudbook-large-team' };

// ---- baseline: the app's statements for each request (the session's read, then the page's), straight through @libsql/client ----
async function baseline(url: string, port: number, teamId: string, secret: string) {
  const db = createClient({ url, timeout: 5000 });
  const { SESSION_SQL } = await import('../src/lib/server/session-sql');
  const { verifySignedValue } = await import('../src/lib/server/signed-cookie');
  // The app's per-connection settings (its page cache among them), so both read through the same cache size.
  const { CONNECTION_PRAGMAS } = await import('../src/db/connection-settings');
  for (const pragma of CONNECTION_PRAGMAS) await db.execute(pragma);
  const { deviceListStatement, parseDeviceCursor } = await import('../src/lib/server/vault/device-list-sql');
  const { default: Database } = await import('libsql');
  if (Database.prototype.prepare.name === 'cachedPrepare') throw new Error('The baseline must run the plain client, without the app\'s statement cache.');
  const dialect = new SQLiteAsyncDialect();
  const toQuery = (statement: Parameters<typeof dialect.sqlToQuery>[0]) => {
    const q = dialect.sqlToQuery(statement);
    return { sql: q.sql, args: q.params as InArgs };
  };
  // Statements are built once per distinct query string, so the baseline spends nothing per request on building SQL.
  const built = new Map<string, { sql: string; args: InArgs } | null>();
  const listStatement = (u: URL) => {
    const after = u.searchParams.get('after');
    return toQuery(deviceListStatement(teamId, {
      page: Number(u.searchParams.get('page') ?? 1), pageSize: Number(u.searchParams.get('pageSize') ?? 50), sort: 'tag', dir: 'asc',
      ...(after ? { after: parseDeviceCursor(after)! } : {}),
    }));
  };
  const searchStatement = (u: URL) => {
    const s = deviceSearchStatement(teamId, u.searchParams.get('q') ?? '', Number(u.searchParams.get('pageSize') ?? 20), 0);
    return s && toQuery(s);
  };
  /**
   * What the app reads for every signed-in request: the session cookie's token, its signature checked, and the
   * app's session statement (src/lib/server/session-sql.ts: the session, its user and their teams). No session, 401.
   */
  const signedIn = async (cookie: string | undefined) => {
    const m = /(?:^|;\s*)better-auth\.session_token=([^;]+)/.exec(cookie ?? '');
    const token = m ? verifySignedValue(decodeURIComponent(m[1]!), secret) : null;
    if (!token) return false;
    const row = (await db.execute({ sql: SESSION_SQL, args: [token] })).rows[0];
    return row !== undefined && Number(row.expiresAt) > Date.now() && (JSON.parse(row.teams as string) as { id: string }[]).some((t) => t.id === teamId);
  };
  const server = createServer(async (req, res) => {
    const u = new URL(req.url!, 'http://x');
    if (u.pathname.startsWith('/api/') && !(await signedIn(req.headers.cookie))) {
      res.writeHead(401).end();
      return;
    }
    if (u.pathname === '/api/devices') {
      // The app's own statement (src/lib/server/vault/device-list-sql.ts), its JSON text sent as it comes.
      // That module opens no database, so this process keeps the plain client: no statement cache.
      if (!built.has(u.search)) built.set(u.search, listStatement(u));
      const r = await db.execute(built.get(u.search)!);
      res.writeHead(200, { 'content-type': 'application/json' }).end(r.rows[0]!.page as string);
      return;
    } else if (u.pathname === '/api/devices/search') {
      // The app's search statement (src/lib/server/vault/search-sql.ts): one page of rows with the capped counts.
      if (!built.has(u.search)) built.set(u.search, searchStatement(u));
      const statement = built.get(u.search);
      if (!statement) {
        res.writeHead(422).end();
        return;
      }
      const r = await db.execute(statement);
      const first = r.rows[0];
      const body = { items: r.rows.map(({ found: _f, live: _l, ...row }) => row), total: first ? Math.min(Number(first.live), SEARCH_CAP) : 0, totalCapped: first ? Number(first.found) > SEARCH_CAP : false };
      res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(body));
      return;
    }
    res.writeHead(u.pathname === '/health' ? 200 : 404).end();
  });
  server.listen(port, '127.0.0.1');
  process.on('SIGTERM', () => process.exit(0)); // exits, so that a CPU profile (BENCH_PROFILE) is written
}


async function waitFor(url: string, child: ChildProcess, log: () => string) {
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`exited early:\n${log()}`);
    try {
      const r = await fetch(url);
      if (r.status < 500) return;
    } catch {
      // not up yet
    }
    if (Date.now() > deadline) throw new Error(`not ready:\n${log()}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

interface Run { scale: number; endpoint: string; server: string; connections: number; rps: number; p50: number; p99: number; failed: number; cpuPerRequestMs: number; requests: number }

/** CPU time (user + system) a process has used, in ms: per request, less shaken than req/s by other work on the machine. */
function cpuMs(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // utime, stime in clock ticks (100 a second on Linux)
}

async function cannon(base: string, paths: string[], connections: number, duration: number, cookie?: string, pid?: number): Promise<Pick<Run, 'rps' | 'p50' | 'p99' | 'failed' | 'cpuPerRequestMs' | 'requests'>> {
  const cpu0 = pid ? cpuMs(pid) : 0;
  const r = await autocannon({
    url: base,
    connections,
    duration,
    timeout: 10,
    headers: cookie ? { cookie } : {},
    requests: paths.map((path) => ({ method: 'GET', path })),
  });
  // A non-2xx answer, an error or a timeout fails the figure (reported, not thrown, so the rest still runs).
  const cpuPerRequestMs = pid && r.requests.total ? (cpuMs(pid) - cpu0) / r.requests.total : NaN;
  return { rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, failed: r.non2xx + r.errors + r.timeouts, cpuPerRequestMs, requests: r.requests.total };
}

/** Rounds of one server as one figure: req/s and CPU per request over all of them, p50 their mean, p99 the worst. */
function combine(rs: Awaited<ReturnType<typeof cannon>>[]): Awaited<ReturnType<typeof cannon>> {
  const requests = rs.reduce((n, r) => n + r.requests, 0);
  return {
    rps: rs.reduce((n, r) => n + r.rps, 0) / rs.length,
    p50: rs.reduce((n, r) => n + r.p50, 0) / rs.length,
    p99: Math.max(...rs.map((r) => r.p99)),
    failed: rs.reduce((n, r) => n + r.failed, 0),
    cpuPerRequestMs: rs.reduce((n, r) => n + r.cpuPerRequestMs * r.requests, 0) / requests,
    requests,
  };
}

const run = (cmd: string, args: string[], env: NodeJS.ProcessEnv) => new Promise<void>((resolve, reject) => {
  const c = spawn(cmd, args, { env: { ...process.env, ...env }, stdio: ['ignore', 'inherit', 'inherit'] });
  c.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`${cmd} ${args.join(' ')} exited with ${code}`))));
});

/** `npm run seed:large -- --devices N` into `path` (migrations first). */
const seedInto = (path: string, devices: number) =>
  run(process.execPath, ['--import', 'tsx', 'scripts/seed-large.ts', '--devices', String(devices)], { DATABASE_URL: `file:${path}` });

/** What the schema is: the migrations' text, so a kept database is migrated again when one changes. */
function migrationsHash(): string {
  const h = createHash('sha256');
  for (const f of readdirSync('drizzle').filter((f) => f.endsWith('.sql')).sort()) h.update(f).update(readFileSync(join('drizzle', f)));
  return h.digest('hex').slice(0, 12);
}

/**
 * A database of `devices` devices at `target`. At 10,000 it is seeded afresh; above, the seeded database is kept in
 * DB_DIR (seeding 100,000 devices takes minutes) and migrated once per set of migrations, then copied.
 */
async function prepareDatabase(devices: number, target: string) {
  if (devices <= 10_000) return seedInto(target, devices);
  mkdirSync(DB_DIR, { recursive: true });
  const ready = join(DB_DIR, `ready-${devices}-${migrationsHash()}.db`);
  if (!existsSync(ready)) {
    const seeded = join(DB_DIR, `seed-${devices}.db`);
    if (!existsSync(seeded)) {
      const t0 = Date.now();
      await seedInto(`${seeded}.part`, devices);
      renameSync(`${seeded}.part`, seeded);
      console.log(`Seeded ${devices} devices in ${((Date.now() - t0) / 1000).toFixed(0)} s (kept as ${seeded}).`);
    }
    copyFileSync(seeded, `${ready}.part`);
    const t0 = Date.now();
    await seedInto(`${ready}.part`, devices); // migrates; the team exists, so nothing is added
    renameSync(`${ready}.part`, ready);
    console.log(`Migrated the kept database in ${((Date.now() - t0) / 1000).toFixed(0)} s (${ready}).`);
  }
  copyFileSync(ready, target);
}

function rssMb(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) / 1024 : NaN;
}

interface Scale {
  scale: number; runs: Run[]; pages: { page: string; p50: number; p99: number; failed: number }[];
  memory: { atRestMb: number; afterLoadMb: number }; exportRun?: { ms: number; bytes: number; rssBeforeMb: number; rssPeakMb: number; status: number };
}

/** One scale's database, app server and baseline, up and signed in, with the paths each endpoint is measured on. */
interface Started {
  devices: number; dir: string; children: ChildProcess[]; app: string; base: string; appPid: number; basePid: number;
  cookie: string; atRestMb: number; paths: { list: string[]; search: string[] };
}

async function startScale(devices: number): Promise<Started> {
  const dir = mkdtempSync(join(tmpdir(), 'baudbook-bench-'));
  const path = join(dir, 'bench.db');
  const url = `file:${path}`;
  const children: ChildProcess[] = [];
  try {
    const t0 = Date.now();
    await prepareDatabase(devices, path);
    console.log(`\n--- ${devices.toLocaleString('en')} devices (database ready in ${((Date.now() - t0) / 1000).toFixed(1)} s) ---`);

    const appPort = await freePort();
    const app = `http://127.0.0.1:${appPort}`;
    let appLog = '';
    // BENCH_PROFILE=dir writes the app server's and the baseline's CPU profiles there (node --cpu-prof), to see where a request's time goes.
    const profile = process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE}`] : [];
    const server = spawn(process.execPath, [...profile, 'server/serve.mjs'], {
      env: { ...process.env, HOST: '127.0.0.1', PORT: String(appPort), BASE_URL: app, DATABASE_URL: url, SEED_DEMO: '0' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    children.push(server);
    server.stdout!.on('data', (d) => (appLog += d));
    server.stderr!.on('data', (d) => (appLog += d));
    await waitFor(`${app}/api/health`, server, () => appLog);

    const basePort = await freePort();
    const base = `http://127.0.0.1:${basePort}`;
    const bl = spawn(process.execPath, [...profile, '--import', 'tsx', 'bench/vault.ts', '--baseline', url, String(basePort), LARGE.teamId], { stdio: ['ignore', 'inherit', 'inherit'] });
    children.push(bl);
    await waitFor(`${base}/health`, bl, () => '');

    const signIn = await fetch(`${app}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: app },
      body: JSON.stringify({ email: LARGE.email, password: LARGE.password }),
    });
    if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status} ${await signIn.text()}`);
    const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    await new Promise((r) => setTimeout(r, 1000));
    const atRestMb = rssMb(server.pid!);

    // The first 20 pages of 50 by tag, as the device table reads them: each page from the previous page's cursor.
    const list: string[] = [];
    for (let after: string | null = null, i = 0; i < 20; i++) {
      const path: string = `/api/devices?pageSize=50&sort=tag&dir=asc${after ? `&after=${encodeURIComponent(after)}` : ''}`;
      list.push(path);
      const page = (await (await fetch(`${app}${path}`, { headers: { cookie } })).json()) as { next: string | null };
      after = page.next;
      if (!after) break;
    }
    const search = SEARCHES.map((q) => `/api/devices/search?q=${encodeURIComponent(q)}&pageSize=20`);
    return { devices, dir, children, app, base, appPid: server.pid!, basePid: bl.pid!, cookie, atRestMb, paths: { list, search } };
  } catch (err) {
    await stopScale({ dir, children });
    throw err;
  }
}

async function stopScale(s: Pick<Started, 'dir' | 'children'>) {
  for (const c of s.children) c.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, process.env.BENCH_PROFILE ? 2500 : 300));
  rmSync(s.dir, { recursive: true, force: true });
}

/**
 * List and search at 32 connections and at 1, on every scale's app and baseline, all up at once. Two rounds of half
 * the time each, taking turns (in order, then in reverse), so that a change in the machine's load meanwhile falls
 * on all alike: the app against the baseline and 100,000 devices against 10,000 compare within the same minutes.
 * req/s and CPU per request are over both rounds.
 */
async function measureEndpoints(scales: Started[]): Promise<Run[]> {
  const runs: Run[] = [];
  // BENCH_ENDPOINTS=search (say) measures only that endpoint, and no pages: for a profile of one endpoint.
  const only = process.env.BENCH_ENDPOINTS?.split(',');
  for (const endpoint of (['list', 'search'] as const).filter((e) => !only || only.includes(e))) {
    for (const [connections, duration] of [[32, 10], [1, 5]] as const) {
      // Both get the session cookie: the baseline reads the session as the app does (the app's statement).
      const servers = scales.flatMap((s) => [
        { scale: s.devices, name: 'app', target: s.app, pid: s.appPid, cookie: s.cookie, paths: s.paths[endpoint] },
        { scale: s.devices, name: 'baseline', target: s.base, pid: s.basePid, cookie: s.cookie, paths: s.paths[endpoint] },
      ]);
      for (const t of servers) await cannon(t.target, t.paths, connections, 1, t.cookie); // warm-up
      const rounds = new Map<(typeof servers)[number], Awaited<ReturnType<typeof cannon>>[]>();
      for (const order of [servers, [...servers].reverse()]) {
        for (const t of order) rounds.set(t, [...(rounds.get(t) ?? []), await cannon(t.target, t.paths, connections, duration / 2, t.cookie, t.pid)]);
      }
      for (const t of servers) runs.push({ scale: t.scale, endpoint, server: t.name, connections, ...combine(rounds.get(t)!) });
    }
  }
  return runs;
}

/** A scale's signed-in pages, its export and its memory, measured alone; then its servers are stopped. */
async function finishScale(s: Started, runs: Run[]): Promise<Scale> {
  try {
    const only = process.env.BENCH_ENDPOINTS;
    // Signed-in vault pages, one connection: the vault home and a device page.
    const pages: Scale['pages'] = [];
    for (const page of only ? [] : ['/vault', '/vault/devices/dev_large_4242']) {
      await cannon(s.app, [page], 1, 1, s.cookie);
      const r = await cannon(s.app, [page], 1, 5, s.cookie);
      pages.push({ page, p50: r.p50, p99: r.p99, failed: r.failed });
    }
    await new Promise((r) => setTimeout(r, 1000));
    const afterLoadMb = rssMb(s.appPid);

    // The whole team as a JSON document, its memory sampled every 20 ms while it is written and read.
    let exportRun: Scale['exportRun'];
    if (s.devices >= 100_000 || process.env.BENCH_EXPORT) {
      const rssBeforeMb = rssMb(s.appPid);
      let rssPeakMb = rssBeforeMb;
      const sampler = setInterval(() => (rssPeakMb = Math.max(rssPeakMb, rssMb(s.appPid))), 20);
      const e0 = performance.now();
      const res = await fetch(`${s.app}/api/export`, { headers: { cookie: s.cookie } });
      let bytes = 0;
      for await (const chunk of res.body!) bytes += (chunk as Uint8Array).byteLength;
      const ms = performance.now() - e0;
      clearInterval(sampler);
      exportRun = { ms, bytes, rssBeforeMb, rssPeakMb, status: res.status };
    }
    return { scale: s.devices, runs: runs.filter((r) => r.scale === s.devices), pages, memory: { atRestMb: s.atRestMb, afterLoadMb }, exportRun };
  } finally {
    await stopScale(s);
  }
}

async function main() {
  if (!existsSync('dist/server/entry.mjs')) throw new Error('Build first: node_modules/.bin/astro build');
  process.env.BETTER_AUTH_SECRET ??= 'bench-secret-not-for-production-0123456789abcdef';
  const started: Started[] = [];
  const scales: Scale[] = [];
  try {
    for (const n of SCALES) started.push(await startScale(n));
    const runs = await measureEndpoints(started);
    while (started.length) scales.push(await finishScale(started.shift()!, runs));
  } finally {
    for (const s of started) await stopScale(s);
  }
  const figures = report(scales);
  if (process.env.BENCH_JSON) writeFileSync(process.env.BENCH_JSON, JSON.stringify({ date: new Date().toISOString(), scales, figures }, null, 2));
}

interface Figure { figure: string; target: string; measured: string; baseline: string; ratio: string; pass: boolean | null }

function report(scales: Scale[]): Figure[] {
  const figures: Figure[] = [];
  const at = (n: number) => scales.find((s) => s.scale === n);
  const find = (s: Scale, e: string, server: string, c: number) => s.runs.find((r) => r.endpoint === e && r.server === server && r.connections === c);
  const fmt = (n: number) => n.toLocaleString('en', { maximumFractionDigits: 1 });
  console.log('\nAll runs:');
  const rows = [['devices', 'endpoint', 'server', 'conns', 'req/s', 'p50 ms', 'p99 ms', 'failed', 'server CPU ms/req'], ...scales.flatMap((s) => s.runs.map((r) => [fmt(r.scale), r.endpoint, r.server, String(r.connections), r.rps.toFixed(0), String(r.p50), String(r.p99), String(r.failed), r.cpuPerRequestMs.toFixed(2)]))];
  const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => r[i]!.length)));
  for (const r of rows) console.log(r.map((c, i) => c.padEnd(widths[i]!)).join('  '));

  for (const s of scales) {
    for (const e of ['list', 'search']) {
      const a = find(s, e, 'app', 32);
      const b = find(s, e, 'baseline', 32);
      if (!a || !b) continue;
      figures.push({ figure: `${e}, ${fmt(s.scale)} devices, 32 connections: app against baseline`, target: '≥ 0.8× baseline req/s, none failed', measured: `${a.rps.toFixed(0)} req/s (p99 ${a.p99} ms, ${a.failed} failed)`, baseline: `${b.rps.toFixed(0)} req/s`, ratio: `${(a.rps / b.rps).toFixed(3)}×`, pass: a.rps >= 0.8 * b.rps && a.failed === 0 });
    }
  }
  const small = at(10_000);
  const big = at(100_000);
  if (small && big) {
    for (const e of ['list', 'search']) {
      for (const c of [1, 32]) {
        const a = find(big, e, 'app', c);
        const b = find(small, e, 'app', c);
        if (!a || !b) continue;
        figures.push({ figure: `${e}, ${c} connection${c > 1 ? 's' : ''}: 100,000 against 10,000 devices (app)`, target: '≥ 0.7× the req/s at 10,000, none failed', measured: `${a.rps.toFixed(0)} req/s (p50 ${a.p50} ms, p99 ${a.p99} ms)`, baseline: `${b.rps.toFixed(0)} req/s at 10,000`, ratio: `${(a.rps / b.rps).toFixed(3)}×`, pass: a.rps >= 0.7 * b.rps && a.failed === 0 });
      }
    }
  }
  if (big) {
    for (const e of ['list', 'search']) {
      const a = find(big, e, 'app', 1);
      const b = find(big, e, 'baseline', 1);
      if (!a || !b) continue;
      figures.push({ figure: `${e}, 100,000 devices, 1 connection: p50`, target: '≤ 5 ms', measured: `${a.p50} ms`, baseline: `${b.p50} ms`, ratio: `${(a.p50 / Math.max(b.p50, 0.01)).toFixed(2)}×`, pass: a.p50 <= 5 && a.failed === 0 });
    }
    for (const p of big.pages) figures.push({ figure: `page ${p.page}, 100,000 devices: p50 (loopback, 1 connection)`, target: '≤ 30 ms', measured: `${p.p50} ms (p99 ${p.p99} ms)`, baseline: '', ratio: '', pass: p.p50 <= 30 && p.failed === 0 });
    const e = big.exportRun;
    if (e) figures.push({ figure: 'JSON export of 100,000 devices: server memory growth', target: '< 100 MB', measured: `${(e.rssPeakMb - e.rssBeforeMb).toFixed(0)} MB (${(e.bytes / 1024 / 1024).toFixed(0)} MB in ${(e.ms / 1000).toFixed(1)} s)`, baseline: `${e.rssBeforeMb.toFixed(0)} MB before`, ratio: '', pass: e.status === 200 && e.rssPeakMb - e.rssBeforeMb < 100 });
  }
  for (const s of scales) figures.push({ figure: `server memory, ${fmt(s.scale)} devices: at rest / after the load runs`, target: 'reported', measured: `${s.memory.atRestMb.toFixed(0)} MB / ${s.memory.afterLoadMb.toFixed(0)} MB`, baseline: '', ratio: '', pass: null });

  console.log('\nTargets:');
  for (const f of figures) console.log(`${f.pass === null ? '    ' : f.pass ? 'PASS' : 'FAIL'}  ${f.figure}: ${f.measured}${f.baseline ? ` vs ${f.baseline}` : ''}${f.ratio ? ` (${f.ratio})` : ''}; target ${f.target}`);
  const failed = figures.some((f) => f.pass === false);
  console.log(failed ? '\nSome targets were missed (see docs/performance.md).' : '\nAll targets met.');
  if (failed) process.exitCode = 1;
  return figures;
}

// Last, so every declaration above is initialised before it runs.
if (process.argv[2] === '--baseline') {
  await baseline(process.argv[3]!, Number(process.argv[4]), process.argv[5]!, process.env.BETTER_AUTH_SECRET!);
} else {
  await main();
}
