/** Every vault and field page: signed-out visitors go to sign-in, another team's or an unknown id answers 404. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, TestClient, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, makeLink, makeProfile } from './vault-fixtures';
import { makeCommand } from './command-fixtures';

let mine: TeamFixture;
let theirs: TeamFixture;
/** Records of each team, by kind. */
let own: Record<string, string>;
let other: Record<string, string>;

async function records(t: TeamFixture) {
  const c = t.members.owner;
  const d = await makeDevice(c);
  const link = await makeLink(c, d.machineId, [{ portId: d.ports[0].id, role: 'master' }]);
  const profile = await makeProfile(c);
  const cmd = await makeCommand(c, { deviceId: d.id });
  const pcmd = await makeCommand(c, { profileId: profile.id });
  return { site: d.siteId, machine: d.machineId, device: d.id, link: link.id, profile: profile.id, command: cmd.id, profileCommand: pcmd.id };
}

beforeAll(async () => {
  mine = await createTeamWithRoles('pages-mine');
  theirs = await createTeamWithRoles('pages-theirs');
  own = await records(mine);
  other = await records(theirs);
}, 90_000);

/** Pages that show one record, given the records to use; `nf` is what the not-found body says. */
const recordPages = (r: Record<string, string>) => [
  `/vault/sites/${r.site}`,
  `/vault/machines/${r.machine}`,
  `/vault/devices/${r.device}`,
  `/vault/links/${r.link}`,
  `/vault/profiles/${r.profile}`,
  `/vault/devices/${r.device}/commands`,
  `/vault/devices/${r.device}/commands/${r.command}`,
  `/vault/devices/${r.device}/commands/new`,
  `/vault/profiles/${r.profile}/commands`,
  `/vault/profiles/${r.profile}/commands/${r.profileCommand}`,
  `/vault/profiles/${r.profile}/commands/new`,
  `/field/devices/${r.device}`,
  `/field/devices/${r.device}/log`,
  `/field/machines/${r.machine}`,
  `/field/machines/${r.machine}/print`,
];
const listPages = ['/vault', '/vault/trash', '/vault/profiles', '/field/shares', '/field/transfer'];

describe('vault and field pages', () => {
  it('answer 200 for the team’s own records (the baseline the other checks differ from)', async () => {
    for (const path of [...recordPages(own), ...listPages]) {
      const res = await mine.members.owner.get(path);
      expect(res.status, path).toBe(200);
    }
  });

  it('redirect signed-out visitors to sign-in with the page to come back to', async () => {
    const c = new TestClient();
    for (const path of [...recordPages(own), ...listPages]) {
      const res = await c.get(path);
      expect(res.status, path).toBe(302);
      expect(res.headers.get('location'), path).toBe(`/sign-in?next=${encodeURIComponent(path)}`);
    }
  });

  it('answer 404 with the not-found page for another team’s records', async () => {
    for (const path of recordPages(other)) {
      const res = await mine.members.owner.get(path);
      expect(res.status, path).toBe(404);
      expect(String(res.body), path).toMatch(/<h1[^>]*>No such /);
      expect(String(res.body), path).toContain('Back to the vault');
    }
  });

  it('answer 404 for unknown ids, and for a command reached through a device or profile it is not on', async () => {
    const unknown = { site: 'site_nope', machine: 'mach_nope', device: 'dev_nope', link: 'link_nope', profile: 'prof_nope', command: 'cmd_nope', profileCommand: 'cmd_nope' };
    const mixed = [
      `/vault/devices/${own.device}/commands/${other.command}`,
      `/vault/devices/${own.device}/commands/${own.profileCommand}`,
      `/vault/profiles/${own.profile}/commands/${own.command}`,
      `/vault/profiles/${own.profile}/commands/${other.profileCommand}`,
    ];
    for (const path of [...recordPages(unknown), ...mixed]) {
      const res = await mine.members.viewer.get(path);
      expect(res.status, path).toBe(404);
      expect(String(res.body), path).toMatch(/<h1[^>]*>No such /);
    }
  });

  it('answer 404 for a record in the trash, and 403 for a role without the permission', async () => {
    const d = await makeDevice(mine.members.owner);
    expectOk(await mine.members.owner.del(`/api/devices/${d.id}`));
    for (const path of [`/vault/devices/${d.id}`, `/vault/devices/${d.id}/commands`, `/field/devices/${d.id}`]) {
      expect((await mine.members.owner.get(path)).status, path).toBe(404);
    }
    // The device page and its QR link tell a member it is in the trash; whom may restore it gets the trash's link.
    for (const path of [`/vault/devices/${d.id}`, `/field/devices/${d.id}`]) {
      const owner = String((await mine.members.owner.get(path)).body);
      expect(owner, path).toMatch(/<h1[^>]*>This device is in the trash/);
      expect(owner, path).toContain('href="/vault/trash"');
      const viewer = String((await mine.members.viewer.get(path)).body);
      expect(viewer, path).toMatch(/<h1[^>]*>This device is in the trash/);
      expect(viewer, path).not.toContain('href="/vault/trash"');
    }
    // Another team's trashed device is simply not found.
    expect(String((await theirs.members.owner.get(`/field/devices/${d.id}`)).body)).toMatch(/<h1[^>]*>No such /);
    const unknown = await mine.members.viewer.get('/no-such-page');
    expect(unknown.status).toBe(404);
    expect(String(unknown.body)).toMatch(/<h1[^>]*>No page at this address/);
    expect((await mine.members.viewer.get(`/vault/devices/${own.device}/commands/new`)).status).toBe(403);
    expect((await mine.members.viewer.get('/vault/trash')).status).toBe(403);
  });

  it('keep the query in the sign-in redirect, send a signed-in person without a team to start one, and let them open that page', async () => {
    const anon = new TestClient();
    const withQuery = `/field/shares?scopeType=machine&scopeId=${own.machine}`;
    expect((await anon.get(withQuery)).headers.get('location')).toBe(`/sign-in?next=${encodeURIComponent(withQuery)}`);
    const startTeam = await anon.get('/teams/new');
    expect(startTeam.status).toBe(302);
    expect(new URL(startTeam.headers.get('location')!, 'http://x').searchParams.get('next')).toBe('/teams/new');

    const teamless = await new TestClient().signUp('pages-teamless');
    for (const path of ['/vault', `/vault/devices/${own.device}`, '/field/shares', '/team']) {
      const res = await teamless.get(path);
      expect(res.status, path).toBe(302);
      expect(res.headers.get('location'), path).toBe('/teams/new');
    }
    expect((await teamless.get('/teams/new')).status).toBe(200);
  });
});
