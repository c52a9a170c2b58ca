/**
 * One record engine for vault records and commands: commands keep their history in the one revision table and
 * carry the trash stamp vault records do; a purged device takes its commands' history along; a stale write names
 * the version the record is at now, for vault records as for commands.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, testDb, type TeamFixture, type TestClient } from '../helpers/client';
import { makeCommand } from './command-fixtures';
import { expectOk, makeDevice } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('record-engine');
  eng = team.members.engineer;
}, 60_000);

async function rows(sql: string, args: string[]) {
  const db = testDb();
  try {
    return (await db.execute({ sql, args })).rows.map((r) => ({ ...r }));
  } finally {
    db.close();
  }
}

describe('one record engine', () => {
  it('keeps a command’s history in the revision table, and stamps it in the trash with its own trash id', async () => {
    const c = await makeCommand(eng);
    expectOk(await eng.patch(`/api/commands/${c.id}`, { version: 1, notes: 'tightened' }));
    expectOk(await eng.del(`/api/commands/${c.id}?version=2`));
    const revs = await rows("SELECT version, action FROM revision WHERE team_id = ? AND entity_type = 'command' AND entity_id = ? ORDER BY version", [team.teamId, c.id]);
    expect(revs).toEqual([{ version: 1, action: 'create' }, { version: 2, action: 'update' }, { version: 3, action: 'delete' }]);
    expect(await rows('SELECT trash_id FROM command WHERE id = ?', [c.id])).toEqual([{ trash_id: c.id }]);
    // Restoring a revision brings it back out of the trash, stamp and all.
    const first = expectOk(await eng.get(`/api/commands/${c.id}/revisions`)).items.at(-1);
    expectOk(await eng.post(`/api/commands/${c.id}/restore`, { revisionId: first.id, version: 3 }));
    expect(await rows('SELECT deleted_at, trash_id FROM command WHERE id = ?', [c.id])).toEqual([{ deleted_at: null, trash_id: null }]);
  });

  it('purging a device removes its commands and their history', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id });
    expectOk(await eng.del(`/api/devices/${d.id}?version=${d.version}`));
    expectOk(await team.members.admin.del(`/api/trash/device/${d.id}`));
    expect(await rows('SELECT id FROM command WHERE id = ?', [c.id])).toEqual([]);
    expect(await rows('SELECT id FROM revision WHERE entity_id = ?', [c.id])).toEqual([]);
  });

  it('a stale write names the version the record is at now (vault record and command alike)', async () => {
    const d = await makeDevice(eng);
    expectOk(await eng.patch(`/api/devices/${d.id}`, { version: d.version, firmware: 'v2' }));
    const stale = await eng.patch(`/api/devices/${d.id}`, { version: d.version, firmware: 'v3' });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toContain(`you edited version ${d.version}, it is now at ${d.version + 1}`);
    const c = await makeCommand(eng);
    expectOk(await eng.patch(`/api/commands/${c.id}`, { version: 1, notes: 'x' }));
    const staleCommand = await eng.patch(`/api/commands/${c.id}`, { version: 1, notes: 'y' });
    expect(staleCommand.body.error).toContain('you edited version 1, it is now at 2');
  });
});
