/**
 * Saved sequences in the command library through the running server: steps by reference and inline, the
 * reference rules (422s), the trash warning and the gap it leaves, restore and purge, export and import keeping
 * the references, and the replies of a sequence split per step. Commands in the demo drive's invented syntax
 * (src/lib/composer/demo.ts). Expected bytes and times worked out with Python (`python3 -c`), not by the app.
 */
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { createTeamWithRoles, type TeamFixture, type TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeMachine, makeProfile, makeSite, uid } from './vault-fixtures';
import { withoutIds } from '../../src/lib/field/export-check';

let team: TeamFixture;
let other: TeamFixture;
let target: TeamFixture;
let eng: TestClient;

beforeAll(async () => {
  [team, other, target] = await Promise.all([createTeamWithRoles('seq'), createTeamWithRoles('seq-other'), createTeamWithRoles('seq-import')]);
  eng = team.members.engineer;
}, 90_000);

const hex = (text: string) => Buffer.from(text, 'latin1').toString('hex').toUpperCase().replace(/(..)(?!$)/g, '$1 ');
const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', min: 1, max: 31 };
const cr = { type: 'terminator', id: 'cr', bytes: '0D' };
const tpl = (...segments: object[]) => ({ version: 1, segments });
const setting = (arg: string, name: string) => tpl(address, { type: 'literal', id: 'verb', bytes: hex(`!SET:/${arg}`) }, { type: 'integer', id: name, name, label: name, scale: { factor: 36000 }, min: 0.01, max: 50 }, cr);
const distance = tpl(address, { type: 'literal', id: 'verb', bytes: hex('!IDX:') }, { type: 'integer', id: 'angle', name: 'angle', label: 'Distance', unit: '°', scale: { factor: 36000, divisor: 360 }, sign: 'always', min: -360, max: 360 }, cr);
const EMPTY = { version: 1, segments: [] };

async function drive(c: TestClient, machineId?: string) {
  const d = await makeDevice(c, machineId, { ports: [{ name: 'Service', settings: { interface: 'rs232', baud: 9600, frameRules: { terminator: '0D', byteSet: 'printable' } } }] });
  const cmd = async (name: string, template: object, fieldValues: object) =>
    expectOk(await c.post('/api/commands', { deviceId: d.id, name, template, fieldValues, portName: 'Service' }), 201);
  const accel = await cmd('Acceleration', setting('R', 'accel'), { address: 1, accel: 5 });
  const decel = await cmd('Deceleration', setting('F', 'decel'), { address: 1, decel: 5 });
  const speed = await cmd('Velocity', setting('S', 'speed'), { address: 1, speed: 0.5 });
  return { d, accel, decel, speed };
}

const sequenceBody = (deviceId: string, steps: object[], over: object = {}) => ({
  deviceId, name: `A four-move ${uid()}`, template: EMPTY, portName: 'Service', sequence: { mode: 'one-string', steps }, ...over,
});

async function fourMove(c: TestClient, machineId?: string) {
  const x = await drive(c, machineId);
  const seq = expectOk(await c.post('/api/commands', sequenceBody(x.d.id, [
    { commandId: x.accel.id, values: { accel: 5 } },
    { commandId: x.decel.id, values: { decel: 4 } },
    { commandId: x.speed.id, values: {} },
    { template: distance, values: { address: 1, angle: 45 } },
  ])), 201);
  return { ...x, seq };
}

const fields = (res: { body: any }) => res.body.fields ?? {};

describe('saving a sequence', () => {
  it('by reference and inline: stored with its steps, listed with their names, no error findings', async () => {
    const { d, accel, decel, speed, seq } = await fourMove(eng);
    expect(seq.savedWithErrors).toBeUndefined();
    expect(seq.template).toEqual(EMPTY);
    expect(seq.sequence.steps.map((s: any) => s.commandId ?? 'inline')).toEqual([accel.id, decel.id, speed.id, 'inline']);
    const got = expectOk(await eng.get(`/api/commands/${seq.id}`));
    expect(got.steps).toEqual([
      { index: 0, kind: 'command', commandId: accel.id, name: 'Acceleration', state: 'ok' },
      { index: 1, kind: 'command', commandId: decel.id, name: 'Deceleration', state: 'ok' },
      { index: 2, kind: 'command', commandId: speed.id, name: 'Velocity', state: 'ok' },
      { index: 3, kind: 'inline', commandId: null, name: 'Inline step', state: 'ok' },
    ]);
    const list = expectOk(await eng.get(`/api/commands?deviceId=${d.id}`));
    expect(list.items.find((i: any) => i.id === seq.id).steps).toHaveLength(4);
    expect(list.items.find((i: any) => i.id === accel.id).steps).toBeUndefined();
  });

  it('a change to a referenced command shows in the sequence; updating the steps writes a revision', async () => {
    const { speed, seq } = await fourMove(eng);
    expectOk(await eng.patch(`/api/commands/${speed.id}`, { version: speed.version, name: 'Velocity (slow)' }));
    expect(expectOk(await eng.get(`/api/commands/${seq.id}`)).steps[2].name).toBe('Velocity (slow)');
    const steps = [...seq.sequence.steps.slice(0, 3), { template: distance, values: { address: 1, angle: 90 } }];
    const updated = expectOk(await eng.patch(`/api/commands/${seq.id}`, { version: seq.version, sequence: { mode: 'separate', delayMs: 5, steps } }));
    expect(updated.version).toBe(seq.version + 1);
    expect(updated.sequence).toMatchObject({ mode: 'separate', delayMs: 5 });
    const history = expectOk(await eng.get(`/api/commands/${seq.id}/revisions`));
    expect(history.items[0].changes.map((c: any) => c.field)).toEqual(expect.arrayContaining(['sequence.mode', 'sequence.delayMs']));
  });

  it('refuses bad references with a 422 naming the step: another team, another device, a sequence, itself, missing', async () => {
    const { d, accel, seq } = await fourMove(eng);
    const foreign = await drive(other.members.engineer);
    const elsewhere = await drive(eng);
    const profile = await makeProfile(eng);
    const onProfile = expectOk(await eng.post('/api/commands', { profileId: profile.id, name: 'Tare', template: distance, fieldValues: { address: 1, angle: 1 } }), 201);
    const refuse = async (commandId: string, pattern: RegExp) => {
      const res = await eng.post('/api/commands', sequenceBody(d.id, [{ commandId: accel.id, values: {} }, { commandId, values: {} }]));
      expect(res.status).toBe(422);
      expect(fields(res)['sequence.steps.1.commandId']).toMatch(pattern);
      expect((res.body as any).error).toMatch(/^Step 2: /);
    };
    await refuse(foreign.accel.id, /no command with id .* in this team's library/);
    await refuse('cmd_nothing_here', /no command with id cmd_nothing_here/);
    await refuse(elsewhere.accel.id, /belongs to another device; a step must be a command of the sequence's own device/);
    await refuse(onProfile.id, /belongs to another profile/);
    await refuse(seq.id, /is itself a sequence/);
    const self = await eng.patch(`/api/commands/${seq.id}`, { version: seq.version, sequence: { mode: 'one-string', steps: [{ commandId: seq.id, values: {} }] } });
    expect(self.status).toBe(422);
    expect(fields(self)['sequence.steps.0.commandId']).toBe('Step 1: a sequence cannot be a step of itself.');
    // a command used as a step cannot become a sequence itself
    const becomes = await eng.patch(`/api/commands/${accel.id}`, { version: accel.version, template: EMPTY, fieldValues: {}, sequence: { mode: 'one-string', steps: [{ template: distance, values: { address: 1, angle: 1 } }] } });
    expect(becomes.status).toBe(422);
    expect((becomes.body as any).error).toMatch(/is a step of "A four-move/);
    // shape: a step is one of the two kinds; a sequence's own template stays empty
    const both = await eng.post('/api/commands', sequenceBody(d.id, [{ commandId: accel.id, template: distance, values: {} }]));
    expect(both.status).toBe(422);
    expect(fields(both)['sequence.steps.0.commandId']).toMatch(/either a library command/);
    const ownTemplate = await eng.post('/api/commands', sequenceBody(d.id, [{ commandId: accel.id, values: {} }], { template: distance }));
    expect(ownTemplate.status).toBe(422);
    expect(fields(ownTemplate).template).toBe('Leave empty for a sequence.');
    const wait = await eng.post('/api/commands', sequenceBody(d.id, [{ commandId: accel.id, values: {}, waitForReplyMs: 100 }]));
    expect(fields(wait)['sequence.steps.0.waitForReplyMs']).toMatch(/only when the steps are sent separately/);
    // nothing of it was written
    const names = expectOk(await eng.get(`/api/commands?deviceId=${d.id}`)).items.map((i: any) => i.name);
    expect(names.filter((n: string) => n.startsWith('A four-move'))).toHaveLength(1);
  });
});

describe('the trash and a sequence', () => {
  it('warns with the sequences using a command, leaves a gap when confirmed, mends on restore', async () => {
    const { speed, seq } = await fourMove(eng);
    const warned = await eng.del(`/api/commands/${speed.id}?version=${speed.version}`);
    expect(warned.status).toBe(409);
    expect((warned.body as any).usedBy).toEqual([{ id: seq.id, name: seq.name, steps: [3] }]);
    expect((warned.body as any).error).toMatch(/step of the sequence ".*" \(step 3\)/);
    expect(expectOk(await eng.get(`/api/commands/${speed.id}`)).deletedAt).toBeNull();

    expectOk(await eng.del(`/api/commands/${speed.id}?version=${speed.version}&confirmUsed=true`));
    const gap = expectOk(await eng.get(`/api/commands/${seq.id}`));
    expect(gap.steps[2]).toEqual({ index: 2, kind: 'command', commandId: speed.id, name: 'Velocity', state: 'trash', gap: 'Step 3: the command "Velocity" is in the trash; restore it or replace the step.' });
    // a new reference to a command in the trash is refused, but the gap may stay while the rest is edited
    const fresh = await eng.post('/api/commands', sequenceBody(seq.deviceId, [{ commandId: speed.id, values: {} }]));
    expect(fields(fresh)['sequence.steps.0.commandId']).toBe('Step 1: "Velocity" is in the trash; restore it first, or pick another command.');
    const edited = expectOk(await eng.patch(`/api/commands/${seq.id}`, { version: seq.version, sequence: { ...seq.sequence, steps: [...seq.sequence.steps].reverse() } }));
    expect(edited.savedWithErrors).toEqual(['step-command-missing']);

    expectOk(await eng.post(`/api/trash/command/${speed.id}`));
    expect(expectOk(await eng.get(`/api/commands/${seq.id}`)).steps[1]).toMatchObject({ name: 'Velocity', state: 'ok' });
  });

  it('a purged command leaves a gap; replacing the step mends it', async () => {
    const { accel, decel, speed, seq } = await fourMove(eng);
    expectOk(await eng.del(`/api/commands/${decel.id}?confirmUsed=true`));
    expectOk(await team.members.admin.del(`/api/trash/command/${decel.id}`));
    const gap = expectOk(await eng.get(`/api/commands/${seq.id}`));
    expect(gap.steps[1]).toEqual({ index: 1, kind: 'command', commandId: decel.id, name: '(purged command)', state: 'purged', gap: 'Step 2: its command was purged from the trash; replace the step or remove it.' });
    const steps = [{ commandId: accel.id, values: {} }, { template: setting('F', 'decel'), values: { address: 1, decel: 4 } }, { commandId: speed.id, values: {} }];
    const mended = expectOk(await eng.patch(`/api/commands/${seq.id}`, { version: seq.version, sequence: { mode: 'one-string', steps } }));
    expect(mended.savedWithErrors).toBeUndefined();
    expect(expectOk(await eng.get(`/api/commands/${seq.id}`)).steps.map((s: any) => s.state)).toEqual(['ok', 'ok', 'ok']);
    // putting back the first version brings the gap back too: never refused for a step's command
    const history = expectOk(await eng.get(`/api/commands/${seq.id}/revisions`));
    const first = history.items.find((r: any) => r.version === 1);
    expectOk(await eng.post(`/api/commands/${seq.id}/restore`, { revisionId: first.id, version: history.version }));
    expect(expectOk(await eng.get(`/api/commands/${seq.id}`)).steps.map((s: any) => s.state)).toEqual(['ok', 'purged', 'ok', 'ok']);
  });

  it('a command no sequence uses goes to the trash without a question', async () => {
    const { accel } = await drive(eng);
    expectOk(await eng.del(`/api/commands/${accel.id}`));
  });
});

describe('export and import', () => {
  it('keep the references: the steps point at the new commands, also when the command comes later in the file', async () => {
    const site = await makeSite(eng);
    const m = await makeMachine(eng, site.id);
    const { seq, accel } = await fourMove(eng, m.id);
    const first = expectOk(await eng.get(`/api/export?siteId=${site.id}`));
    const names = first.commands.map((c: any) => c.name);
    // "A four-move …" sorts before the commands it uses: its references point forward in the file
    expect(names.indexOf(seq.name)).toBeLessThan(names.indexOf('Acceleration'));
    const exported = first.commands.find((c: any) => c.name === seq.name);
    expect(exported.sequence.steps[0].commandId).toBe(accel.id);
    expect(first.commands.find((c: any) => c.name === 'Acceleration').sequence).toBeUndefined();

    const t = target.members.engineer;
    expectOk(await t.post('/api/import', { document: first, apply: true }), 201);
    const importedSite = expectOk(await t.get('/api/sites?pageSize=5')).items[0];
    const second = expectOk(await t.get(`/api/export?siteId=${importedSite.id}`));
    expect(withoutIds(second)).toEqual(withoutIds(first));
    const copy = second.commands.find((c: any) => c.name === seq.name);
    const newAccel = second.commands.find((c: any) => c.name === 'Acceleration');
    expect(copy.sequence.steps[0].commandId).toBe(newAccel.id);
    expect(newAccel.id).not.toBe(accel.id);
    const view = expectOk(await t.get(`/api/commands/${copy.id}`));
    expect(view.steps.map((s: any) => s.state)).toEqual(['ok', 'ok', 'ok', 'ok']);
  });

  it('a reference to a command not in the document is a clear row error; nothing is written', async () => {
    const site = await makeSite(eng);
    const m = await makeMachine(eng, site.id);
    const { seq } = await fourMove(eng, m.id);
    const doc = expectOk(await eng.get(`/api/export?siteId=${site.id}`));
    doc.commands = doc.commands.filter((c: any) => c.name !== 'Velocity');
    const t = target.members.engineer;
    const before = expectOk(await t.get('/api/sites?pageSize=100')).items.length;
    const res = await t.post('/api/import', { document: doc, apply: true });
    expect(res.status).toBe(422);
    expect((res.body as any).error).toMatch(new RegExp(`^document: command ${seq.name}: step 3 refers to command cmd_[\\w-]+, which is not in the document`));
    expect(expectOk(await t.get('/api/sites?pageSize=100')).items.length).toBe(before);
  });
});

describe('replies per step through the tools route', () => {
  it('splits what came back for the whole sequence into each step\'s reply with its checksum verdict', async () => {
    // the demo drive's status reply: `1=STA:` position `,` state `*` XOR-8 in hex, CR
    const reply = tpl(address, { type: 'literal', id: 'verb', bytes: hex('=STA:') },
      { type: 'integer', id: 'pos', name: 'position', label: 'Position', width: 8, pad: 'zero', sign: 'always', scale: { factor: 36000, divisor: 360 } },
      { type: 'literal', id: 'comma', bytes: '2C' },
      { type: 'choice', id: 'state', name: 'state', label: 'State', options: [{ value: 'ready', label: 'Ready', send: 'R' }, { value: 'moving', label: 'Moving', send: 'M' }] },
      { type: 'literal', id: 'star', bytes: '2A' },
      { type: 'checksum', id: 'bcc', algorithm: 'XOR-8', range: { from: 0, to: 4 }, over: 'bytes', encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' }, cr);
    const body = {
      mode: 'separate', delayMs: 5,
      steps: [
        { template: setting('S', 'speed'), values: { address: 1, speed: 0.5 }, reply, waitForReplyMs: 100 },
        { template: distance, values: { address: 1, angle: 45 }, reply },
      ],
      // python3: XOR-8 of "1=STA:+0004500,R" = 0x14 and of "1=STA:+0009000,M" = 0x03
      received: hex('1=STA:+0004500,R*14\r1=STA:+0009000,M*04\r'),
    };
    const res = await fetch(`${inject('baseUrl')}/api/tools/sequence`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
    expect(res.status).toBe(200);
    const r = (await res.json()) as any;
    // python3: (14 + 12) × 10 / 9600 s = 27.083333 ms; + 5 ms delay + 100 ms timeout
    expect(r.timing).toMatchObject({ frameTimeMs: 27.083333, delayTotalMs: 5, waitTotalMs: 100, totalMs: 132.083333, worstCaseMs: 132.083333 });
    expect(r.steps.map((s: any) => [s.waitForReplyMs, s.startMs])).toEqual([[100, 0], [undefined, 119.583333]]);
    expect(r.replies.steps.map((s: any) => [s.step, s.start, s.end, s.ok])).toEqual([[0, 0, 20, true], [1, 20, 40, false]]);
    expect(r.replies.steps.map((s: any) => s.checksums.map((c: any) => [c.expected, c.received, c.ok]))).toEqual([[[0x14, 0x14, true]], [[0x03, 0x04, false]]]);
    expect(r.replies.steps[0].fields.position.value).toBe(45);
    // the request without the new fields answers as before (no replies)
    const plain = await fetch(`${inject('baseUrl')}/api/tools/sequence`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ steps: [{ template: distance, values: { address: 1, angle: 45 } }] }) });
    const p = (await plain.json()) as any;
    expect(p.replies).toBeUndefined();
    expect(p.bytes).toBe('31 21 49 44 58 3A 2B 34 35 30 30 0D');
  });
});
