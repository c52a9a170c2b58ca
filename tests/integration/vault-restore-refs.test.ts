/**
 * Restores (of an old revision, and from the trash) check every record the restored state points at:
 * what is in the trash or gone answers 409 naming it, and the record stays as it was. Never a 500.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeLink, makeMachine, makeProfile, makeSite } from './vault-fixtures';
import { makeCommand } from './command-fixtures';

let team: TeamFixture;
let eng: TestClient;
let admin: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('restore-refs');
  eng = team.members.engineer;
  admin = team.members.admin;
}, 60_000);

async function firstRevision(type: string, id: string) {
  const hist = expectOk(await eng.get(`/api/revisions?entityType=${type}&entityId=${id}&dir=asc`));
  return hist.items[0] as { id: string; version: number };
}

async function trashAndPurge(type: string, id: string) {
  expectOk(await eng.del(`/api/${type === 'profile' ? 'profiles' : `${type}s`}/${id}`));
  expectOk(await admin.del(`/api/trash/${type}/${id}`));
}

describe('restoring a revision whose references are no longer there', () => {
  it('refuses a device version whose profile was purged (409 naming the profile), leaving the device as it is', async () => {
    const profile = await makeProfile(eng);
    const d = await makeDevice(eng, undefined, { profileId: profile.id });
    const v1 = await firstRevision('device', d.id);
    await trashAndPurge('profile', profile.id);
    const before = expectOk(await eng.get(`/api/devices/${d.id}`));
    expect(before.profileId).toBeNull();

    const res = await eng.post(`/api/revisions/${v1.id}/restore`, { version: before.version });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/profile/);
    expect(res.body.missing).toEqual([{ type: 'profile', id: profile.id, field: 'profileId', state: 'gone', label: null }]);
    expect(expectOk(await eng.get(`/api/devices/${d.id}`))).toMatchObject({ version: before.version, profileId: null });
  });

  it('refuses a device version on a machine now in the trash, and one on a machine purged', async () => {
    const d = await makeDevice(eng);
    const v1 = await firstRevision('device', d.id);
    const other = await makeMachine(eng, d.siteId);
    const moved = expectOk(await eng.patch(`/api/devices/${d.id}`, { version: 1, machineId: other.id, notes: 'moved' }));
    const oldMachine = expectOk(await eng.get(`/api/machines/${d.machineId}`));
    expectOk(await eng.del(`/api/machines/${d.machineId}`));

    const trashed = await eng.post(`/api/revisions/${v1.id}/restore`, { version: moved.version });
    expect(trashed.status).toBe(409);
    expect(trashed.body.error).toMatch(/in the trash/);
    expect(trashed.body.missing).toEqual([{ type: 'machine', id: d.machineId, field: 'machineId', state: 'trash', label: oldMachine.name }]);

    expectOk(await admin.del(`/api/trash/machine/${d.machineId}`));
    const gone = await eng.post(`/api/revisions/${v1.id}/restore`, { version: moved.version });
    expect(gone.status).toBe(409);
    expect(gone.body.missing).toEqual([{ type: 'machine', id: d.machineId, field: 'machineId', state: 'gone', label: null }]);
    expect(expectOk(await eng.get(`/api/devices/${d.id}`))).toMatchObject({ version: moved.version, machineId: other.id, notes: 'moved' });
  });

  it('puts a device back on its old machine when that machine is live', async () => {
    const d = await makeDevice(eng);
    const v1 = await firstRevision('device', d.id);
    const other = await makeMachine(eng, d.siteId);
    expectOk(await eng.patch(`/api/devices/${d.id}`, { version: 1, machineId: other.id }));
    const restored = expectOk(await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 }));
    expect(restored.record.machineId).toBe(d.machineId);
  });

  it('moves a machine back to its old site, and refuses when that site is in the trash', async () => {
    const m = await makeMachine(eng);
    const v1 = await firstRevision('machine', m.id);
    const s2 = await makeSite(eng);
    expectOk(await eng.patch(`/api/machines/${m.id}`, { version: 1, siteId: s2.id }));
    const back = expectOk(await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 }));
    expect(back.record.siteId).toBe(m.siteId);

    expectOk(await eng.patch(`/api/machines/${m.id}`, { version: 3, siteId: s2.id }));
    expectOk(await eng.del(`/api/sites/${m.siteId}`));
    const res = await eng.post(`/api/revisions/${v1.id}/restore`, { version: 4 });
    expect(res.status).toBe(409);
    expect(res.body.missing).toMatchObject([{ type: 'site', id: m.siteId, state: 'trash' }]);
    expect(expectOk(await eng.get(`/api/machines/${m.id}`))).toMatchObject({ version: 4, siteId: s2.id });
  });

  it('refuses a link version whose member port was purged or is in the trash', async () => {
    const a = await makeDevice(eng);
    const b = await makeDevice(eng, a.machineId);
    const link = await makeLink(eng, a.machineId, [{ portId: a.ports[0].id, role: 'master' }, { portId: b.ports[0].id, role: 'slave' }]);
    const v1 = await firstRevision('link', link.id);
    expectOk(await eng.patch(`/api/links/${link.id}`, { version: 1, members: [{ portId: a.ports[0].id, role: 'master' }] }));
    expectOk(await eng.del(`/api/ports/${b.ports[0].id}`));

    const trashed = await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 });
    expect(trashed.status).toBe(409);
    expect(trashed.body.missing).toMatchObject([{ type: 'port', id: b.ports[0].id, field: 'members', state: 'trash' }]);

    expectOk(await admin.del(`/api/trash/port/${b.ports[0].id}`));
    const gone = await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 });
    expect(gone.status).toBe(409);
    expect(gone.body.missing).toMatchObject([{ type: 'port', id: b.ports[0].id, state: 'gone' }]);
    expect(expectOk(await eng.get(`/api/links/${link.id}`)).members).toHaveLength(1);
  });

  it('keeps a member that is in the trash now and was a member then (nothing new is pointed at)', async () => {
    const a = await makeDevice(eng);
    const link = await makeLink(eng, a.machineId, [{ portId: a.ports[0].id, role: 'master' }, { portId: a.ports[1].id, role: 'slave' }]);
    const v1 = await firstRevision('link', link.id);
    expectOk(await eng.patch(`/api/links/${link.id}`, { version: 1, notes: 'changed' }));
    expectOk(await eng.del(`/api/ports/${a.ports[1].id}`));
    const restored = expectOk(await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 }));
    expect(restored.record.notes).toBe('');
    expect(expectOk(await eng.get(`/api/links/${link.id}`)).members).toHaveLength(2);
  });

  it('answers 422 naming the port when a port version takes a name used by another port now', async () => {
    const d = await makeDevice(eng);
    const [p0, p1] = d.ports;
    const v1 = await firstRevision('port', p1.id);
    expectOk(await eng.patch(`/api/ports/${p1.id}`, { version: 1, name: 'Spare' }));
    expectOk(await eng.patch(`/api/ports/${p0.id}`, { version: 1, name: p1.name }));
    const res = await eng.post(`/api/revisions/${v1.id}/restore`, { version: 2 });
    expect(res.status).toBe(422);
    expect(res.body.fields.name).toMatch(/already has this name/);
  });
});

describe('restoring from the trash', () => {
  it('refuses a port whose name a live port of the device took meanwhile, in any letter case', async () => {
    const d = await makeDevice(eng);
    const p = d.ports[1];
    expectOk(await eng.del(`/api/ports/${p.id}`));
    expectOk(await eng.post('/api/ports', { deviceId: d.id, name: p.name.toUpperCase() }), 201);
    const res = await eng.post(`/api/trash/port/${p.id}`);
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/same name/);
  });

  it('brings a device back whose profile was purged meanwhile, without the profile', async () => {
    const profile = await makeProfile(eng);
    const d = await makeDevice(eng, undefined, { profileId: profile.id });
    expectOk(await eng.del(`/api/devices/${d.id}`));
    await trashAndPurge('profile', profile.id);
    expectOk(await eng.post(`/api/trash/device/${d.id}`));
    expect(expectOk(await eng.get(`/api/devices/${d.id}`)).profileId).toBeNull();
  });
});

describe('restoring a command', () => {
  it('refuses while its device is in the trash, and works again once the device is back', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id });
    const revs = expectOk(await eng.get(`/api/commands/${c.id}/revisions`));
    expectOk(await eng.del(`/api/commands/${c.id}?version=1`));
    expectOk(await eng.del(`/api/devices/${d.id}`));

    const res = await eng.post(`/api/commands/${c.id}/restore`, { revisionId: revs.items[0].id, version: 2 });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatch(/device .* is in the trash/);
    expect(res.body.missing).toEqual([{ type: 'device', id: d.id, field: 'deviceId', state: 'trash', label: d.tag }]);
    expect(expectOk(await eng.get(`/api/commands/${c.id}/revisions`)).trashed).toBe(true);

    expectOk(await eng.post(`/api/trash/device/${d.id}`));
    expectOk(await eng.post(`/api/commands/${c.id}/restore`, { revisionId: revs.items[0].id, version: 2 }));
    expect(expectOk(await eng.get(`/api/commands?deviceId=${d.id}`)).items.map((x: { id: string }) => x.id)).toEqual([c.id]);
  });

  it('refuses a live command’s revision while its device is in the trash', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id });
    expectOk(await eng.patch(`/api/commands/${c.id}`, { version: 1, notes: 'later' }));
    const revs = expectOk(await eng.get(`/api/commands/${c.id}/revisions`));
    expectOk(await eng.del(`/api/devices/${d.id}`));
    const res = await eng.post(`/api/commands/${c.id}/restore`, { revisionId: revs.items[1].id, version: 2 });
    expect(res.status).toBe(409);
    expect(res.body.missing).toMatchObject([{ type: 'device', id: d.id, state: 'trash' }]);
  });

  it('refuses while its profile is in the trash', async () => {
    const profile = await makeProfile(eng);
    const c = await makeCommand(eng, { profileId: profile.id });
    const revs = expectOk(await eng.get(`/api/commands/${c.id}/revisions`));
    expectOk(await eng.del(`/api/commands/${c.id}?version=1`));
    expectOk(await eng.del(`/api/profiles/${profile.id}`));
    const res = await eng.post(`/api/commands/${c.id}/restore`, { revisionId: revs.items[0].id, version: 2 });
    expect(res.status).toBe(409);
    expect(res.body.missing).toEqual([{ type: 'profile', id: profile.id, field: 'profileId', state: 'trash', label: profile.name }]);
  });
});
