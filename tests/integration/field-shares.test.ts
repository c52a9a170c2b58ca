/** Share links: read-only cards for people without an account; expiry, revocation, access counts, nothing else reachable. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, lastMailTo, testDb, TestClient, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeSite } from './vault-fixtures';
import { makeShare } from './field-fixtures';

let team: TeamFixture;
let other: TeamFixture;
beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('share'), createTeamWithRoles('share-other')]);
}, 60_000);

const tokenOf = (url: string) => new URL(url).pathname.split('/').pop()!;

describe('share links', () => {
  it("shows the machine's cards and nothing else of the team, counting each visit", async () => {
    const eng = team.members.engineer;
    const site = await makeSite(eng);
    const m = await makeMachine(eng, site.id);
    const d = await makeDevice(eng, m.id, { tag: 'SHR-DRIVE' });
    const elsewhere = await makeDevice(eng, (await makeMachine(eng, site.id)).id, { tag: 'NOT-SHARED' });
    const share = await makeShare(eng, 'machine', m.id, { label: 'Night shift' });
    expect(share.url).toMatch(/\/s\/[A-Za-z0-9_-]{20,}$/);
    expect(share).not.toHaveProperty('tokenHash');
    const anon = new TestClient();
    const page = await anon.get(`/s/${tokenOf(share.url)}`);
    expect(page.status).toBe(200);
    expect(page.body).toContain('SHR-DRIVE');
    expect(page.body).toContain(d.ports[0].name);
    expect(page.body).not.toContain(elsewhere.tag);
    for (const bit of ['href="/vault', 'href="/team', 'href="/field', 'sign-out', 'team-switcher', '<form']) expect(page.body).not.toContain(bit);
    await anon.get(`/s/${tokenOf(share.url)}`);
    const listed = expectOk(await eng.get('/api/shares')).items.find((s: { id: string }) => s.id === share.id);
    expect(listed).toMatchObject({ accessCount: 2, state: 'active' });
    expect(listed.lastAccessAt).toBeTruthy();
    const db = testDb();
    const stored = await db.execute({ sql: 'SELECT token_hash FROM share_link WHERE id = ?', args: [share.id] });
    db.close();
    expect(String(stored.rows[0]!.token_hash)).not.toContain(tokenOf(share.url));
  });

  it('shares a whole site across its machines', async () => {
    const eng = team.members.engineer;
    const site = await makeSite(eng);
    const a = await makeDevice(eng, (await makeMachine(eng, site.id)).id, { tag: 'SITE-A' });
    const b = await makeDevice(eng, (await makeMachine(eng, site.id)).id, { tag: 'SITE-B' });
    const page = await new TestClient().get(`/s/${tokenOf((await makeShare(eng, 'site', site.id)).url)}`);
    expect(page.body).toContain(a.tag);
    expect(page.body).toContain(b.tag);
  });

  it('stops working when revoked or expired, and refuses a past expiry', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const revoked = await makeShare(eng, 'machine', m.id);
    expect(expectOk(await eng.del(`/api/shares/${revoked.id}`)).state).toBe('revoked');
    expect((await new TestClient().get(`/s/${tokenOf(revoked.url)}`)).status).toBe(404);
    const expired = await makeShare(eng, 'machine', m.id);
    const db = testDb();
    await db.execute({ sql: 'UPDATE share_link SET expires_at = ? WHERE id = ?', args: [Date.now() - 1000, expired.id] });
    db.close();
    const page = await new TestClient().get(`/s/${tokenOf(expired.url)}`);
    expect(page.status).toBe(404);
    expect(page.body).toContain('not available');
    expect(expectOk(await eng.get('/api/shares')).items.find((s: { id: string }) => s.id === expired.id).state).toBe('expired');
    const past = await eng.post('/api/shares', { scopeType: 'machine', scopeId: m.id, expiresAt: '2020-01-01' });
    expect(past.status).toBe(422);
    expect(past.body.fields.expiresAt).toBeTruthy();
    expect((await new TestClient().get('/s/not-a-real-token-at-all-0000')).status).toBe(404);
  });

  it('opens nothing but the page: the token is no key to the API or to team pages', async () => {
    const eng = team.members.engineer;
    const d = await makeDevice(eng);
    const token = tokenOf((await makeShare(eng, 'machine', d.machineId)).url);
    const anon = new TestClient();
    for (const path of [`/api/devices/${d.id}`, `/api/devices/${d.id}/field-log`, `/api/attachments?ownerType=device&ownerId=${d.id}`, '/api/shares', '/api/export']) {
      expect((await anon.request('GET', path, undefined, { authorization: `Bearer ${token}` })).status, path).toBe(401);
      expect((await anon.get(`${path}${path.includes('?') ? '&' : '?'}token=${token}`)).status, path).toBe(401);
    }
    expect((await anon.get(`/field/devices/${d.id}`)).status).toBe(302);
    expect((await anon.request('POST', `/s/${token}`, {})).status).not.toBe(200);
  });

  it("refuses another team's machine and another team's link", async () => {
    const foreign = await makeMachine(other.members.owner);
    expect((await team.members.engineer.post('/api/shares', { scopeType: 'machine', scopeId: foreign.id })).status).toBe(404);
    const theirs = await makeShare(other.members.owner, 'machine', foreign.id);
    expect((await team.members.owner.del(`/api/shares/${theirs.id}`)).status).toBe(404);
    expect((await team.members.owner.post(`/api/shares/${theirs.id}/email`, { to: 'x@example.test' })).status).toBe(404);
  });

  it('e-mails the recipient a link of their own with the same expiry', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const share = await makeShare(eng, 'machine', m.id, { expiresAt: new Date(Date.now() + 5 * 86_400_000).toISOString().slice(0, 10) });
    const to = `maint-${Date.now()}@example.test`;
    expectOk(await eng.post(`/api/shares/${share.id}/email`, { to, message: 'For the filler line' }));
    const mail = await lastMailTo(to);
    expect(mail.text).toContain('For the filler line');
    expect(mail.text).toMatch(/lockout/);
    expect(mail.link).toMatch(/\/s\//);
    expect(tokenOf(mail.link!)).not.toBe(tokenOf(share.url));
    expect((await new TestClient().get(new URL(mail.link!).pathname)).status).toBe(200);
    const items = expectOk(await eng.get('/api/shares')).items;
    const copy = items.find((s: { label: string }) => s.label.includes(to));
    expect(copy.expiresAt).toBe(share.expiresAt);
    expect((await eng.post(`/api/shares/${share.id}/email`, { to: 'not-an-address' })).status).toBe(422);
  });
});
