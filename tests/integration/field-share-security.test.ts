/** Share links: e-mailed copies end with the link, real dates only, HEAD is no visit. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, lastMailTo, TestClient, type TeamFixture } from '../helpers/client';
import { expectOk, makeMachine } from './vault-fixtures';
import { makeShare } from './field-fixtures';

let team: TeamFixture;
beforeAll(async () => {
  team = await createTeamWithRoles('share-sec');
}, 60_000);

const pathOf = (url: string) => new URL(url).pathname;
const DAY = 86_400_000;

async function emailed(c: TestClient, shareId: string, label: string): Promise<{ path: string; id: string }> {
  const to = `${label}-${Date.now().toString(36)}@example.test`;
  const sent = expectOk(await c.post(`/api/shares/${shareId}/email`, { to }));
  return { path: pathOf((await lastMailTo(to)).link!), id: sent.share.id };
}

describe('revoking a share link', () => {
  it('ends every e-mailed copy of it, and copies of those', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const share = await makeShare(eng, 'machine', m.id);
    const first = await emailed(eng, share.id, 'copy-a');
    const second = await emailed(eng, share.id, 'copy-b');
    const forwarded = await emailed(eng, first.id, 'copy-c');
    const anon = new TestClient();
    for (const p of [pathOf(share.url), first.path, second.path, forwarded.path]) expect((await anon.get(p)).status, p).toBe(200);

    expect(expectOk(await eng.del(`/api/shares/${share.id}`)).state).toBe('revoked');
    for (const p of [pathOf(share.url), first.path, second.path, forwarded.path]) expect((await anon.get(p)).status, p).toBe(404);
    const items = expectOk(await eng.get('/api/shares')).items as { id: string; state: string; parentId: string | null }[];
    for (const id of [first.id, second.id, forwarded.id]) expect(items.find((s) => s.id === id)?.state, id).toBe('revoked');
    expect(items.find((s) => s.id === first.id)?.parentId).toBe(share.id);
    expect(items.find((s) => s.id === forwarded.id)?.parentId).toBe(first.id);
  });

  it('of one copy ends that copy and what was sent from it, not the link or its other copies', async () => {
    const eng = team.members.engineer;
    const share = await makeShare(eng, 'machine', (await makeMachine(eng)).id);
    const first = await emailed(eng, share.id, 'one-a');
    const second = await emailed(eng, share.id, 'one-b');
    const forwarded = await emailed(eng, first.id, 'one-c');
    expectOk(await eng.del(`/api/shares/${first.id}`));
    const anon = new TestClient();
    expect((await anon.get(first.path)).status).toBe(404);
    expect((await anon.get(forwarded.path)).status).toBe(404);
    expect((await anon.get(second.path)).status).toBe(200);
    expect((await anon.get(pathOf(share.url))).status).toBe(200);
  });
});

describe('share link expiry dates', () => {
  it('refuses days that do not exist with 422 and a clear message, and creates nothing', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const before = expectOk(await eng.get('/api/shares')).items.length;
    for (const expiresAt of ['2027-02-30', '2027-02-29', '2027-04-31', '2027-13-01', '2027-00-10', '2027-02-30T12:00:00Z', '2027-1-5', 'next friday', '05/01/2027', '']) {
      const res = await eng.post('/api/shares', { scopeType: 'machine', scopeId: m.id, expiresAt });
      expect(res.status, expiresAt).toBe(422);
      expect(res.body.fields.expiresAt, expiresAt).toMatch(/YYYY-MM-DD/);
    }
    expect(expectOk(await eng.get('/api/shares')).items.length).toBe(before);
  });

  it('takes a real day (through its end, UTC) or a full time with an offset', async () => {
    const eng = team.members.engineer;
    const m = await makeMachine(eng);
    const day = new Date(Date.now() + 10 * DAY).toISOString().slice(0, 10);
    expect((await makeShare(eng, 'machine', m.id, { expiresAt: day })).expiresAt).toBe(`${day}T23:59:59.999Z`);
    const time = new Date(Date.now() + 3 * DAY);
    time.setUTCMilliseconds(0);
    const withOffset = time.toISOString().replace('Z', '+00:00');
    expect((await makeShare(eng, 'machine', m.id, { expiresAt: withOffset })).expiresAt).toBe(time.toISOString());
  });

  it('refuses an import document whose export time is not a real time', async () => {
    const owner = team.members.owner;
    const base = expectOk(await owner.get('/api/export'));
    for (const exportedAt of ['2026-02-30T10:00:00.000Z', 'yesterday']) {
      const res = await owner.post('/api/import', { document: { ...base, exportedAt } });
      expect(res.status, exportedAt).toBe(422);
      expect(res.body.error).toMatch(/exportedAt/);
    }
  });
});

describe('share page visits', () => {
  it('counts GET, not HEAD', async () => {
    const eng = team.members.engineer;
    const share = await makeShare(eng, 'machine', (await makeMachine(eng)).id);
    const anon = new TestClient();
    const head = await anon.request('HEAD', pathOf(share.url));
    expect(head.status).toBe(200);
    expect((await anon.request('HEAD', '/s/not-a-real-token-at-all-0000')).status).toBe(404);
    const count = async () => expectOk(await eng.get('/api/shares')).items.find((s: { id: string }) => s.id === share.id);
    expect(await count()).toMatchObject({ accessCount: 0, lastAccessAt: null });
    expect((await anon.get(pathOf(share.url))).status).toBe(200);
    expect((await count()).accessCount).toBe(1);
  });
});
