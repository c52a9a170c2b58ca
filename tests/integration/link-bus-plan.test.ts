/**
 * The bus plan a link keeps (`busPlan`, and each member's `dropM` / `tapPorts`): saved through the link's route with
 * its version, checked against the link's members and their libraries, kept in history, moved to the trash and
 * back with the link, exported and imported with it, and shown on the bus page by role.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { withoutIds } from '../../src/lib/field/export-check';
import { expectOk, makeMachine, makeProfile, makeSite, rs485 } from './vault-fixtures';
import { makeCommand } from './command-fixtures';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('bus-plan');
  eng = team.members.engineer;
}, 60_000);

async function bus(c: TestClient, machineId?: string) {
  machineId ??= (await makeMachine(c)).id;
  const device = async (tag: string, settings: Record<string, unknown>, extra: Record<string, unknown> = {}) =>
    expectOk(await c.post('/api/devices', { machineId, tag, role: 'drive', ports: [{ name: 'RS-485', settings: rs485(settings) }], ...extra }), 201);
  const profile = await makeProfile(c);
  const plc = await device('PLC-1', { nodeAddress: null, termination: true, bias: true, responseTimeoutMs: 50 });
  const d1 = await device('DRV-1', { nodeAddress: 1 }, { profileId: profile.id });
  const d2 = await device('DRV-2', { nodeAddress: 2, termination: true, turnaroundDelayMs: 60 });
  const spare = await device('DRV-9', { nodeAddress: 9 });
  const link = expectOk(await c.post('/api/links', {
    machineId, name: 'Drive bus', kind: 'rs485-bus', cableLengthM: 45,
    members: [{ portId: plc.ports[0].id, role: 'master', isEnd: true }, { portId: d1.ports[0].id, role: 'slave' }, { portId: d2.ports[0].id, role: 'slave', isEnd: true }],
  }), 201);
  return { machineId, profile, plc, d1, d2, spare, link };
}

const read10 = (portId: string, responseMs: number) => ({ portId, label: 'read 10 registers', requestBytes: 8, replyBytes: 25, responseMs, perCycle: 1 });
const members = (b: Awaited<ReturnType<typeof bus>>, drops: [number | null, number | null][]) =>
  [[b.plc, 'master', true], [b.d1, 'slave', null], [b.d2, 'slave', true]].map(([d, role, isEnd], i) => ({
    portId: (d as any).ports[0].id, role, isEnd, unitLoads: null, dropM: drops[i]![0], tapPorts: drops[i]![1],
  }));

describe('saving and loading the bus plan', () => {
  it('keeps the plan and the drops, answers them on read, and keeps the drops when the members table saves without them', async () => {
    const b = await bus(eng);
    expect(b.link.busPlan).toBeNull();
    expect(b.link.members.map((m: any) => [m.dropM, m.tapPorts])).toEqual([[null, null], [null, null], [null, null]]);
    const cmd = await makeCommand(eng, { deviceId: b.d1.id });
    const busPlan = { polls: [{ ...read10(b.d1.ports[0].id, 5), commandId: cmd.id, replyBytes: 0, responseMs: undefined }, read10(b.d2.ports[0].id, 60)], targetCycleMs: 250, topology: 'trunk-and-drops' };
    const saved = expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan, members: members(b, [[0, null], [12.5, 2], [3, null]]) }));
    expect(saved.version).toBe(2);
    const read = expectOk(await eng.get(`/api/links/${b.link.id}`));
    expect(read.busPlan).toEqual({
      polls: [
        { portId: b.d1.ports[0].id, commandId: cmd.id, label: 'read 10 registers', requestBytes: 8, replyBytes: 0, perCycle: 1 },
        { portId: b.d2.ports[0].id, label: 'read 10 registers', requestBytes: 8, replyBytes: 25, responseMs: 60, perCycle: 1 },
      ],
      targetCycleMs: 250, topology: 'trunk-and-drops',
    });
    expect(read.members.map((m: any) => [m.dropM, m.tapPorts])).toEqual([[0, null], [12.5, 2], [3, null]]);

    // The members table sends no drops: they stay (a member it adds has none).
    const rolesOnly = [...read.members.map(({ portId, role, isEnd, unitLoads }: any) => ({ portId, role, isEnd, unitLoads })), { portId: b.spare.ports[0].id, role: 'slave' }];
    const after = expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 2, members: rolesOnly }));
    expect(after.members.map((m: any) => [m.dropM, m.tapPorts])).toEqual([[0, null], [12.5, 2], [3, null], [null, null]]);
    expect(after.busPlan).toEqual(read.busPlan);

    // null clears the plan; a drop sent as null clears that drop.
    const cleared = expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 3, busPlan: null, members: [{ ...rolesOnly[0], dropM: null }, ...rolesOnly.slice(1)] }));
    expect(cleared.busPlan).toBeNull();
    expect(cleared.members.map((m: any) => m.dropM)).toEqual([null, 12.5, 3, null]);
  });

  it('takes a command of the member device\'s profile, and a plan given when the link is created', async () => {
    const b = await bus(eng);
    const fromProfile = await makeCommand(eng, { profileId: b.profile.id });
    const poll = { ...read10(b.d1.ports[0].id, 5), commandId: fromProfile.id };
    expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan: { polls: [poll] } }));
    const created = expectOk(await eng.post('/api/links', {
      machineId: b.machineId, name: 'Second bus', kind: 'rs485-bus',
      members: [{ portId: b.plc.ports[0].id, role: 'master' }, { portId: b.d1.ports[0].id, role: 'slave', dropM: 4 }], busPlan: { polls: [poll] },
    }), 201);
    expect(created.busPlan.polls[0].commandId).toBe(fromProfile.id);
    expect(created.members[1].dropM).toBe(4);
  });
});

describe('refused plans (422, nothing written)', () => {
  it('refuses a poll of a port that is not a member, a command of another device, a trashed command, and bad numbers', async () => {
    const b = await bus(eng);
    const other = await makeCommand(eng, { deviceId: b.d2.id });
    const trashed = await makeCommand(eng, { deviceId: b.d1.id });
    expectOk(await eng.del(`/api/commands/${trashed.id}?version=${trashed.version}`));
    const refuse = async (busPlan: unknown, extra: Record<string, unknown> = {}) => {
      const res = await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan, ...extra });
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      return res.body.fields as Record<string, string>;
    };

    expect(await refuse({ polls: [read10(b.d1.ports[0].id, 5), read10(b.spare.ports[0].id, 5)] }))
      .toEqual({ 'busPlan.polls.1.portId': 'That port is not a member of this link; add it to the members first.' });
    const notInLibrary = "That command is not in the library of this member's device; choose one of its commands or type the byte counts.";
    expect(await refuse({ polls: [{ ...read10(b.d1.ports[0].id, 5), commandId: other.id }] })).toEqual({ 'busPlan.polls.0.commandId': notInLibrary });
    expect(await refuse({ polls: [{ ...read10(b.d1.ports[0].id, 5), commandId: trashed.id }] })).toEqual({ 'busPlan.polls.0.commandId': notInLibrary });
    expect(await refuse({ polls: [{ ...read10(b.d1.ports[0].id, 5), commandId: 'cmd_nope' }] })).toEqual({ 'busPlan.polls.0.commandId': notInLibrary });
    // A member removed in the same save no longer counts.
    expect(await refuse({ polls: [read10(b.d2.ports[0].id, 5)] }, { members: [{ portId: b.plc.ports[0].id, role: 'master' }, { portId: b.d1.ports[0].id, role: 'slave' }] }))
      .toHaveProperty(['busPlan.polls.0.portId']);

    const fields = await refuse({ polls: [{ ...read10(b.d1.ports[0].id, 5), requestBytes: 0, device: 'DRV-1' }], retries: -1 });
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(['busPlan.polls.0', 'busPlan.retries']));
    expect(await refuse({ polls: [] })).toEqual({ 'busPlan.polls': 'List at least one poll' });
    const drop = await eng.patch(`/api/links/${b.link.id}`, { version: 1, members: [{ portId: b.plc.ports[0].id, role: 'master', dropM: -1, tapPorts: 0 }] });
    expect(drop.status).toBe(422);
    expect(drop.body.fields).toEqual({ 'members.0.dropM': 'A drop cannot be negative', 'members.0.tapPorts': 'A tap has at least 1 port' });

    const now = expectOk(await eng.get(`/api/links/${b.link.id}`));
    expect(now).toMatchObject({ version: 1, busPlan: null });
    expect(now.members).toHaveLength(3);
  });
});

describe('versions and history', () => {
  it('answers a stale save with 409 and the link as it is, and keeps each plan in the history', async () => {
    const b = await bus(eng);
    const first = { polls: [read10(b.d1.ports[0].id, 5), read10(b.d2.ports[0].id, 60)] };
    expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan: first }));
    expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 2, busPlan: { ...first, targetCycleMs: 100 } }));

    const stale = await team.members.admin.patch(`/api/links/${b.link.id}`, { version: 2, busPlan: { ...first, responseTimeoutMs: 90 } });
    expect(stale.status).toBe(409);
    expect(stale.body.current).toMatchObject({ version: 3, busPlan: { targetCycleMs: 100 } });
    expect(expectOk(await eng.get(`/api/links/${b.link.id}`)).busPlan).not.toHaveProperty('responseTimeoutMs');

    const hist = expectOk(await eng.get(`/api/revisions?entityType=link&entityId=${b.link.id}`));
    expect(hist.items.map((r: any) => r.changes.map((c: any) => c.field))).toEqual([['busPlan.targetCycleMs'], ['busPlan'], expect.any(Array)]);
    expect(hist.items[1].changes[0]).toMatchObject({ from: null, to: first });
    expect(hist.items[0].snapshot.busPlan).toEqual({ ...first, targetCycleMs: 100 });

    // Restoring the first plan's revision puts that plan back as a new version.
    expectOk(await eng.post(`/api/revisions/${hist.items[1].id}/restore`, { version: 3 }));
    expect(expectOk(await eng.get(`/api/links/${b.link.id}`))).toMatchObject({ version: 4, busPlan: first });
  });

  it('goes to the trash and comes back with the link, drops included', async () => {
    const b = await bus(eng);
    const busPlan = { polls: [read10(b.d2.ports[0].id, 60)], targetCycleMs: 250 };
    const saved = expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan, members: members(b, [[0, null], [2, 4], [0, null]]) }));
    expectOk(await eng.del(`/api/links/${b.link.id}?version=${saved.version}`));
    expect((await eng.get(`/api/links/${b.link.id}`)).status).toBe(404);
    expectOk(await eng.post(`/api/trash/link/${b.link.id}`));
    const back = expectOk(await eng.get(`/api/links/${b.link.id}`));
    expect(back.busPlan).toEqual(busPlan);
    expect(back.members.map((m: any) => [m.dropM, m.tapPorts])).toEqual([[0, null], [2, 4], [0, null]]);
  });
});

describe('export and import', () => {
  it('exports the plan and the drops with the link, and imports them with member ports and commands mapped', async () => {
    const source = await createTeamWithRoles('bus-plan-export');
    const target = await createTeamWithRoles('bus-plan-import');
    const c = source.members.engineer;
    const site = await makeSite(c);
    const b = await bus(c, (await makeMachine(c, site.id)).id);
    const own = await makeCommand(c, { deviceId: b.d1.id });
    const fromProfile = await makeCommand(c, { profileId: b.profile.id });
    const busPlan = { polls: [{ ...read10(b.d1.ports[0].id, 5), commandId: own.id, replyBytes: 0, responseMs: undefined }, { ...read10(b.d1.ports[0].id, 5), commandId: fromProfile.id }, read10(b.d2.ports[0].id, 60)], responseTimeoutMs: 80 };
    expectOk(await c.patch(`/api/links/${b.link.id}`, { version: 1, busPlan, members: members(b, [[0, null], [12.5, 2], [null, null]]) }));

    const first = expectOk(await c.get(`/api/export?siteId=${site.id}`));
    const exported = first.links.find((l: any) => l.id === b.link.id);
    expect(exported.busPlan.polls.map((p: any) => [p.portId, p.commandId])).toEqual([[b.d1.ports[0].id, own.id], [b.d1.ports[0].id, fromProfile.id], [b.d2.ports[0].id, undefined]]);
    expect(exported.members.map((m: any) => [m.dropM, m.tapPorts])).toEqual([[0, null], [12.5, 2], [null, null]]);

    expectOk(await target.members.engineer.post('/api/import', { document: first, apply: true }), 201);
    const importedSite = expectOk(await target.members.engineer.get('/api/sites?pageSize=5')).items[0];
    const second = expectOk(await target.members.engineer.get(`/api/export?siteId=${importedSite.id}`));
    expect(withoutIds(second)).toEqual(withoutIds(first));
    const link = expectOk(await target.members.engineer.get(`/api/links/${second.links[0].id}`));
    const ports = link.members.map((m: any) => m.portId);
    expect(link.busPlan.polls.map((p: any) => p.portId)).toEqual([ports[1], ports[1], ports[2]]);
    expect(link.busPlan.polls[0].commandId).not.toBe(own.id);
    const commands = second.commands.map((x: any) => x.id);
    expect(commands).toEqual(expect.arrayContaining([link.busPlan.polls[0].commandId, link.busPlan.polls[1].commandId]));
    const rev = expectOk(await target.members.engineer.get(`/api/revisions?entityType=link&entityId=${link.id}`)).items[0];
    expect(rev.snapshot.busPlan).toEqual(link.busPlan);
  });

  it('refuses a document whose plan asks a port that is not a member, or names a command of another device', async () => {
    const c = team.members.owner;
    const site = await makeSite(c);
    const b = await bus(c, (await makeMachine(c, site.id)).id);
    const other = await makeCommand(c, { deviceId: b.d2.id });
    expectOk(await c.patch(`/api/links/${b.link.id}`, { version: 1, busPlan: { polls: [read10(b.d1.ports[0].id, 5)] } }));
    const doc = expectOk(await c.get(`/api/export?siteId=${site.id}`));
    const withPoll = (poll: Record<string, unknown>) => ({ ...doc, links: doc.links.map((l: any) => ({ ...l, busPlan: { polls: [{ ...l.busPlan.polls[0], ...poll }] } })) });
    const fresh = await createTeamWithRoles('bus-plan-bad-import');
    const notMember = await fresh.members.engineer.post('/api/import', { document: withPoll({ portId: b.spare.ports[0].id }) });
    expect(notMember.status).toBe(422);
    expect(notMember.body.error).toContain('not a member of the link');
    const wrongCommand = await fresh.members.engineer.post('/api/import', { document: withPoll({ commandId: other.id }) });
    expect(wrongCommand.status).toBe(422);
    expect(wrongCommand.body.error).toContain('not in the library');
  });
});

describe('the bus page by role', () => {
  it('loads the saved plan; engineers and above get the save button, technicians and viewers read it', async () => {
    const b = await bus(eng);
    expectOk(await eng.patch(`/api/links/${b.link.id}`, { version: 1, busPlan: { polls: [read10(b.d1.ports[0].id, 5), read10(b.d2.ports[0].id, 60)], targetCycleMs: 250 } }));
    for (const role of ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const) {
      const page = await team.members[role].get(`/vault/links/${b.link.id}`);
      expect(page.status).toBe(200);
      const html = String(page.body);
      expect(html, role).toContain('The saved plan of this bus (link version 2).');
      // DRV-2 answers 60 ms after 3.5 characters (Modbus over Serial Line V1.02 §2.5.1.1); PLC-1 waits 50 ms
      expect(html, role).toContain('data-code="response-timeout-too-short"');
      expect(html.includes('Save the plan'), role).toBe(['owner', 'admin', 'engineer'].includes(role));
      expect(html.includes('You can read the plan'), role).toBe(['technician', 'viewer'].includes(role));
    }
  });
});
