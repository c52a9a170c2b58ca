/** Converters through the server: bridges on PATCH /api/devices/:id, link state across a bridge, export and import. */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeMachine, makeSite, rs485, uid } from './vault-fixtures';
import { withoutIds } from '../../src/lib/field/export-check';

let team: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  team = await createTeamWithRoles('converters');
  eng = team.members.engineer;
}, 60_000);

// common practice: a PLC RS-232 port for a converter switched by RTS, 9600 8-N-1, CTS not checked
const plcPort = { interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, rtsMode: 'transmit', ctsMode: 'ignore', rtsTailMs: 2, protocol: 'ascii' };
const line = { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, protocol: 'ascii' };

/** PLC ── converter (RS-232 ⇄ RS-485) ── one drive on a bus; the converter not yet bridged. */
async function chain(machineId: string) {
  const plc = expectOk(await eng.post('/api/devices', { machineId, tag: 'PLC-1', role: 'plc', ports: [{ name: 'X2', settings: plcPort }] }), 201);
  const cv = expectOk(await eng.post('/api/devices', {
    machineId, tag: 'CV-1', role: 'converter', maker: 'Hollinvar', model: 'HV-485R', serialNumber: 'HV-1',
    ports: [
      { name: 'RS-232', settings: { interface: 'rs232', ...line } },
      { name: 'RS-485', settings: rs485({ ...line, rs485Direction: 'auto', nodeAddress: null, termination: true, bias: true }) },
    ],
  }), 201);
  const drv = expectOk(await eng.post('/api/devices', { machineId, tag: 'DRV-1', role: 'drive', ports: [{ name: 'RS-485', settings: rs485({ ...line, nodeAddress: 1, termination: true }) }] }), 201);
  const toCv = expectOk(await eng.post('/api/links', { machineId, name: 'PLC to converter', kind: 'point-to-point', members: [{ portId: plc.ports[0].id, role: 'master' }, { portId: cv.ports[0].id, role: 'slave' }] }), 201);
  const bus = expectOk(await eng.post('/api/links', { machineId, name: 'Drive bus', kind: 'rs485-bus', members: [{ portId: cv.ports[1].id, role: 'master', isEnd: true }, { portId: drv.ports[0].id, role: 'slave', isEnd: true }] }), 201);
  return { plc, cv, drv, toCv, bus };
}

const codes = (l: { report: { findings: { code: string; memberLabel?: string }[] } }) => l.report.findings.map((f) => `${f.code}@${f.memberLabel ?? ''}`);

describe('bridges on a device', () => {
  it('refuses bridges that are not two of a converter\'s own live ports, with a message, and changes nothing', async () => {
    const m = await makeMachine(eng);
    const { cv, plc, drv } = await chain(m.id);
    const [a, b] = cv.ports.map((p: { id: string }) => p.id);
    const refuse = async (body: Record<string, unknown>, id = cv.id, version = cv.version) => {
      const res = await eng.patch(`/api/devices/${id}`, { version, ...body });
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      return res.body as { error: string; fields?: Record<string, string> };
    };
    expect((await refuse({ bridges: [[a, plc.ports[0].id]] })).fields!['bridges.0.1']).toMatch(/No live port with that id on this device/);
    expect((await refuse({ bridges: [[a, a]] })).error).toMatch(/two different ports/);
    expect((await refuse({ bridges: [[a, b], [b, a]] })).error).toMatch(/one bridge only/);
    expect((await refuse({ bridges: [a, b] })).error).toMatch(/pair of two port ids/);
    expect((await refuse({ bridges: [[drv.ports[0].id, drv.ports[0].id]] }, drv.id, drv.version)).error).toMatch(/two different ports/);
    const second = expectOk(await eng.post(`/api/ports`, { deviceId: drv.id, name: 'Service', settings: { interface: 'rs232' } }), 201);
    const notConverter = await refuse({ bridges: [[drv.ports[0].id, second.id]] }, drv.id, drv.version);
    expect(notConverter.fields!.bridges).toBe('Only a converter bridges its ports; set the role to Converter first (or send no bridges).');
    const unchanged = expectOk(await eng.get(`/api/devices/${cv.id}`));
    expect(unchanged).toMatchObject({ version: cv.version, bridges: [] });

    const bridged = expectOk(await eng.patch(`/api/devices/${cv.id}`, { version: cv.version, bridges: [[a, b]] }));
    expect(bridged).toMatchObject({ version: cv.version + 1, bridges: [[a, b]] });
    const roleChange = await refuse({ role: 'other' }, cv.id, bridged.version);
    expect(roleChange.fields!.role).toMatch(/remove its bridges before changing its role/);
    const cleared = expectOk(await eng.patch(`/api/devices/${cv.id}`, { version: bridged.version, bridges: [], role: 'other' }));
    expect(cleared).toMatchObject({ role: 'other', bridges: [] });
    const history = expectOk(await eng.get(`/api/revisions?entityType=device&entityId=${cv.id}`));
    expect(history.items.some((r: { changes: { field: string }[] }) => r.changes.some((c) => c.field === 'bridges'))).toBe(true);
  });

  it('a technician and a viewer cannot set bridges', async () => {
    const m = await makeMachine(eng);
    const { cv } = await chain(m.id);
    for (const who of ['technician', 'viewer'] as const) {
      const res = await team.members[who].patch(`/api/devices/${cv.id}`, { version: cv.version, bridges: [[cv.ports[0].id, cv.ports[1].id]] });
      expect(res.status).toBe(403);
    }
  });
});

describe('the link check across a converter', () => {
  it('an RS-232 PLC port reaches an RS-485 drive through a bridged converter: both links agree; a drive at another baud turns both red', async () => {
    const m = await makeMachine(eng);
    const { cv, drv, toCv, bus } = await chain(m.id);
    expect(toCv.report.state).toBe('ok');
    expect(bus.report.state).toBe('ok');
    expectOk(await eng.patch(`/api/devices/${cv.id}`, { version: cv.version, bridges: [[cv.ports[0].id, cv.ports[1].id]] }));
    const links = expectOk(await eng.get(`/api/links?machineId=${m.id}&pageSize=10`)).items;
    for (const l of links) expect(l.report, l.name).toEqual({ state: 'ok', findings: [] });
    const cvMember = links.find((l: { name: string }) => l.name === 'PLC to converter').members.find((x: { deviceId: string }) => x.deviceId === cv.id);
    expect(cvMember.bridge).toMatchObject({ deviceTag: 'CV-1', other: { portName: 'RS-485' }, beyond: [{ deviceTag: 'DRV-1', portName: 'RS-485' }] });

    expectOk(await eng.patch(`/api/ports/${drv.ports[0].id}`, { version: drv.ports[0].version, settings: rs485({ ...line, baud: 19200, nodeAddress: 1, termination: true }) }));
    const after = expectOk(await eng.get(`/api/links/${toCv.id}`));
    expect(after.report.state).toBe('error');
    const baud = after.report.findings.find((f: { code: string }) => f.code === 'baud-mismatch');
    expect(baud).toMatchObject({ memberId: drv.ports[0].id, memberLabel: 'DRV-1 RS-485 (through CV-1)' });
    expect(baud.message).toBe('DRV-1 RS-485 (through CV-1): set the baud rate to 9600 to match PLC-1 X2 (9600 8-N-1).');
    expect(codes(expectOk(await eng.get(`/api/links/${bus.id}`)))).toEqual(['baud-mismatch@DRV-1 RS-485']);
  });

  it('a converter switched by RTS needs the PLC to raise RTS while sending; without a converter the PLC still hears "put a converter"', async () => {
    const m = await makeMachine(eng);
    const { plc, cv, bus } = await chain(m.id);
    const bridged = expectOk(await eng.patch(`/api/devices/${cv.id}`, { version: cv.version, bridges: [[cv.ports[0].id, cv.ports[1].id]] }));
    const rs485Port = bridged.ports[1];
    expectOk(await eng.patch(`/api/ports/${rs485Port.id}`, { version: rs485Port.version, settings: rs485({ ...line, rtsMode: 'transmit', rs485Direction: 'rts', nodeAddress: null, termination: true, bias: true }) }));
    expect(expectOk(await eng.get(`/api/links/${bus.id}`)).report.state).toBe('ok');
    const p = plc.ports[0];
    expectOk(await eng.patch(`/api/ports/${p.id}`, { version: p.version, settings: { ...plcPort, rtsMode: 'off' } }));
    const red = expectOk(await eng.get(`/api/links/${bus.id}`));
    expect(codes(red)).toEqual(['no-direction-control@CV-1 RS-485']);
    expect(red.report.findings[0].message).toContain('but PLC-1 X2 does not raise RTS while sending (RTS: Always off)');

    const direct = expectOk(await eng.post('/api/links', { machineId: m.id, name: 'Straight to the drive', kind: 'point-to-point', members: [{ portId: p.id, role: 'master' }, { portId: expectOk(await eng.get(`/api/links/${bus.id}`)).members[1].portId, role: 'slave' }] }), 201);
    expect(codes(direct)).toContain('interface-mismatch@DRV-1 RS-485');
  });
});

describe('export and import keep bridges', () => {
  it('JSON round trip keeps a converter\'s bridges on the new port ids; CSV export names the port on the other side', async () => {
    const site = await makeSite(eng);
    const m = expectOk(await eng.post('/api/machines', { siteId: site.id, name: `Kiln ${uid()}` }), 201);
    const { cv } = await chain(m.id);
    expectOk(await eng.patch(`/api/devices/${cv.id}`, { version: cv.version, bridges: [[cv.ports[0].id, cv.ports[1].id]] }));
    const first = expectOk(await eng.get(`/api/export?siteId=${site.id}`));
    const exported = first.devices.find((d: { tag: string }) => d.tag === 'CV-1');
    expect(exported.bridges).toEqual([[cv.ports[0].id, cv.ports[1].id]]);
    expect(first.devices.find((d: { tag: string }) => d.tag === 'PLC-1').bridges).toEqual([]);

    const other = await createTeamWithRoles('converters-import');
    expectOk(await other.members.engineer.post('/api/import', { document: first, apply: true }), 201);
    const importedSite = expectOk(await other.members.engineer.get('/api/sites?pageSize=5')).items[0];
    const second = expectOk(await other.members.engineer.get(`/api/export?siteId=${importedSite.id}`));
    const copy = second.devices.find((d: { tag: string }) => d.tag === 'CV-1');
    const ports = second.ports.filter((p: { deviceId: string }) => p.deviceId === copy.id).map((p: { id: string }) => p.id);
    expect(copy.bridges).toEqual([ports]);
    expect(copy.bridges[0][0]).not.toBe(cv.ports[0].id);
    expect(withoutIds(second)).toEqual(withoutIds(first));
    const links = expectOk(await other.members.engineer.get('/api/links?pageSize=10')).items;
    expect(links.map((l: { report: { state: string } }) => l.report.state)).toEqual(['ok', 'ok']);

    // A bridge to a port outside the document, and a bridge on a device that is no converter, are refused.
    const bad = structuredClone(first);
    bad.devices.find((d: { tag: string }) => d.tag === 'CV-1').bridges = [[cv.ports[0].id, 'port_missing']];
    const refused = await eng.post('/api/import', { document: bad });
    expect(refused.status).toBe(422);
    expect((refused.body as { error: string }).error).toBe('document: device CV-1: bridged port port_missing is not one of its ports in the document');
    const notCv = structuredClone(first);
    notCv.devices.find((d: { tag: string }) => d.tag === 'CV-1').role = 'drive';
    expect((await eng.post('/api/import', { document: notCv })).body).toMatchObject({ error: 'document: device CV-1: only a converter bridges its ports, and its role is drive' });

    const csv = await eng.request('GET', `/api/export/csv?table=ports&machineId=${m.id}`);
    const lines = String(csv.body).replace(/^\ufeff/, '').trim().split('\r\n');
    const header = lines[0]!.split(',');
    const col = header.indexOf('bridgedTo');
    expect(col).toBeGreaterThan(0);
    const row = (port: string) => lines.find((l) => l.includes(`,CV-1,${port},`))!.split(',')[col];
    expect(row('RS-232')).toBe('RS-485');
    expect(row('RS-485')).toBe('RS-232');
  });

  it('CSV import: a "Bridged to" column bridges a converter\'s ports; one that names no port of the device is a row error', async () => {
    const m = await makeMachine(eng);
    const header = 'Tag,Role,Port,Settings,Interface,Bridged to\n';
    const mapping = { tag: 'Tag', role: 'Role', portName: 'Port', shorthand: 'Settings', interface: 'Interface', bridgedTo: 'Bridged to' };
    const csv = header + [
      'CV-9,converter,RS-232,9600 8-N-1,rs232,RS-485',
      'CV-9,converter,RS-485,9600 8-N-1,rs485,',
      'CV-8,converter,A,9600 8-N-1,rs232,Z',
      'DRV-9,drive,RS-485,9600 8-N-1,rs485,RS-232',
    ].join('\n');
    const preview = expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping }));
    expect(preview.errors).toEqual([
      { row: 5, column: 'Bridged to', message: 'Only a converter bridges its ports; set the role to converter or leave "Bridged to (a converter\'s other port)" empty.' },
      { row: 4, column: 'Bridged to', message: 'Device CV-8: port A is bridged to "Z", which is not another of its ports in this file.' },
    ]);
    expectOk(await eng.post('/api/import/csv', { machineId: m.id, csv, mapping, apply: true, skipInvalid: true }), 201);
    const list = expectOk(await eng.get(`/api/devices?machineId=${m.id}&sort=tag`)).items;
    const cv9 = expectOk(await eng.get(`/api/devices/${list.find((d: { tag: string }) => d.tag === 'CV-9').id}`));
    expect(cv9.bridges).toEqual([[cv9.ports[0].id, cv9.ports[1].id]]);
  });
});
