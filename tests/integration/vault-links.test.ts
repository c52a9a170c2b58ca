/** Link checks on save and view, copy settings (preview, apply, stale), profiles. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, rs485 } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('vault-links');
  eng = team.members.engineer;
}, 60_000);

async function busDevice(machineId: string, tag: string, settings: Record<string, unknown>) {
  return expectOk(await eng.post('/api/devices', { machineId, tag, role: 'drive', ports: [{ name: 'RS-485', settings: rs485(settings) }] }), 201);
}

describe('links', () => {
  it('finds a drive at the wrong baud on a bus, names the end to change, and turns green once fixed', async () => {
    const m = await makeMachine(eng);
    const plc = await busDevice(m.id, 'PLC-1', { nodeAddress: null, termination: true, bias: true });
    const d1 = await busDevice(m.id, 'DRV-1', { nodeAddress: 1 });
    const d2 = await busDevice(m.id, 'DRV-2', { nodeAddress: 2, baud: 19200, termination: true });
    const link = expectOk(
      await eng.post('/api/links', {
        machineId: m.id, name: 'Drive bus', kind: 'rs485-bus', cableLengthM: 60,
        members: [{ portId: plc.ports[0].id, role: 'master' }, { portId: d1.ports[0].id, role: 'slave' }, { portId: d2.ports[0].id, role: 'slave' }],
      }),
      201,
    );
    expect(link.report.state).toBe('error');
    const baud = link.report.findings.find((f: any) => f.code === 'baud-mismatch');
    expect(baud).toMatchObject({ memberId: d2.ports[0].id, memberLabel: 'DRV-2 RS-485' });
    expect(baud.message).toContain('9600');

    const onMachine = expectOk(await eng.get(`/api/links?machineId=${m.id}`));
    expect(onMachine.items[0]).toMatchObject({ id: link.id });
    expect(onMachine.items[0].report.state).toBe('error');

    const port = d2.ports[0];
    expectOk(await eng.patch(`/api/ports/${port.id}`, { version: port.version, settings: rs485({ nodeAddress: 2, baud: 9600, termination: true }) }));
    const viewed = expectOk(await eng.get(`/api/links/${link.id}`));
    expect(viewed.report.findings).toEqual([]);
    expect(viewed.report.state).toBe('ok');
  });

  it('flags duplicate addresses and an empty link, and keeps trashed members out of the check', async () => {
    const m = await makeMachine(eng);
    const a = await busDevice(m.id, 'SCL-1', { nodeAddress: 5 });
    const b = await busDevice(m.id, 'SCL-2', { nodeAddress: 5 });
    const link = expectOk(await eng.post('/api/links', { machineId: m.id, name: 'Scales', kind: 'rs485-bus', members: [{ portId: a.ports[0].id, role: 'master' }, { portId: b.ports[0].id, role: 'slave' }] }), 201);
    expect(link.report.findings.map((f: any) => f.code)).not.toContain('too-few-members');
    expectOk(await eng.del(`/api/devices/${b.id}`));
    const after = expectOk(await eng.get(`/api/links/${link.id}`));
    expect(after.report.findings.map((f: any) => f.code)).toEqual(expect.arrayContaining(['member-in-trash', 'too-few-members']));
    const empty = expectOk(await eng.post('/api/links', { machineId: m.id, name: 'Spare', kind: 'point-to-point' }), 201);
    expect(empty.report.state).toBe('warning');
  });

  it('records member changes in the link history', async () => {
    const m = await makeMachine(eng);
    const a = await busDevice(m.id, 'A', {});
    const b = await busDevice(m.id, 'B', { nodeAddress: 2 });
    const link = expectOk(await eng.post('/api/links', { machineId: m.id, name: 'P2P', kind: 'point-to-point', members: [{ portId: a.ports[0].id, role: 'peer' }] }), 201);
    const upd = expectOk(await eng.patch(`/api/links/${link.id}`, { version: 1, members: [{ portId: a.ports[0].id, role: 'peer' }, { portId: b.ports[0].id, role: 'peer' }] }));
    expect(upd.members).toHaveLength(2);
    const hist = expectOk(await eng.get(`/api/revisions?entityType=link&entityId=${link.id}`));
    expect(hist.items[0].changes.map((c: any) => c.field)).toContain('members');
  });
});

describe('copy settings', () => {
  it('previews the differences, applies them as revisions (a technician may), and keeps the target’s address', async () => {
    const src = await makeDevice(eng, undefined, { ports: [{ name: 'RS-485', settings: rs485({ baud: 38400, parity: 'odd', nodeAddress: 9 }) }] });
    const dst = await makeDevice(eng, undefined, { ports: [{ name: 'RS-485', settings: rs485({ nodeAddress: 3 }) }] });
    const tech = team.members.technician;
    const body = { source: { kind: 'device', id: src.id }, target: { kind: 'device', id: dst.id } };
    const preview = expectOk(await tech.post('/api/devices/copy', body));
    expect(preview.applied).toBe(false);
    const fields = preview.pairs[0].changes.map((c: any) => c.field);
    expect(fields).toEqual(expect.arrayContaining(['settings.baud', 'settings.parity']));
    expect(fields).not.toContain('settings.nodeAddress');
    expect(expectOk(await eng.get(`/api/ports/${dst.ports[0].id}`)).settings.baud).toBe(9600);

    const basedOn = { [preview.pairs[0].targetPortId]: preview.pairs[0].targetVersion };
    const applied = expectOk(await tech.post('/api/devices/copy', { ...body, apply: true, basedOn }));
    expect(applied.applied).toBe(true);
    const port = expectOk(await eng.get(`/api/ports/${dst.ports[0].id}`));
    expect(port.settings).toMatchObject({ baud: 38400, parity: 'odd', nodeAddress: 3 });
    expect(port.version).toBe(2);
    const hist = expectOk(await eng.get(`/api/revisions?entityType=port&entityId=${port.id}`));
    expect(hist.items[0]).toMatchObject({ action: 'copy' });

    const stale = await tech.post('/api/devices/copy', { source: { kind: 'port', id: src.ports[0].id }, target: { kind: 'port', id: port.id }, includeAddress: true, apply: true, basedOn });
    expect(stale.status).toBe(409);
    expect(stale.body.current.pairs[0].targetVersion).toBe(2);
    expect(expectOk(await eng.get(`/api/ports/${port.id}`)).settings.nodeAddress).toBe(3);
  });

  it('refuses copying onto itself, unknown fields and a viewer', async () => {
    const d = await makeDevice(eng);
    const self = await eng.post('/api/devices/copy', { source: { kind: 'device', id: d.id }, target: { kind: 'device', id: d.id } });
    expect(self.status).toBe(422);
    expect(self.body.fields.target).toBeTruthy();
    expect((await eng.post('/api/devices/copy', { source: { kind: 'device', id: d.id }, target: { kind: 'rack', id: d.id } })).status).toBe(422);
    expect((await eng.post('/api/devices/copy', { source: { kind: 'device', id: d.id }, target: { kind: 'port', id: d.ports[0].id }, apply: true })).status).toBe(422);
    expect((await team.members.viewer.post('/api/devices/copy', { source: { kind: 'device', id: d.id }, target: { kind: 'device', id: d.id } })).status).toBe(403);
  });
});

describe('profiles', () => {
  it('saves a device as a profile (addresses cleared) and creates a device from it', async () => {
    const d = await makeDevice(eng);
    const prof = expectOk(await eng.post(`/api/devices/${d.id}/profile`, { name: 'Quillmoor QD-40 drive' }), 201);
    expect(prof).toMatchObject({ role: 'drive', maker: 'Quillmoor', model: 'QD-40' });
    expect(prof.ports).toHaveLength(2);
    expect(prof.ports[0].settings.nodeAddress).toBeNull();
    const m = await makeMachine(eng);
    const made = expectOk(await eng.post('/api/devices', { machineId: m.id, tag: 'DRV-9', profileId: prof.id }), 201);
    expect(made).toMatchObject({ profileId: prof.id, role: 'drive', maker: 'Quillmoor' });
    expect(made.ports.map((p: any) => p.shorthand)).toEqual(['9600 8-E-1', '19200 8-N-1']);
    expect(expectOk(await eng.get(`/api/profiles/${prof.id}`)).deviceCount).toBe(1);
    const bad = await eng.post(`/api/devices/${d.id}/profile`, { name: '' });
    expect(bad.status).toBe(422);
    const missing = await eng.post('/api/devices', { machineId: m.id, tag: 'DRV-10', profileId: 'prof_nope' });
    expect(missing.status).toBe(404);
  });
});
