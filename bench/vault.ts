/**
 * Vault endpoint benchmark (not a test): the built server (dist/) against a bare node:http +
 * @libsql/client baseline answering the same queries, on a temporary 10,000-device database.
 * Run: node_modules/.bin/tsx bench/vault.ts   (build first: node_modules/.bin/astro build)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createClient, type InArgs } from '@libsql/client';
import { SQLiteAsyncDialect } from 'drizzle-orm/sqlite-core';
// @ts-expect-error autocannon ships no type declarations (and none are installed)
import autocannon from 'autocannon';
import { ftsQuery } from '../src/lib/server/vault/fts';

const LIST_PATHS = Array.from({ length: 20 }, (_, i) => `/api/devices?page=${i + 1}&pageSize=50&sort=tag&dir=asc`);
const SEARCHES = ['DRV-001', 'quillmoor 12', 'plant 7 line 3', 'SN12', 'printer 4'];

// ---- baseline: the app's queries, straight through @libsql/client ----
async function baseline(url: string, port: number, teamId: string) {
  const db = createClient({ url, timeout: 5000 });
  const { deviceListStatement } = await import('../src/lib/server/vault/device-list-sql');
  const { default: Database } = await import('libsql');
  if (Database.prototype.prepare.name === 'cachedPrepare') throw new Error('The baseline must run the plain client, without the app\'s statement cache.');
  const dialect = new SQLiteAsyncDialect();
  const listStatement = (page: number) => {
    const q = dialect.sqlToQuery(deviceListStatement(teamId, { page, pageSize: 50, sort: 'tag', dir: 'asc' }));
    return { sql: q.sql, args: q.params as InArgs };
  };
  // Built before serving, so the baseline spends nothing per request on building SQL.
  const listStatements = new Map(LIST_PATHS.map((_, i) => [i + 1, listStatement(i + 1)]));
  const server = createServer(async (req, res) => {
    const u = new URL(req.url!, 'http://x');
    let body: unknown;
    if (u.pathname === '/api/devices') {
      // The app's own statement (src/lib/server/vault/device-list-sql.ts), its JSON text sent as it comes.
      // That module opens no database, so this process keeps the plain client: no statement cache.
      const page = Number(u.searchParams.get('page') ?? 1);
      const r = await db.execute(listStatements.get(page) ?? listStatement(page));
      res.writeHead(200, { 'content-type': 'application/json' }).end(r.rows[0]!.page as string);
      return;
    } else if (u.pathname === '/api/devices/search') {
      const match = ftsQuery(u.searchParams.get('q') ?? '');
      if (!match) {
        res.writeHead(422).end();
        return;
      }
      const [rows, total] = await Promise.all([
        db.execute({
          sql: `SELECT d.id, d.tag, d.name, d.role, d.maker, d.model, d.serial_number, f.machine_name, f.site_name, d.machine_id, m.site_id
                FROM device_search f JOIN device d ON d.id = f.device_id JOIN machine m ON m.id = d.machine_id
                WHERE device_search MATCH ? AND f.team_id = ? ORDER BY f.rank, d.tag LIMIT 20`,
          args: [match, teamId],
        }),
        db.execute({ sql: 'SELECT count(*) AS n FROM device_search f WHERE device_search MATCH ? AND f.team_id = ?', args: [match, teamId] }),
      ]);
      body = { items: rows.rows, total: total.rows[0]!.n };
    } else {
      res.writeHead(404).end();
      return;
    }
    res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(body));
  });
  server.listen(port, '127.0.0.1');
}

if (process.argv[2] === '--baseline') {
  await baseline(process.argv[3]!, Number(process.argv[4]), process.argv[5]!);
} else {
  await main();
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

async function freePort(): Promise<number> {
  const s = createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', r));
  const port = (s.address() as { port: number }).port;
  await new Promise((r) => s.close(r));
  return port;
}

interface Run { endpoint: string; server: string; connections: number; rps: number; p50: number; p99: number }

async function cannon(base: string, paths: string[], connections: number, duration: number, cookie?: string): Promise<Omit<Run, 'endpoint' | 'server' | 'connections'>> {
  const r = await autocannon({
    url: base,
    connections,
    duration,
    headers: cookie ? { cookie } : {},
    requests: paths.map((path) => ({ method: 'GET', path })),
  });
  if (r.non2xx || r.errors) throw new Error(`${base}${paths[0]}: ${r.non2xx} non-2xx, ${r.errors} errors`);
  return { rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99 };
}

async function main() {
  if (!existsSync('dist/server/entry.mjs')) throw new Error('Build first: node_modules/.bin/astro build');
  const dir = mkdtempSync(join(tmpdir(), 'baudbook-bench-'));
  const url = `file:${join(dir, 'bench.db')}`;
  process.env.DATABASE_URL = url;
  process.env.BETTER_AUTH_SECRET ??= 'bench-secret-not-for-production-0123456789abcdef';
  const children: ChildProcess[] = [];
  try {
    const { ensureDatabase } = await import('../src/db/migrate');
    const { seedLarge } = await import('../src/lib/server/seed/large');
    const t0 = Date.now();
    await ensureDatabase();
    const team = await seedLarge();
    console.log(`Seeded ${team.devices} devices in ${((Date.now() - t0) / 1000).toFixed(1)} s (${url}).`);

    const appPort = await freePort();
    const app = `http://127.0.0.1:${appPort}`;
    let appLog = '';
    // BENCH_PROFILE=dir writes the app server's CPU profile there (node --cpu-prof), to see where a request's time goes.
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
    const bl = spawn(process.execPath, ['--import', 'tsx', 'bench/vault.ts', '--baseline', url, String(basePort), team.teamId], { stdio: ['ignore', 'inherit', 'inherit'] });
    children.push(bl);
    await waitFor(`${base}/health`, bl, () => '');

    const signIn = await fetch(`${app}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: app },
      body: JSON.stringify({ email: team.email, password: team.password }),
    });
    if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status} ${await signIn.text()}`);
    const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');

    const searchPaths = SEARCHES.map((q) => `/api/devices/search?q=${encodeURIComponent(q)}&pageSize=20`);
    const runs: Run[] = [];
    for (const [endpoint, paths] of [['list', LIST_PATHS], ['search', searchPaths]] as const) {
      for (const [connections, duration] of [[32, 10], [1, 5]] as const) {
        for (const [name, target, c] of [['app', app, cookie], ['baseline', base, undefined]] as const) {
          await cannon(target, paths, connections, 1, c); // warm-up
          runs.push({ endpoint, server: name, connections, ...(await cannon(target, paths, connections, duration, c)) });
        }
      }
    }
    report(runs);
  } finally {
    for (const c of children) c.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, process.env.BENCH_PROFILE ? 2500 : 300));
    rmSync(dir, { recursive: true, force: true });
  }
}

function report(runs: Run[]) {
  const find = (e: string, s: string, c: number) => runs.find((r) => r.endpoint === e && r.server === s && r.connections === c)!;
  const verdict = (r: Run): string => {
    if (r.server !== 'app') return '';
    if (r.connections === 32) {
      const b = find(r.endpoint, 'baseline', 32);
      return `${r.rps >= b.rps / 2 ? 'PASS' : 'FAIL'} (≥ ½ baseline: ${(b.rps / 2).toFixed(0)} req/s)`;
    }
    if (r.endpoint === 'list') return `${r.p99 < 10 ? 'PASS' : 'FAIL'} (p99 < 10 ms)`;
    return `${r.p50 < 10 ? 'PASS' : 'FAIL'} (p50 < 10 ms)`;
  };
  const rows = [['endpoint', 'server', 'conns', 'req/s', 'p50 ms', 'p99 ms', 'target'], ...runs.map((r) => [r.endpoint, r.server, String(r.connections), r.rps.toFixed(0), String(r.p50), String(r.p99), verdict(r)])];
  const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => r[i]!.length)));
  console.log('');
  for (const r of rows) console.log(r.map((c, i) => c.padEnd(widths[i]!)).join('  '));
  const failed = runs.some((r) => verdict(r).startsWith('FAIL'));
  console.log(failed ? '\nSome targets were missed (see docs/vault.md, "Performance").' : '\nAll targets met.');
}
