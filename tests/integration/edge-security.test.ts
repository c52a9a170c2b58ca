/**
 * What the server decides before the app runs, driven through server/serve.mjs: the client address for rate
 * limits, who may read the local outbox, the Origin rule for state-changing requests, and response headers.
 * Each server here is started with its own settings.
 */
import { request as httpRequest } from 'node:http';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { startServer, TEST_OUTBOX_KEY, type RunningServer } from '../helpers/server';
import { PASSWORD, TestClient } from '../helpers/client';

/** A GET with exactly these headers (fetch cannot set Host), answering status and body. */
function rawGet(baseUrl: string, path: string, headers: Record<string, string> = {}): Promise<{ status: number; body: string; setCookie: string[] }> {
  return new Promise((resolve, reject) => {
    const req = httpRequest(baseUrl + path, { headers }, (res) => {
      let body = '';
      res.on('data', (d) => (body += d));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body, setCookie: res.headers['set-cookie'] ?? [] }));
    });
    req.on('error', reject);
    req.end();
  });
}

const servers: RunningServer[] = [];
async function serve(env: Record<string, string>): Promise<RunningServer> {
  const s = await startServer(env);
  servers.push(s);
  return s;
}
afterAll(async () => {
  await Promise.all(servers.map((s) => s.stop()));
});

const CONVERT = { from: 'hex', text: '41' };
let n = 0;
const spoofed = () => `198.51.100.${(n++ % 250) + 1}`;

describe('without TRUST_PROXY the client address is the socket, never X-Forwarded-For', () => {
  let app: RunningServer;
  beforeAll(async () => {
    app = await serve({ TRUST_PROXY: '', SIGN_IN_MAX_ATTEMPTS: '3', TOOLS_REQUESTS_PER_MINUTE: '5' });
  }, 30_000);

  it('limits wrong passwords however the header changes, and a fresh header value does not sign in', async () => {
    const user = await new TestClient(app.baseUrl).signUp('limited');
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) {
      const res = await new TestClient(app.baseUrl).request(
        'POST',
        '/api/auth/sign-in/email',
        { email: user.user!.email, password: 'wrong-password-123' },
        { 'x-forwarded-for': spoofed() },
      );
      statuses.push(res.status);
    }
    expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
    expect(statuses.slice(3)).toEqual([429, 429]);
    const right = await new TestClient(app.baseUrl).request(
      'POST',
      '/api/auth/sign-in/email',
      { email: user.user!.email, password: PASSWORD },
      { 'x-forwarded-for': spoofed() },
    );
    expect(right.status).toBe(429);
  });

  it('keeps the tools budget however the header changes', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) {
      const res = await new TestClient(app.baseUrl).request('POST', '/api/tools/convert', CONVERT, { 'x-forwarded-for': spoofed() });
      statuses.push(res.status);
    }
    expect(statuses.filter((s) => s === 429).length).toBe(2);
    expect(statuses.slice(5)).toEqual([429, 429]);
  });
});

describe('with TRUST_PROXY=1 the client address is the hop the proxy wrote', () => {
  let app: RunningServer;
  beforeAll(async () => {
    app = await serve({ TRUST_PROXY: '1', TOOLS_REQUESTS_PER_MINUTE: '3' });
  }, 30_000);

  it('ignores what the client put to the left of it', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) {
      const res = await new TestClient(app.baseUrl).request('POST', '/api/tools/convert', CONVERT, { 'x-forwarded-for': `${spoofed()}, 203.0.113.50` });
      statuses.push(res.status);
    }
    expect(statuses).toEqual([200, 200, 200, 429, 429]);
    // Another client behind the same proxy has its own budget.
    const other = await new TestClient(app.baseUrl).request('POST', '/api/tools/convert', CONVERT, { 'x-forwarded-for': '203.0.113.51' });
    expect(other.status).toBe(200);
  });

  it('refuses to start on a TRUST_PROXY it cannot read', async () => {
    await expect(startServer({ TRUST_PROXY: 'all of them' })).rejects.toThrow(/TRUST_PROXY must be a number/);
  });
});

describe('the local outbox', () => {
  it('shows mail to the person at the machine of a local demo, and to nobody who came through a proxy', async () => {
    const app = await serve({ TRUST_PROXY: '' });
    const victim = await new TestClient(app.baseUrl).signUp('victim');
    const asked = await new TestClient(app.baseUrl).post('/api/auth/request-password-reset', { email: victim.user!.email, redirectTo: '/reset-password' });
    expect(asked.status).toBe(200);
    const host = new URL(app.baseUrl).host;

    // Even at the machine, the page opens only with the key the server printed at start (a relay on this
    // host that adds no forwarding header, such as a TCP forwarder, would otherwise look like the person here).
    expect((await rawGet(app.baseUrl, '/dev/outbox', { host })).status).toBe(404);
    expect((await rawGet(app.baseUrl, '/dev/outbox?key=wrong-key-0123456789abcdef', { host })).status).toBe(404);
    const opened = await rawGet(app.baseUrl, `/dev/outbox?key=${TEST_OUTBOX_KEY}`, { host });
    expect(opened.status).toBe(303);
    const cookie = opened.setCookie.find((c) => c.startsWith('bb_outbox='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    const atMachine = await rawGet(app.baseUrl, '/dev/outbox', { host, cookie: cookie.split(';')[0]! });
    expect(atMachine.status).toBe(200);
    expect(atMachine.body).toContain(victim.user!.email);
    expect(atMachine.body).toContain('/reset-password');

    const withKey = `/dev/outbox?key=${TEST_OUTBOX_KEY}`;
    for (const headers of <Record<string, string>[]>[
      { host, 'x-forwarded-for': '203.0.113.7' },
      { host, forwarded: 'for=203.0.113.7' },
      { host, 'x-real-ip': '203.0.113.7' },
      { host: 'baudbook.example.test' },
      { host: `localhost.evil.test:${new URL(app.baseUrl).port}` },
    ]) {
      const res = await rawGet(app.baseUrl, withKey, headers);
      expect(res.status, JSON.stringify(headers)).toBe(404);
      expect(res.body).not.toContain(victim.user!.email);
    }
  });

  it('is closed on a server behind a trusted proxy, even to loopback clients', async () => {
    // The shared test server runs with TRUST_PROXY=1: a reverse proxy on the same host looks like 127.0.0.1.
    const res = await rawGet(inject('baseUrl'), `/dev/outbox?key=${TEST_OUTBOX_KEY}`, { host: new URL(inject('baseUrl')).host });
    expect(res.status).toBe(404);
  });

  it('is closed to everyone on a server whose BASE_URL is not localhost', async () => {
    const publicOrigin = 'https://baudbook.example.test';
    const app = await serve({ TRUST_PROXY: '', BASE_URL: publicOrigin });
    const owner = new TestClient(app.baseUrl);
    const up = await owner.request('POST', '/api/auth/sign-up/email', { email: `pub-${Date.now()}@example.test`, name: 'Pub', password: PASSWORD });
    expect(up.status).toBe(200);
    expect((await rawGet(app.baseUrl, `/dev/outbox?key=${TEST_OUTBOX_KEY}`, { host: new URL(app.baseUrl).host })).status).toBe(404);
    expect((await owner.get('/dev/outbox')).status).toBe(404);
    await expect(startServer({ TRUST_PROXY: '', BASE_URL: publicOrigin, OUTBOX: 'local' })).rejects.toThrow(/OUTBOX=local/);
  });

  it('with OUTBOX=own shows a signed-in user only the mail addressed to them', async () => {
    const app = await serve({ TRUST_PROXY: '', BASE_URL: 'https://baudbook.example.test', OUTBOX: 'own' });
    const reader = await new TestClient(app.baseUrl).signUp('reader');
    const other = await new TestClient(app.baseUrl).signUp('other');
    for (const email of [reader.user!.email, other.user!.email]) {
      const asked = await new TestClient(app.baseUrl).post('/api/auth/request-password-reset', { email, redirectTo: '/reset-password' });
      expect(asked.status).toBe(200);
    }
    const page = await reader.get('/dev/outbox');
    expect(page.status).toBe(200);
    expect(page.body).toContain(reader.user!.email);
    expect(page.body).not.toContain(other.user!.email);
    expect((await rawGet(app.baseUrl, '/dev/outbox', { host: new URL(app.baseUrl).host })).status).toBe(404);
  });
});

describe('the Origin rule for state-changing requests', () => {
  let user: TestClient;
  beforeAll(async () => {
    user = await new TestClient().signUp('origin');
  });

  /** A request with exactly these headers plus the session cookie (no Origin unless given). */
  async function bare(method: string, path: string, headers: Record<string, string>, body?: string) {
    const res = await fetch(user.baseUrl + path, {
      method,
      headers: { cookie: [...user.cookies].map(([k, v]) => `${k}=${v}`).join('; '), 'x-forwarded-for': user.ip, ...headers },
      body,
    });
    return { status: res.status, type: res.headers.get('content-type') ?? '', body: await res.text() };
  }

  it('refuses a signed-in write from a foreign origin or with no Origin, with a JSON reason', async () => {
    const body = JSON.stringify({ name: `Foreign ${Date.now()}` });
    const foreign = await bare('POST', '/api/teams', { 'content-type': 'application/json', origin: 'https://evil.test' }, body);
    expect(foreign.status).toBe(403);
    expect(foreign.type).toContain('application/json');
    expect(JSON.parse(foreign.body).error).toMatch(/evil\.test/);
    const missing = await bare('POST', '/api/teams', { 'content-type': 'application/json' }, body);
    expect(missing.status).toBe(403);
    expect(JSON.parse(missing.body).error).toMatch(/Origin/);
    const crossSite = await bare('POST', '/api/teams', { 'content-type': 'application/json', 'sec-fetch-site': 'cross-site' }, body);
    expect(crossSite.status).toBe(403);
    const nullOrigin = await bare('DELETE', '/api/teams/current', { origin: 'null' });
    expect(nullOrigin.status).toBe(403);
    expect((await user.get('/api/teams/current')).status).not.toBe(401);
  });

  it('accepts the app origin, or no Origin when the browser marks the request same-origin', async () => {
    const ok = await bare('POST', '/api/teams', { 'content-type': 'application/json', origin: user.baseUrl }, JSON.stringify({ name: `Own ${Date.now()}` }));
    expect(ok.status).toBe(201);
    const same = await bare('POST', '/api/teams', { 'content-type': 'application/json', 'sec-fetch-site': 'same-origin' }, JSON.stringify({ name: `Same ${Date.now()}` }));
    expect(same.status).toBe(201);
  });

  it('refuses a sign-in posted from a foreign origin', async () => {
    const res = await new TestClient().request('POST', '/api/auth/sign-in/email', { email: user.user!.email, password: PASSWORD }, { origin: 'https://evil.test' });
    expect(res.status).toBe(403);
  });

  it('answers a non-JSON body on a JSON route with 415 JSON, Origin or not', async () => {
    const res = await fetch(`${user.baseUrl}/api/tools/checksum`, { method: 'POST', headers: { 'content-type': 'text/plain' }, body: 'x' });
    expect(res.status).toBe(415);
    expect(res.headers.get('content-type')).toContain('application/json');
    const form = await bare('POST', '/api/teams', { 'content-type': 'application/x-www-form-urlencoded', origin: user.baseUrl }, 'name=x');
    expect(form.status).toBe(415);
    expect(form.type).toContain('application/json');
  });
});

describe('response headers', () => {
  it('marks built assets nosniff', async () => {
    const page = await (await fetch(`${inject('baseUrl')}/sign-in`)).text();
    const asset = page.match(/\/_astro\/[^"' )]+/)?.[0];
    expect(asset).toBeTruthy();
    const res = await fetch(inject('baseUrl') + asset);
    expect(res.status).toBe(200);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
  });

  it('serves the public folder by file name, and pages and the API from the app', async () => {
    const icon = await fetch(`${inject('baseUrl')}/favicon.svg`);
    expect(icon.status).toBe(200);
    expect(icon.headers.get('content-type')).toMatch(/^image\/svg\+xml/);
    expect(icon.headers.get('x-content-type-options')).toBe('nosniff');
    expect((await fetch(`${inject('baseUrl')}/no-such-file.js`)).status).toBe(404);
    expect((await fetch(`${inject('baseUrl')}/api/health`)).status).toBe(200);
  });

  it('keeps signed-in pages and data out of every cache', async () => {
    const user = await new TestClient().signUp('cache');
    await user.post('/api/teams', { name: `Cache ${Date.now()}` });
    for (const path of ['/vault', '/', '/api/devices', '/api/teams/current']) {
      const res = await user.get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers.get('cache-control'), path).toBe('no-store');
    }
  });
});
