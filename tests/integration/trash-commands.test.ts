/** Commands on the team's trash page: listed with their owner, restored through the command restore rules, purged with their history. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk } from './vault-fixtures';
import { makeCommand, makeDevice, makeProfile } from './command-fixtures';

let team: TeamFixture;
let other: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('trash-cmd'), createTeamWithRoles('trash-cmd-other')]);
  eng = team.members.engineer;
}, 60_000);

const trashItem = async (c: TestClient, id: string) => {
  const list = expectOk(await c.get('/api/trash?type=command&pageSize=200'));
  return list.items.find((i: { id: string }) => i.id === id);
};

async function rowsOf(id: string): Promise<{ commands: number; revisions: number }> {
  const db = testDb();
  try {
    const rs = await db.execute({
      sql: 'SELECT (SELECT count(*) FROM command WHERE id = ?) AS commands, (SELECT count(*) FROM revision WHERE entity_id = ?) AS revisions',
      args: [id, id],
    });
    return { commands: Number(rs.rows[0]!.commands), revisions: Number(rs.rows[0]!.revisions) };
  } finally {
    db.close();
  }
}

describe('commands in the trash', () => {
  it('lists a trashed command with its name and its device tag or profile name', async () => {
    const d = await makeDevice(eng);
    const onDevice = await makeCommand(eng, { deviceId: d.id }, { name: 'Jog forward' });
    const profile = await makeProfile(eng);
    const onProfile = await makeCommand(eng, { profileId: profile.id }, { name: 'Read weight' });
    expectOk(await eng.del(`/api/commands/${onDevice.id}`));
    expectOk(await eng.del(`/api/commands/${onProfile.id}?version=1`));

    expect(await trashItem(eng, onDevice.id)).toMatchObject({
      type: 'command', label: `Jog forward on ${d.tag}`, contents: 0, deletedByName: eng.user!.name,
    });
    expect(await trashItem(eng, onProfile.id)).toMatchObject({ type: 'command', label: `Read weight on profile ${profile.name}` });
    const all = expectOk(await eng.get('/api/trash?pageSize=200'));
    expect(all.items.filter((i: { id: string }) => i.id === onDevice.id)).toHaveLength(1);
    const sites = expectOk(await eng.get('/api/trash?type=site&pageSize=200'));
    expect(sites.items.some((i: { id: string }) => i.id === onDevice.id)).toBe(false);
  });

  it('does not list a live command whose device is in the trash', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id });
    expectOk(await eng.del(`/api/devices/${d.id}`));
    expect(await trashItem(eng, c.id)).toBeUndefined();
    expect(await trashItem(eng, d.id)).toBeUndefined();
  });

  it('restores it from the trash: live again, one version on, with a restore revision', async () => {
    const c = await makeCommand(eng, undefined, { name: 'Jog back', notes: 'kept' });
    const trashed = expectOk(await eng.del(`/api/commands/${c.id}`));
    expect((await team.members.technician.post(`/api/trash/command/${c.id}`)).status).toBe(403);

    expect(expectOk(await eng.post(`/api/trash/command/${c.id}`))).toEqual({ type: 'command', id: c.id, restored: true });
    const back = expectOk(await eng.get(`/api/commands/${c.id}`));
    expect(back).toMatchObject({ name: 'Jog back', notes: 'kept', version: trashed.version + 1, deletedAt: null });
    expect(await trashItem(eng, c.id)).toBeUndefined();
    const revs = expectOk(await eng.get(`/api/commands/${c.id}/revisions`));
    expect(revs).toMatchObject({ trashed: false, version: trashed.version + 1 });
    expect(revs.items[0]).toMatchObject({ action: 'restore', summary: 'Restored command Jog back from the trash', changes: [] });
    expect((await eng.post(`/api/trash/command/${c.id}`)).status).toBe(404);
  });

  it('refuses (409) to restore it while its device is in the trash, and changes nothing', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id });
    const trashed = expectOk(await eng.del(`/api/commands/${c.id}`));
    expectOk(await eng.del(`/api/devices/${d.id}`));

    const res = await eng.post(`/api/trash/command/${c.id}`);
    expect(res.status).toBe(409);
    expect(res.body.error).toBe(`This command points at the device "${d.tag}", which is in the trash. Restore that from the trash first.`);
    expect(res.body.missing).toEqual([{ type: 'device', id: d.id, field: 'deviceId', state: 'trash', label: d.tag }]);
    expect(await trashItem(eng, c.id)).toMatchObject({ type: 'command' });
    expect(expectOk(await eng.get(`/api/commands/${c.id}/revisions`))).toMatchObject({ trashed: true, version: trashed.version });

    expectOk(await eng.post(`/api/trash/device/${d.id}`));
    expectOk(await eng.post(`/api/trash/command/${c.id}`));
    expect(expectOk(await eng.get(`/api/commands/${c.id}`)).deviceId).toBe(d.id);
  });

  it('purges it (admins only) with its history', async () => {
    const c = await makeCommand(eng);
    expectOk(await eng.patch(`/api/commands/${c.id}`, { version: 1, notes: 'second version' }));
    expectOk(await eng.del(`/api/commands/${c.id}`));
    expect(await rowsOf(c.id)).toEqual({ commands: 1, revisions: 3 });

    expect((await eng.del(`/api/trash/command/${c.id}`)).status).toBe(403);
    expect(expectOk(await team.members.admin.del(`/api/trash/command/${c.id}`))).toEqual({ type: 'command', id: c.id, purged: 1 });
    expect(await rowsOf(c.id)).toEqual({ commands: 0, revisions: 0 });
    expect(await trashItem(eng, c.id)).toBeUndefined();
    expect((await eng.get(`/api/commands/${c.id}/revisions`)).status).toBe(404);
    expect((await eng.post(`/api/trash/command/${c.id}`)).status).toBe(404);
  });

  it('does not purge or restore a live command through the trash', async () => {
    const c = await makeCommand(eng);
    expect((await team.members.admin.del(`/api/trash/command/${c.id}`)).status).toBe(404);
    expect((await eng.post(`/api/trash/command/${c.id}`)).status).toBe(404);
    expect(await rowsOf(c.id)).toEqual({ commands: 1, revisions: 1 });
  });

  it("keeps another team's trashed command out of sight and out of reach", async () => {
    const theirs = await makeCommand(other.members.owner);
    expectOk(await other.members.owner.del(`/api/commands/${theirs.id}`));
    expect(await trashItem(other.members.owner, theirs.id)).toMatchObject({ type: 'command' });

    expect(await trashItem(team.members.owner, theirs.id)).toBeUndefined();
    expect((await team.members.owner.post(`/api/trash/command/${theirs.id}`)).status).toBe(404);
    expect((await team.members.owner.del(`/api/trash/command/${theirs.id}`)).status).toBe(404);
    expect(await rowsOf(theirs.id)).toEqual({ commands: 1, revisions: 2 });
    expect(await trashItem(other.members.owner, theirs.id)).toMatchObject({ type: 'command' });
  });
});
