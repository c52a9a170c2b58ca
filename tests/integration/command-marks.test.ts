/**
 * The live link's marks on a command (safe to repeat, setup command): set through the API, refused together with
 * moving machinery or on a sequence, kept in the history and restored with it, carried by export and import.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeSite } from './vault-fixtures';
import { jogBody, makeCommand } from './command-fixtures';

let team: TeamFixture;
let target: TeamFixture;
beforeAll(async () => {
  [team, target] = await Promise.all([createTeamWithRoles('marks'), createTeamWithRoles('marks-import')]);
}, 60_000);
const eng = () => team.members.engineer;
const reads = { movesMachinery: false, safeToRepeat: true };

describe('command marks for the live link', () => {
  it('keeps both marks, false when left out, and lists them', async () => {
    const d = await makeDevice(eng());
    const plain = await makeCommand(eng(), { deviceId: d.id }, { name: 'Jog' });
    expect(plain).toMatchObject({ movesMachinery: true, safeToRepeat: false, setsUpDevice: false });
    const query = await makeCommand(eng(), { deviceId: d.id }, { name: 'Read', ...reads });
    const setup = await makeCommand(eng(), { deviceId: d.id }, { name: 'Set line', movesMachinery: false, setsUpDevice: true });
    const list = expectOk(await team.members.technician.get(`/api/commands?deviceId=${d.id}`));
    expect(list.items.map((c: any) => [c.name, c.safeToRepeat, c.setsUpDevice])).toEqual([['Jog', false, false], ['Read', true, false], ['Set line', false, true]]);
    expect(query.version).toBe(1);
    expect(setup.version).toBe(1);
  });

  it('refuses a command that moves machinery marked safe to repeat, on create and on update, and writes nothing', async () => {
    const d = await makeDevice(eng());
    const bad = await eng().post('/api/commands', jogBody({ deviceId: d.id }, { movesMachinery: true, safeToRepeat: true }));
    expect(bad.status).toBe(422);
    expect(bad.body.fields).toEqual({ safeToRepeat: 'A command that moves machinery is never safe to repeat; clear one of the two marks.' });
    expect(expectOk(await eng().get(`/api/commands?deviceId=${d.id}`)).items).toEqual([]);

    const q = await makeCommand(eng(), { deviceId: d.id }, reads);
    const moving = await eng().patch(`/api/commands/${q.id}`, { version: 1, movesMachinery: true });
    expect(moving.status).toBe(422);
    expect(moving.body.fields).toHaveProperty('safeToRepeat');
    const jog = await makeCommand(eng(), { deviceId: d.id });
    expect((await eng().patch(`/api/commands/${jog.id}`, { version: 1, safeToRepeat: true })).status).toBe(422);
    expect(expectOk(await eng().get(`/api/commands/${q.id}`))).toMatchObject({ version: 1, movesMachinery: false, safeToRepeat: true });
    expect(expectOk(await eng().get(`/api/commands/${jog.id}`))).toMatchObject({ version: 1, safeToRepeat: false });
    // Both changed in one request is fine.
    expect(expectOk(await eng().patch(`/api/commands/${q.id}`, { version: 1, movesMachinery: true, safeToRepeat: false }))).toMatchObject({ version: 2, movesMachinery: true });
  });

  it('refuses either mark on a sequence', async () => {
    const d = await makeDevice(eng());
    const step = await makeCommand(eng(), { deviceId: d.id }, reads);
    const body = { deviceId: d.id, name: 'Both', template: { version: 1, segments: [] }, sequence: { mode: 'one-string', steps: [{ commandId: step.id, values: {} }] } };
    const safe = await eng().post('/api/commands', { ...body, safeToRepeat: true });
    expect(safe.status).toBe(422);
    expect(safe.body.fields).toEqual({ safeToRepeat: 'Mark a single command safe to repeat, not a sequence.' });
    const seq = expectOk(await eng().post('/api/commands', body), 201);
    const setup = await eng().patch(`/api/commands/${seq.id}`, { version: 1, setsUpDevice: true });
    expect(setup.status).toBe(422);
    expect(setup.body.fields).toEqual({ setsUpDevice: 'Mark the single commands that set the device up, not a sequence.' });
  });

  it('keeps the marks in the history and restores them with a revision', async () => {
    const c = await makeCommand(eng(), undefined, { movesMachinery: false });
    const v2 = expectOk(await eng().patch(`/api/commands/${c.id}`, { version: 1, safeToRepeat: true, setsUpDevice: true }));
    expect(v2).toMatchObject({ version: 2, safeToRepeat: true, setsUpDevice: true });
    const revs = expectOk(await eng().get(`/api/commands/${c.id}/revisions`));
    expect(revs.items[0].changes.map((ch: any) => [ch.field, ch.from, ch.to]).sort()).toEqual([['safeToRepeat', false, true], ['setsUpDevice', false, true]]);
    const restored = expectOk(await eng().post(`/api/commands/${c.id}/restore`, { revisionId: revs.items.at(-1).id, version: 2 }));
    expect(restored.command).toMatchObject({ version: 3, safeToRepeat: false, setsUpDevice: false });
  });

  it('exports the marks and imports them; a document from before the marks imports without them', async () => {
    const site = await makeSite(eng());
    const m = await makeMachine(eng(), site.id);
    const d = await makeDevice(eng(), m.id);
    await makeCommand(eng(), { deviceId: d.id }, { name: 'Read', ...reads });
    await makeCommand(eng(), { deviceId: d.id }, { name: 'Set line', movesMachinery: false, setsUpDevice: true });
    const doc = expectOk(await eng().get(`/api/export?siteId=${site.id}`));
    expect(doc.commands.map((c: any) => [c.name, c.safeToRepeat, c.setsUpDevice])).toEqual([['Read', true, false], ['Set line', false, true]]);

    const owner = target.members.owner;
    expectOk(await owner.post('/api/import', { document: doc, apply: true }), 201);
    const imported = expectOk(await owner.get('/api/export'));
    expect(imported.commands.map((c: any) => [c.name, c.safeToRepeat, c.setsUpDevice])).toEqual([['Read', true, false], ['Set line', false, true]]);

    const older = { ...doc, sites: doc.sites.map((s: any) => ({ ...s, name: `${s.name} older` })), commands: doc.commands.map(({ safeToRepeat: _s, setsUpDevice: _u, ...c }: any) => c) };
    const fresh = await createTeamWithRoles('marks-older');
    expectOk(await fresh.members.owner.post('/api/import', { document: older, apply: true }), 201);
    const again = expectOk(await fresh.members.owner.get('/api/export'));
    expect(again.commands.map((c: any) => [c.safeToRepeat, c.setsUpDevice])).toEqual([[false, false], [false, false]]);

    const both = { ...doc, commands: doc.commands.map((c: any) => ({ ...c, movesMachinery: true })) };
    const refused = await fresh.members.owner.post('/api/import', { document: both });
    expect(refused.status).toBe(422);
  });
});
