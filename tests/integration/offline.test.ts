/**
 * Offline field cards (docs/decisions/017-offline-cards.md): the web app manifest and the service worker are served
 * with the right types and headers, the list of what a phone keeps is the active team's alone, and field-log
 * entries written offline carry the time the work was done (checked against the server's clock) and a client key
 * that makes a resend write nothing twice.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { createTeamWithRoles, TestClient, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeSite } from './vault-fixtures';
import { logEntry, PNG_BYTES, upload } from './field-fixtures';

let team: TeamFixture;
let other: TeamFixture;
beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('offl'), createTeamWithRoles('offl-other')]);
}, 60_000);

const MINUTE = 60_000;
const DAY = 24 * 60 * MINUTE;
const iso = (offsetMs: number) => new Date(Date.now() + offsetMs).toISOString();

describe('installable app', () => {
  it('serves the manifest as application/manifest+json with our name, colour and PNG icons that exist', async () => {
    const base = inject('baseUrl');
    const res = await fetch(`${base}/manifest.webmanifest`);
    expect(res.status).toBe(200);
    // The manifest's media type: W3C Web Application Manifest, "Media type registration".
    expect(res.headers.get('content-type')).toMatch(/^application\/manifest\+json/);
    const manifest = await res.json();
    expect(manifest).toMatchObject({ name: 'Baudbook', start_url: '/', display: 'standalone', theme_color: '#16202a' });
    const sizes = manifest.icons.map((i: { sizes: string }) => i.sizes).sort();
    expect(sizes).toEqual(['192x192', '512x512', '512x512']);
    for (const icon of manifest.icons) {
      const png = await fetch(base + icon.src);
      expect(png.status, icon.src).toBe(200);
      expect(png.headers.get('content-type')).toBe('image/png');
      const bytes = new Uint8Array(await png.arrayBuffer());
      // PNG signature and IHDR width/height (PNG specification, 5.2 and 11.2.2).
      expect([...bytes.slice(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
      const view = new DataView(bytes.buffer, bytes.byteOffset);
      expect(`${view.getUint32(16)}x${view.getUint32(20)}`).toBe(icon.sizes);
    }
  });

  it('serves /sw.js as JavaScript that is never cached by HTTP, with its precache list, and an offline page', async () => {
    const base = inject('baseUrl');
    const res = await fetch(`${base}/sw.js`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^(text|application)\/javascript/);
    // A browser re-checks a worker script at most every 24 h whatever max-age says; no-cache makes it ask each time.
    expect(res.headers.get('cache-control')).toBe('no-cache');
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    const text = await res.text();
    expect(text).toContain('/offline.html');
    expect(text).not.toContain('self.__WB_MANIFEST');
    const offline = await fetch(`${base}/offline.html`);
    expect(offline.status).toBe(200);
    expect(await offline.text()).toContain('<h1');
  });

  it('lets pages register the worker and read the manifest under the CSP', async () => {
    const res = await fetch(`${inject('baseUrl')}/sign-in`);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("worker-src 'self'");
    expect(csp).toContain("manifest-src 'self'");
    expect(await res.text()).toContain('<link rel="manifest" href="/manifest.webmanifest"');
  });
});

describe('cards kept on a phone', () => {
  it('lists a machine\'s and a site\'s card pages, field-log and file lists, for every role', async () => {
    const eng = team.members.engineer;
    const site = await makeSite(eng);
    const m1 = await makeMachine(eng, site.id);
    const m2 = await makeMachine(eng, site.id);
    const d1 = await makeDevice(eng, m1.id);
    const d2 = await makeDevice(eng, m2.id);
    const lone = await makeMachine(eng);
    const d3 = await makeDevice(eng, lone.id);
    for (const role of ['owner', 'technician', 'viewer'] as const) {
      const list = expectOk(await team.members[role].get(`/api/field/kept?site=${site.id}&machine=${lone.id}`));
      expect(list.teamId).toBe(team.teamId);
      expect(list.missing).toEqual([]);
      expect(list.canLog).toBe(role !== 'viewer');
      expect(list.scopes.map((s: { type: string; id: string }) => `${s.type}:${s.id}`)).toEqual([`site:${site.id}`, `machine:${lone.id}`]);
      for (const d of [d1, d2, d3]) {
        expect(list.urls).toContain(`/field/devices/${d.id}`);
        expect(list.urls).toContain(`/api/devices/${d.id}/field-log`);
        expect(list.urls).toContain(`/api/attachments?ownerType=device&ownerId=${d.id}`);
      }
      for (const m of [m1, m2, lone]) expect(list.urls).toContain(`/field/machines/${m.id}`);
      expect(list.urls).toContain('/field/kept');
      expect(list.urls.some((u: string) => u.startsWith('/s/'))).toBe(false);
    }
  });

  it('keeps nothing of another team or of the trash: those ids come back as missing', async () => {
    const theirs = await makeMachine(other.members.owner);
    const theirDevice = await makeDevice(other.members.owner, theirs.id);
    const ours = await makeMachine(team.members.engineer);
    const trashed = await makeMachine(team.members.engineer);
    expectOk(await team.members.engineer.del(`/api/machines/${trashed.id}?version=${trashed.version}`));
    const list = expectOk(await team.members.technician.get(`/api/field/kept?machine=${theirs.id}&machine=${ours.id}&machine=${trashed.id}`));
    expect(list.missing).toEqual([{ type: 'machine', id: theirs.id }, { type: 'machine', id: trashed.id }]);
    expect(list.scopes.map((s: { id: string }) => s.id)).toEqual([ours.id]);
    expect(JSON.stringify(list.urls)).not.toContain(theirDevice.id);
    expect(JSON.stringify(list.urls)).not.toContain(theirs.id);
  });

  it('keeps the photos already in a kept card\'s field log, this team\'s only; not unused uploads, other files or share links', async () => {
    const tech = team.members.technician;
    const m = await makeMachine(team.members.engineer);
    const d = await makeDevice(team.members.engineer, m.id);
    const photo = (name: string) => upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, name, 'image/png');
    const inLog = await photo('in-the-log.png');
    const unused = await photo('not-in-an-entry.png');
    const cfg = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'config' }, PNG_BYTES, 'drive.cfg');
    for (const r of [inLog, unused, cfg]) expect(r.status, JSON.stringify(r.body)).toBe(201);
    await logEntry(tech, d.id, { kind: 'verified', note: 'Photo of the new unit', photoIds: [inLog.body.id] });
    // Another team's photo in its own field log: never in this team's list, even when asked for its machine.
    const theirMachine = await makeMachine(other.members.owner);
    const theirDevice = await makeDevice(other.members.owner, theirMachine.id);
    const theirs = await upload(other.members.technician, { ownerType: 'device', ownerId: theirDevice.id, kind: 'photo' }, PNG_BYTES, 'theirs.png', 'image/png');
    await logEntry(other.members.technician, theirDevice.id, { kind: 'verified', photoIds: [theirs.body.id] });

    const list = expectOk(await tech.get(`/api/field/kept?machine=${m.id}&machine=${theirMachine.id}`));
    const photos = list.urls.filter((u: string) => /^\/api\/attachments\/[^?]+$/.test(u));
    expect(photos).toEqual([`/api/attachments/${inLog.body.id}`]);
    expect(JSON.stringify(list.urls)).not.toContain(theirs.body.id);
    expect(list.urls.some((u: string) => u.startsWith('/s/'))).toBe(false);
    // What the phone fetches is the photo itself, answered to this team's members.
    const got = await tech.get(photos[0]);
    expect(got.status).toBe(200);
    expect(got.headers.get('content-type')).toBe('image/png');
  });

  it('answers no-store like every signed-in answer: only the Cache API keeps a copy, on the phone\'s request (decisions 007 and 017)', async () => {
    const m = await makeMachine(team.members.engineer);
    const list = await team.members.technician.get(`/api/field/kept?machine=${m.id}`);
    expect(list.headers.get('cache-control')).toBe('no-store');
    const page = await team.members.technician.get(`/field/machines/${m.id}`);
    expect(page.status).toBe(200);
    expect(page.headers.get('cache-control')).toBe('no-store');
  });

  it('serves the kept-cards page and the sign-out page to members, and sends the signed-out to sign in', async () => {
    const kept = await team.members.viewer.get('/field/kept');
    expect(kept.status).toBe(200);
    expect(kept.body).toContain('<h1 class="mb-2">Cards kept on this phone</h1>');
    const out = await team.members.viewer.get('/sign-out');
    expect(out.status).toBe(200);
    expect(out.body).toContain('Sign out on this phone');
    const anon = new TestClient();
    expect((await anon.get('/field/kept')).status).toBe(302);
    const signOut = await anon.get('/sign-out');
    expect(signOut.status).toBe(302);
    expect(signOut.headers.get('location')).toBe('/sign-in');
  });

  it('answers 401 signed out, and 422 for an unknown parameter', async () => {
    expect((await new TestClient().get('/api/field/kept?machine=x')).status).toBe(401);
    const bad = await team.members.viewer.get('/api/field/kept?device=x');
    expect(bad.status).toBe(422);
  });
});

describe('entries written offline', () => {
  it('keeps the time the work was done beside the time the server received it', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const doneAt = iso(-3 * 60 * MINUTE);
    const entry = expectOk(await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', note: 'Written in the cellar', doneAt, clientKey: 'k-offline-0001' }), 201);
    expect(new Date(entry.doneAt).toISOString()).toBe(doneAt);
    expect(Math.abs(new Date(entry.createdAt).getTime() - Date.now())).toBeLessThan(MINUTE);
    const online = expectOk(await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', note: 'Written at the cabinet' }), 201);
    expect(Math.abs(new Date(online.doneAt).getTime() - new Date(online.createdAt).getTime())).toBeLessThan(MINUTE);
  });

  it('refuses a time more than 5 minutes ahead or more than 90 days back with 422 on doneAt, writing nothing', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    for (const doneAt of [iso(10 * MINUTE), iso(-91 * DAY), 'yesterday', '2026-02-30T10:00:00Z']) {
      const res = await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', doneAt });
      expect(res.status, doneAt).toBe(422);
      expect(res.body.fields.doneAt, doneAt).toBeTruthy();
    }
    // Inside the limits: 4 minutes ahead (a phone clock running fast) and 89 days back.
    expectOk(await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', doneAt: iso(4 * MINUTE) }), 201);
    expectOk(await tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', doneAt: iso(-89 * DAY) }), 201);
    expect(expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items).toHaveLength(2);
  });

  it('a resend with the same client key answers the first entry (200) and writes nothing twice, photos included', async () => {
    const tech = team.members.technician;
    const d = await makeDevice(team.members.engineer);
    const photo = await upload(tech, { ownerType: 'device', ownerId: d.id, kind: 'photo' }, PNG_BYTES, 'offline.png', 'image/png');
    const body = { kind: 'found-different', foundSettings: '19200 8-E-1', photoIds: [photo.body.id], doneAt: iso(-MINUTE * 30), clientKey: 'k-resend-000042' };
    const first = expectOk(await tech.post(`/api/devices/${d.id}/field-log`, body), 201);
    const again = expectOk(await tech.post(`/api/devices/${d.id}/field-log`, body), 200);
    expect(again.id).toBe(first.id);
    expect(again.photos.map((p: { id: string }) => p.id)).toEqual([photo.body.id]);
    const both = await Promise.all([1, 2].map(() => tech.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', clientKey: 'k-at-once-0007' })));
    expect(both.map((r) => r.status).sort()).toEqual([200, 201]);
    expect(both[0]!.body.id).toBe(both[1]!.body.id);
    const items = expectOk(await tech.get(`/api/devices/${d.id}/field-log`)).items;
    expect(items).toHaveLength(2);
    // One proposal for the one finding.
    expect(expectOk(await tech.get(`/api/proposals?deviceId=${d.id}`)).items).toHaveLength(1);
  });

  it('a client key used by someone else, or on another device, is a conflict; another team may use the same key', async () => {
    const d = await makeDevice(team.members.engineer);
    const d2 = await makeDevice(team.members.engineer);
    expectOk(await team.members.technician.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', clientKey: 'k-shared-00001' }), 201);
    expect((await team.members.engineer.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', clientKey: 'k-shared-00001' })).status).toBe(409);
    expect((await team.members.technician.post(`/api/devices/${d2.id}/field-log`, { kind: 'verified', clientKey: 'k-shared-00001' })).status).toBe(409);
    const theirs = await makeDevice(other.members.owner);
    expectOk(await other.members.technician.post(`/api/devices/${theirs.id}/field-log`, { kind: 'verified', clientKey: 'k-shared-00001' }), 201);
    const bad = await team.members.technician.post(`/api/devices/${d.id}/field-log`, { kind: 'verified', clientKey: 'a b' });
    expect(bad.status).toBe(422);
    expect(bad.body.fields.clientKey).toBeTruthy();
  });
});
