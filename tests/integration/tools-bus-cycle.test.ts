/**
 * The poll cycle tool through the running server (the handler alone is in tests/frame/tools-api.test.ts, the
 * engine in tests/frame/bus-cycle.test.ts), and the bus page's poll cycle panel as the server renders it.
 * Expected figures worked out with Python's decimal module.
 */
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { createTeamWithRoles, type TestClient } from '../helpers/client';
import { expectOk, makeMachine, rs485 } from './vault-fixtures';
import { jogBody } from './command-fixtures';

/** Like a script would call it: JSON, no Origin header, no session. */
const post = async (body: unknown) => {
  const res = await fetch(`${inject('baseUrl')}/api/tools/bus-cycle`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as any };
};

describe('POST /api/tools/bus-cycle through the running server', () => {
  it('answers the worked example of docs/api.md', async () => {
    const read10 = { requestBytes: 8, replyBytes: 25, responseMs: 20 };
    const r = await post({ settings: { baud: 9600, protocol: 'modbus-rtu', retries: 2, responseTimeoutMs: 100 }, polls: [{ label: 'DRV-1', ...read10 }, { label: 'DRV-2', ...read10 }] });
    expect(r.status).toBe(200);
    // Modbus over Serial Line V1.02 §2.5.1.1: 3.5 characters (3.645833 ms at 9600 8-N-1) after each frame;
    // python3 decimal: 40 × 10 / 9.6 + 20 = 61.666667 per poll; worst 61.666667 + 3 × (8.333333 + 100)
    expect(r.body).toMatchObject({ cycleMs: 123.333333, pollsPerSecond: 16.216216, worstCaseMs: 386.666667, findings: [] });
    expect(r.body.polls.map((p: any) => [p.label, p.requestMs, p.replyMs, p.gapMs, p.totalMs])).toEqual([
      ['DRV-1', 8.333333, 26.041667, 7.291667, 61.666667],
      ['DRV-2', 8.333333, 26.041667, 7.291667, 61.666667],
    ]);
  });

  it('answers bad input with 422 and a message per field', async () => {
    const r = await post({ settings: { parity: 'sometimes' }, polls: [{ requestBytes: 8 }] });
    expect(r.status).toBe(422);
    expect(r.body.fields).toMatchObject({ 'settings.parity': expect.any(String), 'polls.0.replyBytes': 'Give the reply as a whole number of bytes' });
  });
});

describe('the bus page', () => {
  let eng: TestClient;
  beforeAll(async () => {
    eng = (await createTeamWithRoles('bus-page')).members.engineer;
  }, 60_000);

  const device = async (machineId: string, tag: string, settings: Record<string, unknown>) =>
    expectOk(await eng.post('/api/devices', { machineId, tag, role: 'drive', ports: [{ name: 'RS-485', settings: rs485(settings) }] }), 201);

  it('shows the poll cycle panel with library commands and the findings of the starting polls', async () => {
    const m = await makeMachine(eng);
    const plc = await device(m.id, 'PLC-1', { nodeAddress: null, termination: true, bias: true, responseTimeoutMs: 50 });
    const d1 = await device(m.id, 'DRV-1', { nodeAddress: 1 });
    const d2 = await device(m.id, 'DRV-2', { nodeAddress: 2, termination: true, turnaroundDelayMs: 60 });
    expectOk(await eng.post('/api/commands', jogBody({ deviceId: d1.id }, { name: 'Jog one degree' })), 201);
    const link = expectOk(await eng.post('/api/links', {
      machineId: m.id, name: 'Drive bus', kind: 'rs485-bus', cableLengthM: 30,
      members: [{ portId: plc.ports[0].id, role: 'master' }, { portId: d1.ports[0].id, role: 'slave' }, { portId: d2.ports[0].id, role: 'slave' }],
    }), 201);
    const page = await eng.get(`/vault/links/${link.id}`);
    expect(page.status).toBe(200);
    const html = String(page.body);
    expect(html).toContain('data-testid="poll-cycle"');
    // "1!JOG:" + "+100" + CR = 11 bytes (our own demo syntax), no reply
    expect(html).toContain('Jog one degree (11 bytes)');
    // DRV-2 answers 60 ms after 3.5 characters (Modbus over Serial Line V1.02 §2.5.1.1); PLC-1 waits 50 ms
    expect(html).toContain('data-code="response-timeout-too-short"');
    // the jog expects no reply and PLC-1 has no turnaround delay (Modbus over Serial Line V1.02 §2.4.1)
    expect(html).toContain('data-code="broadcast-turnaround-missing"');
    expect(html).toContain('data-testid="bus-timeline"');

    const p2p = expectOk(await eng.post('/api/links', { machineId: m.id, name: 'Service', kind: 'point-to-point', members: [{ portId: plc.ports[0].id, role: 'master' }, { portId: d1.ports[0].id, role: 'slave' }] }), 201);
    expect(String((await eng.get(`/vault/links/${p2p.id}`)).body)).not.toContain('data-testid="poll-cycle"');
  });
});
