/**
 * Value presets through the server: kept with a command, checked against its template, in its history and
 * exports, and on the field card with PLC string, hex and time on the wire. Bytes worked out by hand in the demo
 * jog syntax (`1!JOG:` + angle × 100 with its sign + CR): 1° → `1!JOG:+100` + CR, 11 bytes; at 19200 bit/s with
 * 10 bits per character, 11 × 10 / 19200 s = 5.729 ms (checked with Python).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk } from './vault-fixtures';
import { jogTemplate, makeCommand, makeDevice } from './command-fixtures';

let team: TeamFixture;
let eng: TestClient;
beforeAll(async () => {
  team = await createTeamWithRoles('command-presets');
  eng = team.members.engineer;
}, 60_000);

const presets = [{ name: 'Jog 1° one way', values: { angle: 1 } }, { name: 'Jog 2° the other way', values: { angle: -2 } }];

describe('value presets', () => {
  it('are kept with a command, listed on its field card with PLC string, hex and time on the wire, and kept in its history', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id }, { fieldValues: { angle: 5 }, portName: 'Service', presets });
    expect(c.presets).toEqual(presets);
    const card = String((await team.members.viewer.get(`/field/devices/${d.id}`)).body);
    for (const text of ['As saved', 'Jog 1° one way', 'Jog 2° the other way', "'1!JOG:+500$0D'", "'1!JOG:+100$0D'", "'1!JOG:-200$0D'", '31 21 4A 4F 47 3A 2D 32 30 30 0D']) {
      expect(card, text).toContain(text);
    }
    expect(card).toContain('11 bytes · 5.729 ms on the wire (Service, 19200 8-N-1)');

    const renamed = expectOk(await eng.patch(`/api/commands/${c.id}`, { version: c.version, presets: [{ name: 'Index', values: { angle: 45 } }] }));
    expect(renamed.presets).toEqual([{ name: 'Index', values: { angle: 45 } }]);
    const history = expectOk(await eng.get(`/api/commands/${c.id}/revisions`));
    const first = history.items.find((r: { version: number }) => r.version === 1);
    const back = expectOk(await eng.post(`/api/commands/${c.id}/restore`, { revisionId: first.id, version: renamed.version }));
    expect(back.command?.presets ?? back.presets).toEqual(presets);
  });

  it('refuse values that do not fit the template, two of one name, and a new template the saved presets no longer fit; nothing changes', async () => {
    const c = await makeCommand(eng, undefined, { presets });
    const tooFar = await eng.patch(`/api/commands/${c.id}`, { version: c.version, presets: [{ name: 'Far', values: { angle: 400 } }] });
    expect(tooFar.status).toBe(422);
    expect(tooFar.body.fields).toEqual({ 'presets.0.values.angle': 'Preset "Far": At most 360 °.' });
    const twice = await eng.patch(`/api/commands/${c.id}`, { version: c.version, presets: [{ name: 'Jog', values: {} }, { name: 'JOG', values: {} }] });
    expect(twice.status).toBe(422);
    expect(twice.body.fields['presets.1.name']).toMatch(/already named/);
    // A narrower angle field: the saved 2° preset no longer fits.
    const narrow = jogTemplate();
    (narrow.segments[1] as { min: number; max: number }).min = -1;
    (narrow.segments[1] as { min: number; max: number }).max = 1;
    const res = await eng.patch(`/api/commands/${c.id}`, { version: c.version, template: narrow });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatch(/Preset "Jog 2° the other way": At least -1 °\. Change the preset with the template, or remove it\./);
    const now = expectOk(await eng.get(`/api/commands/${c.id}`));
    expect(now.version).toBe(c.version);
    expect(now.presets).toEqual(presets);
    // Both at once is fine.
    expectOk(await eng.patch(`/api/commands/${c.id}`, { version: c.version, template: narrow, presets: [presets[0]] }));
  });

  it('travel in the JSON export and import', async () => {
    const d = await makeDevice(eng);
    await makeCommand(eng, { deviceId: d.id }, { name: 'Preset carrier', presets });
    const doc = expectOk(await eng.get('/api/export'));
    const exported = doc.commands.find((c: { name: string }) => c.name === 'Preset carrier');
    expect(exported.presets).toEqual(presets);
    const other = await createTeamWithRoles('command-presets-into');
    expectOk(await other.members.owner.post('/api/import', { document: doc, apply: true }), 201);
    const again = expectOk(await other.members.owner.get('/api/export'));
    expect(again.commands.find((c: { name: string }) => c.name === 'Preset carrier').presets).toEqual(presets);
    // An export made before presets existed imports with none.
    const old = { ...doc, commands: doc.commands.map(({ presets: _p, ...c }: Record<string, unknown>) => c) };
    const third = await createTeamWithRoles('command-presets-old');
    expectOk(await third.members.owner.post('/api/import', { document: old, apply: true }), 201);
    expect(expectOk(await third.members.owner.get('/api/export')).commands.every((c: { presets: unknown[] }) => c.presets.length === 0)).toBe(true);
  });
});

describe('duplicating a command', () => {
  it('on its own device gives it a name of its own, with its presets and a history of its own', async () => {
    const d = await makeDevice(eng);
    const c = await makeCommand(eng, { deviceId: d.id }, { name: 'Index', presets });
    const one = expectOk(await eng.post(`/api/commands/${c.id}/copy`, { deviceId: d.id }), 201);
    const two = expectOk(await eng.post(`/api/commands/${c.id}/copy`, { deviceId: d.id }), 201);
    const three = expectOk(await eng.post(`/api/commands/${one.id}/copy`, { deviceId: d.id }), 201);
    expect([one.name, two.name, three.name]).toEqual(['Index (copy)', 'Index (copy 2)', 'Index (copy 3)']);
    expect(one.presets).toEqual(presets);
    expect(one.owner).toMatchObject({ kind: 'device', id: d.id });
    const listed = expectOk(await eng.get(`/api/commands?deviceId=${d.id}`)).items.map((i: { name: string }) => i.name);
    expect([...listed].sort()).toEqual(['Index', 'Index (copy 2)', 'Index (copy 3)', 'Index (copy)']);
    const history = expectOk(await eng.get(`/api/commands/${one.id}/revisions`)).items;
    expect(history).toHaveLength(1);
    expect(history[0].summary).toMatch(/Copied from/);
    // A name given is kept.
    expect(expectOk(await eng.post(`/api/commands/${c.id}/copy`, { deviceId: d.id, name: 'Index, slow' }), 201).name).toBe('Index, slow');
  });
});

describe('saving with error findings', () => {
  it('is recorded in the command history and told in the answer; a clean save says nothing of findings', async () => {
    // A four-character angle field: 30° × 100 with its sign is "+3000", five characters (field-too-wide, an error).
    const narrow = jogTemplate();
    (narrow.segments[1] as Record<string, unknown>).width = 4;
    const c = await makeCommand(eng, undefined, { template: narrow, fieldValues: { angle: 30 } });
    expect(c.savedWithErrors).toEqual(['field-too-wide']);
    const fixed = expectOk(await eng.patch(`/api/commands/${c.id}`, { version: c.version, fieldValues: { angle: 2 } }));
    expect(fixed.savedWithErrors).toBeUndefined();
    const again = expectOk(await eng.patch(`/api/commands/${c.id}`, { version: fixed.version, fieldValues: { angle: 30 } }));
    expect(again.savedWithErrors).toEqual(['field-too-wide']);
    const summaries = expectOk(await eng.get(`/api/commands/${c.id}/revisions`)).items.map((r: { summary: string }) => r.summary);
    expect(summaries[0]).toMatch(/ · saved with an error finding \(field-too-wide\)$/);
    expect(summaries[1]).not.toMatch(/saved with/);
    expect(summaries[2]).toMatch(/^Created command .* · saved with an error finding \(field-too-wide\)$/);
  });
});

describe("the machine's PLC STRING length", () => {
  it('is kept on the machine (with history and export), refused when not a whole number of 1 or more, and measures its devices\' commands in the composer', async () => {
    const d = await makeDevice(eng);
    const m = expectOk(await eng.get(`/api/machines/${d.machineId}`));
    for (const bad of [0, 2.5, -1, 70000]) {
      const res = await eng.patch(`/api/machines/${m.id}`, { version: m.version, plcStringCapacity: bad });
      expect(res.status, String(bad)).toBe(422);
      expect(res.body.fields.plcStringCapacity).toBeTruthy();
    }
    const set = expectOk(await eng.patch(`/api/machines/${m.id}`, { version: m.version, plcStringCapacity: 10 }));
    expect(set.plcStringCapacity).toBe(10);
    expect(expectOk(await eng.get('/api/export')).machines.find((x: { id: string }) => x.id === m.id).plcStringCapacity).toBe(10);
    // `1!JOG:+100` + CR is 11 characters: one more than the STRING holds.
    const c = await makeCommand(eng, { deviceId: d.id });
    const page = String((await eng.get(`/vault/devices/${d.id}/commands/${c.id}`)).body);
    expect(page).toMatch(/data-testid="plc-string-fit"[^>]*><b>11<\/b> of the <b>10<\/b> characters/);
    expect(page).toContain('plc-string-too-long');
  });
});
