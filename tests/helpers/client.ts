/** HTTP client for integration tests: keeps the session cookie and sends Origin + JSON like a browser. */
import { randomInt } from 'node:crypto';
import { inject } from 'vitest';
import { createClient } from '@libsql/client';
import type { Role } from '../../src/lib/permissions';
import { startedServers } from './server';

let ipCounter = 10;
/** This test file's block of 250 addresses in 10.0.0.0/8 (62,500 blocks). */
const IP_BLOCK = randomInt(0, 62_500);
/** The n-th address of 10.0.0.0/8, last octet 1-250. */
const tenNet = (n: number) => `10.${Math.floor(n / 62_500) % 250}.${Math.floor(n / 250) % 250}.${(n % 250) + 1}`;
let userCounter = 0;

export const PASSWORD = 'correct-horse-battery';

export interface Reply<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

export class TestClient {
  cookies = new Map<string, string>();
  /**
   * Each client looks like its own address, so sign-in and sign-up rate limits do not collide across tests: a
   * random block per test file (files run in workers of their own, each counting from 0), then one per client.
   */
  readonly ip = tenNet(IP_BLOCK * 250 + ipCounter++);
  user: { id: string; email: string; name: string } | null = null;

  constructor(readonly baseUrl: string = inject('baseUrl')) {}

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Reply<T>> {
    const res = await fetch(this.baseUrl + path, {
      method,
      redirect: 'manual',
      headers: {
        origin: this.baseUrl,
        'x-forwarded-for': this.ip,
        ...(body === undefined ? {} : { 'content-type': 'application/json' }),
        ...(this.cookies.size ? { cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } : {}),
        ...headers,
      },
      body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
    });
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const i = pair!.indexOf('=');
      const name = pair!.slice(0, i);
      const value = pair!.slice(i + 1);
      if (/max-age=0/i.test(line) || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    const text = await res.text();
    let parsed: any = text;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      // not JSON (e.g. an HTML page)
    }
    return { status: res.status, body: parsed, headers: res.headers };
  }

  get = <T = any>(path: string) => this.request<T>('GET', path);
  post = <T = any>(path: string, body: unknown = {}) => this.request<T>('POST', path, body);
  patch = <T = any>(path: string, body: unknown) => this.request<T>('PATCH', path, body);
  put = <T = any>(path: string, body: unknown) => this.request<T>('PUT', path, body);
  del = <T = any>(path: string, body?: unknown) => this.request<T>('DELETE', path, body);

  async signUp(label = 'user'): Promise<this> {
    const email = `${label}-${Date.now().toString(36)}-${userCounter++}@example.test`;
    const name = `${label} ${userCounter}`;
    const res = await this.post('/api/auth/sign-up/email', { email, name, password: PASSWORD });
    if (res.status !== 200) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
    this.user = { id: res.body.user.id, email, name };
    await this.confirmAddress(email);
    return this;
  }

  /**
   * Finishes a sign-up: follows the confirmation link from the outbox, which signs the client in. A server
   * that sends mail over SMTP keeps no outbox: there the address is marked confirmed in its database and
   * the client signs in with its password.
   */
  async confirmAddress(email: string, password = PASSWORD): Promise<void> {
    const server = serverAt(this.baseUrl);
    if (server.outbox) {
      const link = await confirmationLink(email, server.databaseUrl);
      const res = await this.get(link.pathname + link.search);
      if (res.status !== 302 || !this.cookies.size) throw new Error(`confirming ${email} failed: ${res.status}`);
      return;
    }
    const db = createClient({ url: server.databaseUrl });
    try {
      await db.execute({ sql: 'UPDATE user SET email_verified = 1 WHERE email = ?', args: [email] });
    } finally {
      db.close();
    }
    const res = await this.post('/api/auth/sign-in/email', { email, password });
    if (res.status !== 200) throw new Error(`sign-in after sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
  }
}

function serverAt(baseUrl: string): { databaseUrl: string; outbox: boolean } {
  const started = startedServers.get(baseUrl);
  if (started) return started;
  if (baseUrl === inject('baseUrl')) return { databaseUrl: inject('databaseUrl'), outbox: true };
  throw new Error(`no test server known at ${baseUrl}: start it with startServer()`);
}

/** The link in the newest address-confirmation message to `to` in that server's outbox. */
export async function confirmationLink(to: string, databaseUrl: string = inject('databaseUrl')): Promise<URL> {
  const db = createClient({ url: databaseUrl });
  try {
    for (let i = 0; i < 40; i++) {
      const rs = await db.execute({
        sql: 'SELECT text FROM outbox_message WHERE "to" = ? AND subject = ? ORDER BY created_at DESC LIMIT 1',
        args: [to, 'Confirm your e-mail address for Baudbook'],
      });
      const link = String(rs.rows[0]?.text ?? '').match(/https?:\/\/\S+/)?.[0];
      if (link) return new URL(link);
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error(`no confirmation mail to ${to}`);
  } finally {
    db.close();
  }
}

export function testDb() {
  return createClient({ url: inject('databaseUrl') });
}

/** The newest outbox message sent to `to`, and the first link in it. */
export async function lastMailTo(to: string): Promise<{ subject: string; text: string; link: string | null }> {
  const db = testDb();
  try {
    const rs = await db.execute({ sql: 'SELECT subject, text FROM outbox_message WHERE "to" = ? ORDER BY created_at DESC LIMIT 1', args: [to] });
    const row = rs.rows[0];
    if (!row) throw new Error(`no mail to ${to}`);
    const text = String(row.text);
    return { subject: String(row.subject), text, link: text.match(/https?:\/\/\S+/)?.[0] ?? null };
  } finally {
    db.close();
  }
}

export interface TeamFixture {
  teamId: string;
  teamName: string;
  members: Record<Role, TestClient>;
}

/** A team with one signed-in member per role, joined through real invitations. */
export async function createTeamWithRoles(label = 'team'): Promise<TeamFixture> {
  const owner = await new TestClient().signUp(`${label}-owner`);
  const teamName = `${label} ${Date.now().toString(36)}`;
  const created = await owner.post('/api/teams', { name: teamName });
  if (created.status !== 201) throw new Error(`team create failed: ${created.status} ${JSON.stringify(created.body)}`);
  const members = { owner } as Record<Role, TestClient>;
  for (const role of ['admin', 'engineer', 'technician', 'viewer'] as const) {
    members[role] = await joinTeam(owner, role, `${label}-${role}`);
  }
  return { teamId: created.body.id, teamName, members };
}

/** Invites a fresh user with `role` and accepts the invitation from the e-mailed link. */
export async function joinTeam(inviter: TestClient, role: Role, label: string): Promise<TestClient> {
  const member = await new TestClient().signUp(label);
  const inv = await inviter.post('/api/invitations', { email: member.user!.email, role });
  if (inv.status !== 201) throw new Error(`invite failed: ${inv.status} ${JSON.stringify(inv.body)}`);
  const mail = await lastMailTo(member.user!.email);
  const token = new URL(mail.link!).searchParams.get('token');
  const accepted = await member.post('/api/invitations/accept', { token });
  if (accepted.status !== 200) throw new Error(`accept failed: ${accepted.status} ${JSON.stringify(accepted.body)}`);
  return member;
}
