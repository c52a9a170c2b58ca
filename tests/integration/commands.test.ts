/** Command library routes: create, validate, scope, versions, trash, copy, inheritance and restore. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture } from '../helpers/client';
import { expectOk } from './vault-fixtures';
import { jogBody, jogTemplate, makeCommand, makeDevice, makeProfile } from './command-fixtures';

let team: TeamFixture;
let other: TeamFixture;
beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('cmd'), createTeamWithRoles('cmd-other')]);
}, 60_000);
const eng = () => team.members.engineer;

describe('command library API', () => {
  it('creates a command on a device and reads it back with its owner', async () => {
    const d = await makeDevice(eng());
    const c = await makeCommand(eng(), { deviceId: d.id }, { name: 'Jog +1°' });
    expect(c).toMatchObject({ name: 'Jog +1°', deviceId: d.id, profileId: null, version: 1, movesMachinery: true, inherited: false });
    expect(c.owner).toMatchObject({ kind: 'device', id: d.id });
    const got = expectOk(await team.members.viewer.get(`/api/commands/${c.id}`));
    expect(got.template.segments[1]).toMatchObject({ name: 'angle', scale: { factor: 100, offset: 0 } });
    const list = expectOk(await team.members.viewer.get(`/api/commands?deviceId=${d.id}`));
    expect(list.items.map((i: any) => i.id)).toEqual([c.id]);
  });

  it('refuses bad input with 422 and a message per field, and writes nothing', async () => {
    const d = await makeDevice(eng());
    const bad = await eng().post('/api/commands', jogBody({ deviceId: d.id }, { name: '', fieldValues: { angle: 999, speed: 3 }, extra: 1 }));
    expect(bad.status).toBe(422);
    expect(bad.body.fields).toHaveProperty('_');
    const bad2 = await eng().post('/api/commands', jogBody({ deviceId: d.id }, { name: '', fieldValues: { angle: 999, speed: 3 } }));
    expect(bad2.status).toBe(422);
    expect(bad2.body.fields).toMatchObject({ name: 'Enter a command name.', 'fieldValues.angle': 'At most 360 °.', 'fieldValues.speed': expect.stringContaining('no field named') });
    const badTemplate = await eng().post('/api/commands', jogBody({ deviceId: d.id }, { template: { version: 1, segments: [{ type: 'literal', id: 'a', bytes: 'ZZ' }] } }));
    expect(badTemplate.status).toBe(422);
    expect(Object.keys(badTemplate.body.fields)[0]).toMatch(/^template\.segments\.0\.bytes/);
    const both = await eng().post('/api/commands', jogBody({ deviceId: d.id, profileId: 'x' }));
    expect(both.status).toBe(422);
    const list = expectOk(await eng().get(`/api/commands?deviceId=${d.id}`));
    expect(list.items).toEqual([]);
  });

  it('answers 403 to technicians and viewers who try to change commands', async () => {
    const c = await makeCommand(eng());
    expect((await team.members.technician.patch(`/api/commands/${c.id}`, { version: 1, notes: 'x' })).status).toBe(403);
    expect((await team.members.viewer.del(`/api/commands/${c.id}`)).status).toBe(403);
    expect((await team.members.viewer.post('/api/commands', jogBody({ deviceId: c.deviceId }))).status).toBe(403);
  });

  it("answers 404 for another team's commands and devices", async () => {
    const theirs = await makeCommand(other.members.owner);
    expect((await eng().get(`/api/commands/${theirs.id}`)).status).toBe(404);
    expect((await eng().patch(`/api/commands/${theirs.id}`, { version: 1, notes: 'x' })).status).toBe(404);
    expect((await eng().post('/api/commands', jogBody({ deviceId: theirs.deviceId }))).status).toBe(404);
    const mine = await makeCommand(eng());
    expect((await eng().post(`/api/commands/${mine.id}/copy`, { deviceId: theirs.deviceId })).status).toBe(404);
    expect((await other.members.owner.get(`/api/commands/${theirs.id}`)).status).toBe(200);
  });

  it('updates with the version, answers 409 with the current command when stale, and keeps history', async () => {
    const c = await makeCommand(eng());
    const v2 = expectOk(await eng().patch(`/api/commands/${c.id}`, { version: 1, notes: 'first', fieldValues: { angle: -1 } }));
    expect(v2.version).toBe(2);
    const stale = await team.members.admin.patch(`/api/commands/${c.id}`, { version: 1, notes: 'second' });
    expect(stale.status).toBe(409);
    expect(stale.body.current).toMatchObject({ version: 2, notes: 'first' });
    const revs = expectOk(await eng().get(`/api/commands/${c.id}/revisions`));
    expect(revs.items.map((r: any) => [r.version, r.action])).toEqual([[2, 'update'], [1, 'create']]);
    expect(revs.items[0].changes.map((ch: any) => ch.field).sort()).toEqual(['fieldValues.angle', 'notes']);
  });

  it('restores an earlier version, and brings a trashed command back', async () => {
    const c = await makeCommand(eng(), undefined, { notes: 'original' });
    expectOk(await eng().patch(`/api/commands/${c.id}`, { version: 1, notes: 'changed' }));
    const first = expectOk(await eng().get(`/api/commands/${c.id}/revisions`)).items.at(-1);
    expect((await eng().post(`/api/commands/${c.id}/restore`, { revisionId: first.id, version: 1 })).status).toBe(409);
    const restored = expectOk(await eng().post(`/api/commands/${c.id}/restore`, { revisionId: first.id, version: 2 }));
    expect(restored).toMatchObject({ restoredVersion: 1, changed: 1, command: { notes: 'original', version: 3 } });

    const trashed = expectOk(await eng().del(`/api/commands/${c.id}?version=3`));
    expect(trashed).toMatchObject({ trashed: true, version: 4 });
    expect((await eng().get(`/api/commands/${c.id}`)).status).toBe(404);
    const inTrash = expectOk(await eng().get(`/api/commands?deviceId=${c.deviceId}&trashed=true`));
    expect(inTrash.items.map((i: any) => i.id)).toEqual([c.id]);
    const revs = expectOk(await eng().get(`/api/commands/${c.id}/revisions`));
    expect(revs).toMatchObject({ trashed: true, version: 4 });
    expectOk(await eng().post(`/api/commands/${c.id}/restore`, { revisionId: revs.items[0].id, version: 4 }));
    expect(expectOk(await eng().get(`/api/commands/${c.id}`)).version).toBe(5);
  });

  it('copies a command to another device and to a profile; profile commands show up inherited on its devices', async () => {
    const c = await makeCommand(eng(), undefined, { name: 'Jog source' });
    const target = await makeDevice(eng());
    const copy = expectOk(await eng().post(`/api/commands/${c.id}/copy`, { deviceId: target.id }), 201);
    expect(copy).toMatchObject({ name: 'Jog source', deviceId: target.id, version: 1, template: c.template });
    expect(copy.id).not.toBe(c.id);
    expect(expectOk(await eng().get(`/api/commands/${copy.id}/revisions`)).items[0]).toMatchObject({ action: 'copy' });

    const profile = await makeProfile(eng());
    const onProfile = expectOk(await eng().post(`/api/commands/${c.id}/copy`, { profileId: profile.id, name: 'Profile jog' }), 201);
    expect(onProfile).toMatchObject({ profileId: profile.id, deviceId: null, name: 'Profile jog' });
    const made = await makeDevice(eng(), undefined, { profileId: profile.id, ports: undefined });
    await makeCommand(eng(), { deviceId: made.id }, { name: 'AAA own' });
    const list = expectOk(await eng().get(`/api/commands?deviceId=${made.id}`));
    expect(list.items.map((i: any) => [i.name, i.inherited])).toEqual([['AAA own', false], ['Profile jog', true]]);
    expect(list.items[1].owner).toMatchObject({ kind: 'profile', id: profile.id });
    const profileList = expectOk(await eng().get(`/api/commands?profileId=${profile.id}`));
    expect(profileList.items.map((i: any) => i.name)).toEqual(['Profile jog']);
  });

  it('keeps the template exactly as the engine saves it', async () => {
    const c = await makeCommand(eng());
    expect(c.template).toEqual({ ...jogTemplate(), segments: c.template.segments });
    expect(c.template.segments[1]).toMatchObject({ pad: 'zero', sign: 'always' });
  });
});
