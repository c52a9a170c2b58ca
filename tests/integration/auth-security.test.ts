/** Sign-in redirects, the session cookie's signature, sign-up replies and invitation refusals. */
import { describe, expect, it } from 'vitest';
import { confirmationLink, lastMailTo, TestClient } from '../helpers/client';

const SESSION = 'better-auth.session_token';

describe('the page after sign-in (next)', () => {
  const cases: [string, string][] = [
    ['/%5Cevil.test/x', '/'],
    ['/%09/evil.test', '/'],
    ['%2F%2Fevil.test', '/'],
    ['//evil.test/x', '/'],
    ['/.//evil.test', '/'],
    ['https://evil.test/x', '/'],
    ['javascript:alert(1)', '/'],
    ['/team?tab=members', '/team?tab=members'],
  ];

  it('redirects a signed-in user only to a path of this site', async () => {
    const c = await new TestClient().signUp('next');
    for (const [next, location] of cases) {
      const res = await c.get(`/sign-in?next=${next}`);
      expect(res.status, next).toBe(302);
      expect(res.headers.get('location'), next).toBe(location);
    }
    const own = await c.get(`/sign-in?next=${encodeURIComponent(`${c.baseUrl}/team`)}`);
    expect(own.headers.get('location')).toBe('/team');
  });

  it('hands the sign-in and sign-up forms only a path of this site', async () => {
    const c = new TestClient();
    for (const page of ['/sign-in', '/sign-up']) {
      const bad = await c.get(`${page}?next=/%5Cevil.test/x`);
      expect(bad.status).toBe(200);
      expect(bad.body).not.toContain('evil.test');
      const good = await c.get(`${page}?next=${encodeURIComponent('/invitations/accept?token=abc')}`);
      expect(good.body).toContain('/invitations/accept?token=abc');
    }
  });
});

describe('the session cookie', () => {
  function withCookie(c: TestClient, value: string): TestClient {
    const other = new TestClient(c.baseUrl);
    other.cookies.set(SESSION, value);
    return other;
  }

  it('works as issued, and not with a forged or missing signature', async () => {
    const c = await new TestClient().signUp('signed');
    await c.post('/api/teams', { name: 'Signed team' });
    const issued = c.cookies.get(SESSION)!;
    const token = decodeURIComponent(issued).split('.')[0]!;
    expect((await withCookie(c, issued).get('/api/teams/current')).status).toBe(200);

    const forgedShape = `${token}.${'A'.repeat(43)}=`;
    for (const value of [`${token}.forgedsignature`, encodeURIComponent(forgedShape), token, `${token}.`, '%', '%E0%A4%A']) {
      const res = await withCookie(c, value).get('/api/teams/current');
      expect(res.status, value).toBe(401);
      const page = await withCookie(c, value).get('/team');
      expect(page.status, value).toBe(302);
      expect(page.headers.get('location')).toBe('/sign-in?next=%2Fteam');
    }
  });
});

describe('invitations accepted by the wrong account', () => {
  it('do not reveal the invited address, in the API or on the page', async () => {
    const owner = await new TestClient().signUp('inv-owner');
    await owner.post('/api/teams', { name: 'Address team' });
    const invited = `hidden-${Date.now().toString(36)}@example.test`;
    expect((await owner.post('/api/invitations', { email: invited, role: 'viewer' })).status).toBe(201);
    const link = new URL((await lastMailTo(invited)).link!);
    const token = link.searchParams.get('token')!;

    const stranger = await new TestClient().signUp('inv-stranger');
    const refused = await stranger.post('/api/invitations/accept', { token });
    expect(refused.status).toBe(403);
    expect(JSON.stringify(refused.body)).not.toContain(invited);
    expect(JSON.stringify(refused.body)).not.toContain('hidden-');
    expect(refused.body.error).toMatch(/another e-mail address/);

    for (const c of [stranger, new TestClient()]) {
      const page = await c.get(link.pathname + link.search);
      expect(page.status).toBe(200);
      expect(page.body).not.toContain(invited);
    }
  });
});

describe('sign-up does not tell whether an address has an account', () => {
  it('answers a registered address as it answers a new one, and mails the owner instead', async () => {
    const owner = await new TestClient().signUp('taken');
    const fresh = `fresh-${Date.now().toString(36)}@example.test`;
    const tryIt = (email: string) =>
      new TestClient().post('/api/auth/sign-up/email', { email, name: 'Someone Else', password: 'another-password-1', callbackURL: '/teams/new' });
    const [taken, free] = [await tryIt(owner.user!.email), await tryIt(fresh)];
    for (const res of [taken, free]) {
      expect(res.status).toBe(200);
      expect(res.body.token).toBeNull();
      expect(res.headers.getSetCookie().some((l) => l.includes('session_token='))).toBe(false);
    }
    expect(Object.keys(taken.body.user).sort()).toEqual(Object.keys(free.body.user).sort());
    expect(taken.body.user.email).toBe(owner.user!.email);

    const warned = await lastMailTo(owner.user!.email);
    expect(warned.subject).toBe('Someone tried to create a Baudbook account with your address');
    expect(warned.link).toMatch(/\/forgot-password$/);

    const confirm = await lastMailTo(fresh);
    expect(confirm.subject).toBe('Confirm your e-mail address for Baudbook');

    // Before the address is confirmed, the new password is refused exactly like a wrong one
    // (and the address gets a fresh link).
    const early = await new TestClient().post('/api/auth/sign-in/email', { email: fresh, password: 'another-password-1' });
    const wrong = await new TestClient().post('/api/auth/sign-in/email', { email: owner.user!.email, password: 'another-password-1' });
    expect(early.status).toBe(401);
    expect(wrong.status).toBe(401);
    expect(early.body).toEqual(wrong.body);
    expect((await lastMailTo(fresh)).link).not.toBe(confirm.link);

    const c = new TestClient();
    const link = new URL(confirm.link!);
    const landed = await c.get(link.pathname + link.search);
    expect(landed.status).toBe(302);
    expect(landed.headers.get('location')).toBe('/teams/new');
    expect((await c.get('/api/teams/current')).status).toBe(404);
    expect((await new TestClient().post('/api/auth/sign-in/email', { email: fresh, password: 'another-password-1' })).status).toBe(200);
  });
});

describe('the confirmation link', () => {
  it('opens the page the sign-up form was heading for, such as an invitation', async () => {
    const email = `invited-${Date.now().toString(36)}@example.test`;
    const next = '/invitations/accept?token=abc_DEF-123';
    const c = new TestClient();
    expect((await c.post('/api/auth/sign-up/email', { email, name: 'Invited', password: 'another-password-1', callbackURL: next })).status).toBe(200);
    const link = await confirmationLink(email);
    const landed = await c.get(link.pathname + link.search);
    expect(landed.status).toBe(302);
    expect(landed.headers.get('location')).toBe(next);
    expect((await c.get('/api/teams/current')).status).toBe(404);
  });
});
