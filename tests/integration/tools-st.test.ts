/**
 * PLC code through the running server: the public tool and a device's .st file. The code returned is run in
 * the test evaluator (tests/plc/st-eval.ts); the jog's bytes are the demo syntax worked by hand
 * (1° × 100 = 100 steps: "1!JOG:+100" then CR).
 */
import { describe, expect, inject, test } from 'vitest';
import { createTeamWithRoles } from '../helpers/client';
import { runSt } from '../plc/st-eval';
import { jogTemplate, makeCommand } from './command-fixtures';
import { makeDevice, makeMachine } from './vault-fixtures';

const post = async (body: unknown) => {
  const res = await fetch(`${inject('baseUrl')}/api/tools/st`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as any };
};

describe('POST /api/tools/st', () => {
  test('a jog: a FUNCTION with the angle in hundredths of a degree, giving the command bytes', async () => {
    const r = await post({ template: jogTemplate(), name: 'Jog +1°', prefix: 'DRV_' });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ ok: true, name: 'DRV_Jog_Plus_1', form: 'string', capacity: 13, findings: [] });
    expect(r.body.inputs).toEqual([{ name: 'angle', step: 0, field: 'angle', kind: 'number', inputDecimals: 2, lo: -36000, hi: 36000 }]);
    expect(r.body.code).toMatch(/^\(\* CAUTION: the commands this code builds move machinery/);
    const run = runSt(r.body.code, { angle: 100 });
    expect([run.outputs.ERROR, run.result]).toEqual([0, '1!JOG:+100\r']);
    expect(runSt(r.body.code, { angle: 36001 }).outputs.ERROR).toBe(1);
  });

  test('a sequence: its steps joined into one string, each step\'s fixed values constants, the others inputs', async () => {
    const r = await post({ name: 'Jog there and back', steps: [{ template: jogTemplate(), values: { angle: 1 } }, { template: jogTemplate() }] });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body).toMatchObject({ ok: true, name: 'Jog_there_and_back', form: 'string' });
    expect(r.body.inputs).toHaveLength(1);
    expect(r.body.inputs[0]).toMatchObject({ step: 1, field: 'angle', kind: 'number', inputDecimals: 2 });
    // Demo syntax by hand: +1° then −1°, 100 steps each, each step with its own CR.
    const run = runSt(r.body.code, { [r.body.inputs[0].name]: -100 });
    expect([run.outputs.ERROR, run.result]).toEqual([0, '1!JOG:+100\r1!JOG:-100\r']);
    const both = await post({ template: jogTemplate(), steps: [{ template: jogTemplate() }] });
    expect(both.status).toBe(422);
    expect(both.body.fields.template).toMatch(/either a template/);
    expect((await post({ steps: [] })).status).toBe(422);
  });

  test('fixed values (a preset) become constants', async () => {
    const r = await post({ template: jogTemplate(), name: 'Jog', values: { angle: -1 } });
    expect(r.status).toBe(200);
    expect(r.body.inputs).toEqual([]);
    expect(runSt(r.body.code, {}).result).toBe('1!JOG:-100\r');
  });

  test('422 with the reason for what cannot be generated exactly, and for a bad body', async () => {
    const text = { version: 1, segments: [{ type: 'text', id: 't', name: 'note', label: 'Note' }] };
    const refused = await post({ template: text });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/no maxLength/);
    expect((await post({ template: jogTemplate(), prefix: '9x' })).status).toBe(422);
    expect((await post({ template: jogTemplate(), values: { angle: 999 } })).body.error).toMatch(/maximum/);
    const unknown = await post({ template: jogTemplate(), colour: 'red' });
    expect(unknown.status).toBe(422);
  });
});

describe('GET /api/devices/{id}/plc-code', () => {
  test("one .st file with every command and preset of the device", async () => {
    const team = await createTeamWithRoles();
    const owner = team.members.owner;
    const device = await makeDevice(owner);
    await makeCommand(owner, { deviceId: device.id }, { name: 'Jog +1°', presets: [{ name: 'Back', values: { angle: -1 } }] });
    const res = await team.members.viewer.request('GET', `/api/devices/${device.id}/plc-code?prefix=L1_`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/plain/);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="DRV-[A-Za-z0-9-]+\.st"$/);
    const text = res.body as string;
    expect(text.match(/CAUTION/g)).toHaveLength(1);
    expect(text).toContain('FUNCTION L1_Jog_Plus_1 : STRING(13)');
    expect(text).toContain('FUNCTION L1_Jog_Plus_1_Back : STRING(13)');
    const pou = text.slice(text.indexOf('FUNCTION L1_Jog_Plus_1_Back'), text.lastIndexOf('END_FUNCTION') + 'END_FUNCTION'.length);
    expect(runSt(pou, {}).result).toBe('1!JOG:-100\r');
    expect((await owner.request('GET', `/api/devices/${device.id}/plc-code?prefix=a__b`)).status).toBe(422);
  });
});

describe('a sequence and a machine in the .st files', () => {
  test("the device's file builds a sequence from its steps; the machine's file has every device, named by tag", async () => {
    const team = await createTeamWithRoles();
    const owner = team.members.owner;
    const machine = await makeMachine(owner);
    const a = await makeDevice(owner, machine.id);
    const b = await makeDevice(owner, machine.id);
    const jog = await makeCommand(owner, { deviceId: a.id }, { name: 'Nudge' });
    await makeCommand(owner, { deviceId: b.id }, { name: 'Nudge' });
    const seq = await owner.post('/api/commands', { deviceId: a.id, name: 'Out and back', template: { version: 1, segments: [] },
      sequence: { mode: 'one-string', steps: [{ commandId: jog.id, values: { angle: 2 } }, { commandId: jog.id, values: { angle: -3 } }] } });
    expect(seq.status, JSON.stringify(seq.body)).toBe(201);

    const file = (await team.members.viewer.request('GET', `/api/devices/${a.id}/plc-code`)).body as string;
    const pou = (name: string) => file.slice(file.indexOf(`FUNCTION ${name} :`), file.indexOf('END_FUNCTION', file.indexOf(`FUNCTION ${name} :`)) + 12);
    // Worked by hand: 2° → +200 steps, −3° → −300 steps, each step with its own CR.
    expect(runSt(pou('Out_and_back_as_saved'), {}).result).toBe('1!JOG:+200\r1!JOG:-300\r');
    expect(runSt(pou('Out_and_back'), { angle: 100, angle_2: -100 }).result).toBe('1!JOG:+100\r1!JOG:-100\r');

    const res = await team.members.technician.request('GET', `/api/machines/${machine.id}/plc-code?prefix=K1_`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="Line-[A-Za-z0-9-]+\.st"$/);
    const all = res.body as string;
    expect(all.match(/CAUTION/g)).toHaveLength(1);
    for (const d of [a, b]) expect(all).toContain(`FUNCTION K1_${d.tag.replace(/-/g, '_')}_Nudge : STRING(`);
    expect(all).toContain(`FUNCTION K1_${a.tag.replace(/-/g, '_')}_Out_and_back_as_saved : STRING(`);
    expect((await owner.request('GET', `/api/machines/${machine.id}/plc-code?prefix=9x`)).status).toBe(422);
  });
});
