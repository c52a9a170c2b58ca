/**
 * Control lines on every port (docs/decisions/013) through the server: the new keys on create and update, the
 * 422 when they disagree with handshake or RS-485 direction, the keys derived for bodies in the older shape, JSON
 * export and import (a version-1 document without the keys included), the CSV round trip, the field card and the
 * link check's findings. Every expected value is written out by hand.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeSite } from './vault-fixtures';

let team: TeamFixture;
let eng: TestClient;
beforeAll(async () => {
  team = await createTeamWithRoles('control-lines');
  eng = team.members.engineer;
}, 60_000);

/** The PLC port of a typical drive set-up: 9600 8-N-1, CTS not checked, RTS on while sending with lead and tail. */
const plcPort = { interface: 'rs232', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, rtsMode: 'transmit', ctsMode: 'ignore', rtsLeadMs: 2, rtsTailMs: 2 };
const lineKeys = (s: Record<string, unknown>) => [s.handshake, s.rs485Direction, s.rtsMode, s.ctsMode, s.dtrMode, s.rtsLeadMs, s.rtsTailMs, s.echo];

describe('port settings with control lines', () => {
  it('creates and updates a port with the new keys; the older keys follow and the text names them', async () => {
    const d = await makeDevice(eng);
    const port = expectOk(await eng.post('/api/ports', { deviceId: d.id, name: 'X2', settings: plcPort }), 201);
    expect(lineKeys(port.settings)).toEqual(['none', 'rts', 'transmit', 'ignore', 'off', 2, 2, false]);
    expect(port.text.split('\n').slice(7, 14)).toEqual([
      'Handshake: None', 'RTS: On while sending', 'CTS: Not checked', 'DTR: Always off', 'RTS lead: 2 ms', 'RTS tail: 2 ms', 'Hears own transmission: no',
    ]);
    const updated = expectOk(await eng.patch(`/api/ports/${port.id}`, { version: 1, settings: { ...plcPort, rtsMode: 'flow', ctsMode: 'gate', rtsLeadMs: 0, rtsTailMs: 0, echo: true } }));
    expect(updated.version).toBe(2);
    expect(lineKeys(updated.settings)).toEqual(['rts-cts', 'none', 'flow', 'gate', 'off', 0, 0, true]);
    const history = expectOk(await eng.get(`/api/revisions?entityType=port&entityId=${port.id}`));
    expect(history.items[0].changes.map((c: { field: string }) => c.field).sort()).toEqual([
      'settings.ctsMode', 'settings.echo', 'settings.handshake', 'settings.rs485Direction', 'settings.rtsLeadMs', 'settings.rtsMode', 'settings.rtsTailMs',
    ]);
  });

  it('refuses keys that disagree with a message naming both, and changes nothing', async () => {
    const d = await makeDevice(eng);
    const bad = await eng.post('/api/ports', { deviceId: d.id, name: 'Bad', settings: { handshake: 'rts-cts', ctsMode: 'ignore' } });
    expect(bad.status).toBe(422);
    expect(bad.body.fields['settings.handshake']).toBe('handshake "rts-cts" disagrees with rtsMode "flow" and ctsMode "ignore" (which mean handshake "none"). Send the same choice in both, or only one of them.');
    const dir = await eng.patch(`/api/ports/${d.ports[0].id}`, { version: 1, settings: { interface: 'rs485-2w', rs485Direction: 'auto', rtsMode: 'transmit' } });
    expect(dir.status).toBe(422);
    expect(dir.body.fields['settings.rs485Direction']).toMatch(/^rs485Direction "auto" disagrees with rtsMode "transmit"/);
    const both = await eng.post('/api/devices', { machineId: d.machineId, tag: 'CL-BOTH', ports: [{ name: 'P', settings: { handshake: 'rts-cts', rs485Direction: 'rts' } }] });
    expect(both.status).toBe(422);
    expect(both.body.fields['ports.0.settings.handshake']).toMatch(/RTS does one or the other, not both/);
    const after = expectOk(await eng.get(`/api/devices/${d.id}`));
    expect(after.ports.map((p: { name: string }) => p.name)).toEqual(['RS-485', 'Service']);
    expect(after.ports[0].version).toBe(1);
  });

  it('derives the control lines for bodies in the older shape: ports, devices and profiles', async () => {
    const m = await makeMachine(eng);
    const d = await makeDevice(eng, m.id, { ports: [
      { name: 'Flow', settings: { handshake: 'rts-cts' } },
      { name: 'Bus', settings: { interface: 'rs485-2w', rs485Direction: 'rts' } },
      { name: 'DTR', settings: { handshake: 'dtr-dsr' } },
    ] });
    expect(d.ports.map((p: { settings: Record<string, unknown> }) => lineKeys(p.settings))).toEqual([
      ['rts-cts', 'none', 'flow', 'gate', 'off', 0, 0, false],
      ['none', 'rts', 'transmit', 'ignore', 'off', 0, 0, false],
      ['dtr-dsr', 'none', 'off', 'ignore', 'flow', 0, 0, false],
    ]);
    const profile = expectOk(await eng.post('/api/profiles', { name: 'Old shape', ports: [{ name: 'COM', settings: { handshake: 'xon-xoff' } }] }), 201);
    expect(lineKeys(profile.ports[0].settings)).toEqual(['xon-xoff', 'none', 'off', 'ignore', 'off', 0, 0, false]);
    // Only the new keys: the older ones follow.
    const p = expectOk(await eng.post('/api/ports', { deviceId: d.id, name: 'New', settings: { dtrMode: 'flow', echo: true } }), 201);
    expect(lineKeys(p.settings)).toEqual(['dtr-dsr', 'none', 'off', 'ignore', 'flow', 0, 0, true]);
  });
});

describe('exports and imports', () => {
  it('JSON: version 2 carries the keys and round-trips; a version-1 document without them imports with derived values', async () => {
    const site = await makeSite(eng);
    const m = await makeMachine(eng, site.id);
    await makeDevice(eng, m.id, { tag: 'CL-EXP', ports: [
      { name: 'X2', settings: { ...plcPort, echo: true } },
      { name: 'Flow', settings: { handshake: 'rts-cts' } },
      { name: 'Bus', settings: { interface: 'rs485-2w', rs485Direction: 'rts', rtsTailMs: 1.5 } },
    ] });
    const doc = expectOk(await eng.get(`/api/export?siteId=${site.id}`));
    expect(doc.version).toBe(2);
    expect(doc.ports.map((p: { settings: Record<string, unknown> }) => lineKeys(p.settings))).toEqual([
      ['none', 'rts', 'transmit', 'ignore', 'off', 2, 2, true],
      ['rts-cts', 'none', 'flow', 'gate', 'off', 0, 0, false],
      ['none', 'rts', 'transmit', 'ignore', 'off', 0, 1.5, false],
    ]);

    const other = await createTeamWithRoles('control-lines-import');
    const imported = expectOk(await other.members.engineer.post('/api/import', { document: doc, apply: true }), 201);
    expect(imported.counts.ports).toEqual({ create: 3, existing: 0 });
    const back = expectOk(await other.members.engineer.get('/api/export'));
    expect(back.ports.map((p: { settings: unknown }) => p.settings)).toEqual(doc.ports.map((p: { settings: unknown }) => p.settings));

    // The same document as a version-1 server wrote it: no control-line keys anywhere.
    const strip = ({ rtsMode, ctsMode, dtrMode, rtsLeadMs, rtsTailMs, echo, ...rest }: Record<string, unknown>) => rest;
    const v1 = { ...doc, version: 1, ports: doc.ports.map((p: { settings: Record<string, unknown> }) => ({ ...p, settings: strip(p.settings) })) };
    const third = await createTeamWithRoles('control-lines-v1');
    expectOk(await third.members.engineer.post('/api/import', { document: v1, apply: true }), 201);
    const fromV1 = expectOk(await third.members.engineer.get('/api/export'));
    expect(fromV1.ports.map((p: { settings: Record<string, unknown> }) => lineKeys(p.settings))).toEqual([
      ['none', 'rts', 'transmit', 'ignore', 'off', 0, 0, false],
      ['rts-cts', 'none', 'flow', 'gate', 'off', 0, 0, false],
      ['none', 'rts', 'transmit', 'ignore', 'off', 0, 0, false],
    ]);
    const v3 = await other.members.engineer.post('/api/import', { document: { ...doc, version: 3 } });
    expect(v3.status).toBe(422);
    expect(v3.body.error).toBe('document: version 3 is not supported; this server reads versions 1 and 2');
  });

  it('CSV: the ports export carries the control lines and imports back to the same settings', async () => {
    const m = await makeMachine(eng);
    const d = await makeDevice(eng, m.id, { tag: 'CL-CSV', ports: [
      { name: 'X2', settings: { ...plcPort, echo: true } },
      { name: 'Flow', settings: { handshake: 'rts-cts', baud: 19200 } },
      { name: 'DTR', settings: { dtrMode: 'on', rtsMode: 'on' } },
    ] });
    const res = await eng.request('GET', `/api/export/csv?table=ports&deviceId=${d.id}`);
    expect(res.status).toBe(200);
    const lines = String(res.body).replace(/^\ufeff/, '').trim().split('\r\n');
    expect(lines[0]).toBe('id,machine,deviceTag,portName,shorthand,interface,baud,dataBits,parity,stopBits,handshake,rtsMode,ctsMode,dtrMode,rtsLeadMs,rtsTailMs,echo,nodeAddress,termination,protocol,bridgedTo,version');
    expect(lines[1]!.split(',').slice(10, 17)).toEqual(['none', 'transmit', 'ignore', 'off', '2', '2', 'yes']);
    expect(lines[2]!.split(',').slice(10, 17)).toEqual(['rts-cts', 'flow', 'gate', 'off', '0', '0', 'no']);
    expect(lines[3]!.split(',').slice(10, 17)).toEqual(['none', 'on', 'ignore', 'on', '0', '0', 'no']);

    const into = await makeMachine(eng);
    const cols = ['interface', 'baud', 'dataBits', 'parity', 'stopBits', 'handshake', 'rtsMode', 'ctsMode', 'dtrMode', 'rtsLeadMs', 'rtsTailMs', 'echo', 'termination', 'protocol'];
    const mapping = { tag: 'deviceTag', portName: 'portName', ...Object.fromEntries(cols.map((c) => [c, c])) };
    expectOk(await eng.post('/api/import/csv', { machineId: into.id, csv: String(res.body), mapping, apply: true }), 201);
    const copy = expectOk(await eng.get(`/api/devices?machineId=${into.id}`)).items[0];
    const full = expectOk(await eng.get(`/api/devices/${copy.id}`));
    const settingsOf = (ports: { settings: Record<string, unknown> }[]) => ports.map((p) => { const { nodeAddress, ...s } = p.settings; return s; });
    expect(settingsOf(full.ports)).toEqual(settingsOf(d.ports));
    // A row whose columns disagree names the column at fault.
    const bad = expectOk(await eng.post('/api/import/csv', { machineId: into.id, csv: 'Tag,Port,Handshake,RTS\nCL-BAD,COM1,RTS/CTS,on while sending\n', mapping: { tag: 'Tag', portName: 'Port', handshake: 'Handshake', rtsMode: 'RTS' } }));
    expect(bad.errors).toEqual([{ row: 2, column: 'Handshake', message: expect.stringMatching(/^handshake "rts-cts" needs RTS for flow control/) }]);
  });
});

describe('field card and link check', () => {
  it('the card lists every setting and its copy is the vault\'s text with the device in front', async () => {
    const d = await makeDevice(eng, undefined, { tag: 'CL-CARD', name: 'Infeed PLC', ports: [{ name: 'X2', settings: { ...plcPort, retries: 2, turnaroundDelayMs: 5 } }] });
    const html = String((await eng.request('GET', `/field/devices/${d.id}`)).body);
    for (const fact of ['RTS</dt><dd>On while sending', 'RTS lead</dt><dd>2 ms', 'RTS tail</dt><dd>2 ms', 'Retries</dt><dd>2', 'Turnaround delay</dt><dd>5 ms']) {
      expect(html.replace(/\s*data-astro-cid-\w+/g, '').replace(/ class="[^"]*"/g, '')).toContain(fact);
    }
    const copy = /data-copy="([^"]*)" data-testid="copy-settings"/.exec(html)?.[1] ?? '';
    const decoded = copy.replace(/&#10;/g, '\n').replace(/&quot;|&#34;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
    expect(decoded).toBe(`CL-CARD Infeed PLC — ${d.ports[0].text}`);
  });

  it('findings: CTS gating against an RTS never raised, flow control on one end, no direction control, a short RTS tail', async () => {
    const m = await makeMachine(eng);
    const dev = async (tag: string, settings: Record<string, unknown>) => (await makeDevice(eng, m.id, { tag, ports: [{ name: 'P', settings }] })).ports[0].id;
    const link = async (kind: string, members: { portId: string; role: string }[]) =>
      expectOk(await eng.post('/api/links', { machineId: m.id, name: `L ${kind} ${members.length}`, kind, members }), 201).report;
    const codes = (r: { findings: { code: string }[] }) => r.findings.map((f) => f.code);

    const gate = await link('point-to-point', [{ portId: await dev('CL-A', { ctsMode: 'gate', rtsMode: 'on' }), role: 'master' }, { portId: await dev('CL-B', {}), role: 'slave' }]);
    expect(codes(gate)).toEqual(['cts-never-raised']);
    expect(gate.findings[0].message).toMatch(/sends only while CTS is on, but .* never raises RTS/);

    const flow = await link('point-to-point', [{ portId: await dev('CL-C', { handshake: 'rts-cts' }), role: 'master' }, { portId: await dev('CL-D', {}), role: 'slave' }]);
    expect(codes(flow)).toEqual(['flow-one-end']);

    const bus = await link('rs485-bus', [
      { portId: await dev('CL-E', { interface: 'rs485-2w', rtsMode: 'transmit', rtsTailMs: 0.5, termination: true, bias: true }), role: 'master' },
      { portId: await dev('CL-F', { interface: 'rs485-2w', nodeAddress: 1, termination: true }), role: 'slave' },
    ]);
    // 8-N-1 at 9600: 10 bits, 1.0417 ms a character (common practice).
    expect(bus.findings.map((f: { code: string; severity: string }) => [f.code, f.severity])).toEqual([['rts-tail-short', 'warning'], ['no-direction-control', 'error']]);
    expect(bus.findings[0].message).toMatch(/takes 1\.04 ms to leave the line \(10 bits at 9600 bit\/s\).*at least 1\.05 ms/);
  });
});
