/** Behind HTTPS (BASE_URL https://…) session cookies carry Secure and HSTS is sent. */
import { afterAll, beforeAll, expect, it } from 'vitest';
import { freePort, startServer, type RunningServer } from '../helpers/server';
import { confirmationLink, PASSWORD, TestClient } from '../helpers/client';

let app: RunningServer;
let publicOrigin: string;

beforeAll(async () => {
  const port = await freePort();
  publicOrigin = `https://baudbook.example.test`;
  app = await startServer({ PORT: String(port), BASE_URL: publicOrigin, TRUSTED_ORIGINS: publicOrigin });
}, 30_000);

afterAll(async () => {
  await app?.stop();
});

it('marks the session cookie Secure and sends Strict-Transport-Security', async () => {
  const c = new TestClient(app.baseUrl);
  const email = `secure-${Date.now()}@example.test`;
  const res = await c.request('POST', '/api/auth/sign-up/email', { email, name: 'Secure', password: PASSWORD }, { origin: publicOrigin });
  expect(res.status).toBe(200);
  expect(res.headers.get('strict-transport-security')).toContain('max-age=');
  const link = await confirmationLink(email, app.databaseUrl);
  expect(link.origin).toBe(publicOrigin);
  const confirmed = await c.get(link.pathname + link.search);
  const cookie = confirmed.headers.getSetCookie().find((l) => l.includes('session_token='));
  expect(cookie).toMatch(/; Secure/i);
  expect(cookie).toMatch(/HttpOnly/i);
  // The Secure-prefixed cookie is read back by the session lookup.
  expect((await c.get('/api/teams/current')).status).toBe(404);
  expect((await new TestClient(app.baseUrl).get('/api/teams/current')).status).toBe(401);
});
