import { describe, expect, it } from 'vitest';
import { confirmationLink, createTeamWithRoles, joinTeam, lastMailTo, PASSWORD, TestClient, testDb } from '../helpers/client';

describe('security headers and sessions', () => {
  it('sets the security headers on pages and API responses', async () => {
    const c = new TestClient();
    for (const path of ['/', '/api/members', '/sign-in']) {
      const res = await c.get(path);
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
      expect(res.headers.get('x-frame-options')).toBe('DENY');
      expect(res.headers.get('content-security-policy')).toContain("frame-ancestors 'none'");
      expect(res.headers.get('content-security-policy')).toContain("default-src 'self'");
    }
  });

  it("allows only the page's own hashed scripts", async () => {
    const res = await new TestClient().get('/sign-in');
    const scriptSrc = res.headers.get('content-security-policy')!.split('; ').find((d) => d.startsWith('script-src'))!;
    expect(scriptSrc).toMatch(/^script-src 'self'( 'sha256-[A-Za-z0-9+/=]+')+$/);
    expect(scriptSrc).not.toContain('unsafe-inline');
  });

  it('redirects a page to sign-in without a session and answers 401 on the API', async () => {
    const c = new TestClient();
    const page = await c.get('/team');
    expect(page.status).toBe(302);
    expect(page.headers.get('location')).toBe('/sign-in?next=%2Fteam');
    expect((await c.get('/api/members')).status).toBe(401);
  });

  it('issues an httpOnly session cookie', async () => {
    const c = new TestClient();
    const email = `cookie-${Date.now()}@example.test`;
    expect((await c.post('/api/auth/sign-up/email', { email, name: 'Cookie', password: PASSWORD })).status).toBe(200);
    const link = await confirmationLink(email);
    const res = await c.get(link.pathname + link.search);
    const cookie = res.headers.getSetCookie().find((l) => l.startsWith('better-auth.session_token='));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('rate-limits sign-in attempts per client address', async () => {
    const c = await new TestClient().signUp('limited');
    const attacker = new TestClient();
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) {
      statuses.push((await attacker.post('/api/auth/sign-in/email', { email: c.user!.email, password: 'wrong-password-x' })).status);
    }
    expect(statuses.slice(0, 5).every((s) => s === 401)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    // Another address is unaffected.
    expect((await new TestClient().post('/api/auth/sign-in/email', { email: c.user!.email, password: PASSWORD })).status).toBe(200);
  });
});

describe('request bodies', () => {
  it('answers 415, 400, 413 and 422 with a message, and writes nothing', async () => {
    const c = await new TestClient().signUp('bodies');
    expect((await c.request('POST', '/api/teams', 'name=x', { 'content-type': 'text/plain' })).status).toBe(415);
    const bad = await c.request('POST', '/api/teams', '{"name":', { 'content-type': 'application/json' });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toBe('Request body is not valid JSON.');
    expect((await c.post('/api/teams', { name: 'x'.repeat(70_000) })).status).toBe(413);
    const unknown = await c.post('/api/teams', { name: 'Fine name', colour: 'red' });
    expect(unknown.status).toBe(422);
    expect(unknown.body.fields).toBeDefined();
    const short = await c.post('/api/teams', { name: 'x' });
    expect(short.status).toBe(422);
    expect(short.body.fields.name).toBe('Use at least 2 characters.');
    expect((await c.get('/api/teams/current')).status).toBe(404);
  });
});

describe('teams and invitations', () => {
  it('lets a user switch between their teams, and not into others', async () => {
    const a = await createTeamWithRoles('switch-a');
    const b = await createTeamWithRoles('switch-b');
    const owner = a.members.owner;
    const second = await owner.post('/api/teams', { name: 'Second team' });
    expect((await owner.get('/api/teams/current')).body.id).toBe(second.body.id);
    expect((await owner.post('/api/session/team', { teamId: a.teamId })).status).toBe(200);
    expect((await owner.get('/api/teams/current')).body.id).toBe(a.teamId);
    expect((await owner.post('/api/session/team', { teamId: b.teamId })).status).toBe(404);
    expect((await owner.get('/api/teams/current')).body.id).toBe(a.teamId);
  });

  it('refuses an invitation accepted by another address, a withdrawn one, an expired one, and a second use', async () => {
    const t = await createTeamWithRoles('invites');
    const owner = t.members.owner;
    const invitee = await new TestClient().signUp('invitee');
    const stranger = await new TestClient().signUp('stranger');

    await owner.post('/api/invitations', { email: invitee.user!.email, role: 'engineer' });
    const mail = await lastMailTo(invitee.user!.email);
    expect(mail.subject).toContain(t.teamName);
    const token = new URL(mail.link!).searchParams.get('token');
    const wrong = await stranger.post('/api/invitations/accept', { token });
    expect(wrong.status).toBe(403);
    expect((await invitee.post('/api/invitations/accept', { token })).status).toBe(200);
    expect((await invitee.get('/api/teams/current')).body).toMatchObject({ id: t.teamId, role: 'engineer' });
    expect((await invitee.post('/api/invitations/accept', { token })).status).toBe(410);

    const late = await new TestClient().signUp('late');
    const inv = await owner.post('/api/invitations', { email: late.user!.email, role: 'viewer' });
    const lateToken = new URL((await lastMailTo(late.user!.email)).link!).searchParams.get('token');
    const db = testDb();
    await db.execute({ sql: 'UPDATE invitation SET expires_at = ? WHERE id = ?', args: [Date.now() - 1000, inv.body.id] });
    db.close();
    const expired = await late.post('/api/invitations/accept', { token: lateToken });
    expect(expired.status).toBe(410);
    expect(expired.body.error).toContain('expired');

    const withdrawn = await new TestClient().signUp('withdrawn');
    const inv2 = await owner.post('/api/invitations', { email: withdrawn.user!.email, role: 'viewer' });
    const token2 = new URL((await lastMailTo(withdrawn.user!.email)).link!).searchParams.get('token');
    expect((await owner.del(`/api/invitations/${inv2.body.id}`)).status).toBe(200);
    const res = await withdrawn.post('/api/invitations/accept', { token: token2 });
    expect(res.status).toBe(410);
    expect((await withdrawn.get('/api/teams/current')).status).toBe(404);
  });

  it('refuses inviting as owner or an existing member', async () => {
    const t = await createTeamWithRoles('invite-rules');
    const asOwner = await t.members.admin.post('/api/invitations', { email: 'someone@example.test', role: 'owner' });
    expect(asOwner.status).toBe(422);
    const again = await t.members.admin.post('/api/invitations', { email: t.members.viewer.user!.email, role: 'viewer' });
    expect(again.status).toBe(409);
  });

  it('keeps the owner in place: no role change or removal, and hands over ownership explicitly', async () => {
    const t = await createTeamWithRoles('ownership');
    const ownerId = t.members.owner.user!.id;
    expect((await t.members.admin.patch(`/api/members/${ownerId}`, { role: 'viewer' })).status).toBe(403);
    expect((await t.members.admin.del(`/api/members/${ownerId}`)).status).toBe(403);
    const newOwner = await joinTeam(t.members.owner, 'engineer', 'heir');
    expect((await t.members.owner.post('/api/teams/transfer', { userId: newOwner.user!.id })).status).toBe(200);
    expect((await newOwner.get('/api/teams/current')).body.role).toBe('owner');
    expect((await t.members.owner.get('/api/teams/current')).body.role).toBe('admin');
  });

  it('removing a member takes away their access at once', async () => {
    const t = await createTeamWithRoles('removal');
    expect((await t.members.viewer.get('/api/members')).status).toBe(200);
    expect((await t.members.admin.del(`/api/members/${t.members.viewer.user!.id}`)).status).toBe(200);
    expect((await t.members.viewer.get('/api/members')).status).toBe(404);
  });
});

describe('password reset', () => {
  it('resets through the e-mailed link and the old password stops working', async () => {
    const c = await new TestClient().signUp('reset');
    const email = c.user!.email;
    const asked = await new TestClient().post('/api/auth/request-password-reset', { email, redirectTo: '/reset-password' });
    expect(asked.status).toBe(200);
    const mail = await lastMailTo(email);
    expect(mail.subject).toBe('Reset your Baudbook password');
    const follow = await new TestClient().get(new URL(mail.link!).pathname + new URL(mail.link!).search);
    expect(follow.status).toBe(302);
    const location = new URL(follow.headers.get('location')!, c.baseUrl);
    expect(location.pathname).toBe('/reset-password');
    const token = location.searchParams.get('token');
    expect((await new TestClient().post('/api/auth/reset-password', { newPassword: 'brand-new-password', token })).status).toBe(200);
    expect((await new TestClient().post('/api/auth/sign-in/email', { email, password: PASSWORD })).status).toBe(401);
    expect((await new TestClient().post('/api/auth/sign-in/email', { email, password: 'brand-new-password' })).status).toBe(200);
  });
});

describe('public tools API limits', () => {
  it('needs no session, caps bodies and answers 429 past the per-address budget', async () => {
    const c = new TestClient();
    const ok = await c.post('/api/tools/convert', { from: 'hex', text: '0D 0A' });
    expect(ok.status).toBe(200);
    expect(ok.body.bytes).toBe('0D 0A');
    expect((await c.post('/api/tools/convert', { from: 'escaped', text: 'x'.repeat(70_000) })).status).toBe(413);
    const statuses: number[] = [];
    for (let i = 0; i < 125; i++) statuses.push((await c.post('/api/tools/convert', { from: 'hex', text: '41' })).status);
    const limited = statuses.indexOf(429);
    // 120 a minute by default; two requests above already counted.
    expect(limited).toBeGreaterThanOrEqual(117);
    const last = await c.post('/api/tools/convert', { from: 'hex', text: '41' });
    expect(last.status).toBe(429);
    expect(Number(last.headers.get('retry-after'))).toBeGreaterThan(0);
    expect((await new TestClient().post('/api/tools/convert', { from: 'hex', text: '41' })).status).toBe(200);
  });
});

describe('session lookup', () => {
  it('ends with sign-out and with expiry, and extends a session used after a day', async () => {
    const c = await new TestClient().signUp('session');
    await c.post('/api/teams', { name: 'Session team' });
    expect((await c.get('/api/teams/current')).status).toBe(200);

    const db = testDb();
    const day = 86_400_000;
    // Last extended a day and a minute ago: the next request extends it and sends a fresh cookie.
    const stale = Date.now() + 14 * day - day - 60_000;
    await db.execute({ sql: 'UPDATE session SET expires_at = ? WHERE user_id = ?', args: [stale, c.user!.id] });
    const extended = await c.get('/api/teams/current');
    expect(extended.status).toBe(200);
    expect(extended.headers.getSetCookie().some((l) => l.includes('session_token='))).toBe(true);
    const after = await db.execute({ sql: 'SELECT expires_at FROM session WHERE user_id = ?', args: [c.user!.id] });
    expect(Number(after.rows[0]!.expires_at)).toBeGreaterThan(stale + day / 2);

    await db.execute({ sql: 'UPDATE session SET expires_at = ? WHERE user_id = ?', args: [Date.now() - 1000, c.user!.id] });
    expect((await c.get('/api/teams/current')).status).toBe(401);
    db.close();

    const d = await new TestClient().signUp('signout');
    const saved = new Map(d.cookies);
    expect((await d.post('/api/auth/sign-out', {})).status).toBe(200);
    d.cookies = saved;
    expect((await d.get('/api/members')).status).toBe(401);
  });
});
