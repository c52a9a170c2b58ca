/** Starts the built server (dist/) on a free port with a fresh database, for integration and browser tests. */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface RunningServer {
  baseUrl: string;
  databaseUrl: string;
  dir: string;
  stop(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

/** Where each server started in this process keeps its data, by base URL (for TestClient.signUp). */
export const startedServers = new Map<string, { databaseUrl: string; outbox: boolean }>();

/** Built app; DIST_DIR lets parallel work trees build elsewhere (default dist). Served by server/serve.mjs. */
const distDir = process.env.DIST_DIR ?? 'dist';

/** The local outbox's key on test servers (a real server prints a random one at start). */
export const TEST_OUTBOX_KEY = 'test-outbox-key-0123456789';

/**
 * `root`: another checkout whose own server/serve.mjs and dist/ to run, in its folder (a benchmark's baseline
 * build of an earlier commit); default this one, with DIST_DIR.
 */
export async function startServer(extraEnv: Record<string, string> = {}, root?: string): Promise<RunningServer> {
  const dist = root ? join(root, 'dist') : distDir;
  if (!existsSync(join(dist, 'server/entry.mjs'))) {
    throw new Error(`${join(dist, 'server/entry.mjs')} is missing: run \`npm run build\` first (npm test does this).`);
  }
  const dir = mkdtempSync(join(tmpdir(), 'baudbook-test-'));
  const port = extraEnv.PORT ? Number(extraEnv.PORT) : await freePort();
  const databaseUrl = extraEnv.DATABASE_URL ?? `file:${join(dir, 'test.db')}`;
  /** Where the tests reach the server (BASE_URL in extraEnv may name a public https address instead). */
  const baseUrl = `http://127.0.0.1:${port}`;
  const child: ChildProcess = spawn(process.execPath, [root ? join(root, 'server/serve.mjs') : 'server/serve.mjs', dist], {
    ...(root ? { cwd: root } : {}),
    env: {
      ...process.env,
      // As the server runs for its users (server/serve.mjs): the libraries' production builds, not vitest's NODE_ENV.
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      BASE_URL: baseUrl,
      DATABASE_URL: databaseUrl,
      BETTER_AUTH_SECRET: 'test-secret-not-for-production-0123456789abcdef',
      TRUST_PROXY: '1',
      SEED_DEMO: '0',
      UPLOAD_DIR: join(dir, 'uploads'),
      OUTBOX_KEY: TEST_OUTBOX_KEY,
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (d) => (output += d));
  child.stderr?.on('data', (d) => { output += d; if (process.env.SERVER_STDERR) process.stderr.write(d); });
  const deadline = Date.now() + 20_000;
  for (;;) {
    if (child.exitCode !== null) {
      rmSync(dir, { recursive: true, force: true });
      throw new Error(`Server exited early (code ${child.exitCode}):\n${output}`);
    }
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill();
      throw new Error(`Server did not become ready:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  startedServers.set(baseUrl, { databaseUrl, outbox: !extraEnv.SMTP_URL });
  return {
    baseUrl,
    databaseUrl,
    dir,
    async stop() {
      startedServers.delete(baseUrl);
      child.kill('SIGTERM');
      await new Promise((r) => setTimeout(r, 200));
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
