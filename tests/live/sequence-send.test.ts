/**
 * Sending a saved sequence over the live link to the simulated demo drive through the fake port (it stands in for
 * an adapter and a device, as a fake SMTP server stands in for mail). Expected bytes are the demo syntax worked
 * by hand (src/lib/composer/demo.ts; XOR-8 checks worked in tests/live/simulator.test.ts):
 *   Index 45° as saved  "1!IDX:+4500/R180000/F180000/S18000" CR  (35 bytes; 45° × 100 steps/°, 5 and 0.5 rev × 36,000)
 *   Status query        "1?STA*48" CR                             (9 bytes; 31^3F^53^54^41 = 48)
 *   their replies       "1=IDX:OK*67" CR (12 bytes), "1=STA:+0004500,R*14" CR (20 bytes, position 45°, ready)
 */
import { afterEach, describe, expect, it } from 'vitest';
import { createFakeSerial } from '../../src/lib/live/fake-serial';
import { LiveLink } from '../../src/lib/live/session';
import { liveSequences, runSequence, type SequenceLibraryEntry, type SequenceRun } from '../../src/lib/live/sequence-send';
import { answerWrite, splitRequests, type SimulatedCommand } from '../../src/lib/live/simulator';
import { stepsReplyProgress } from '../../src/lib/live/reply-end';
import { indexAckTemplate, indexMoveTemplate, jogTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { latin1Bytes, portSettingsSchema } from '../../src/lib/frame';
import type { SavedSequence } from '../../src/lib/composer/saved-sequence';

const ascii = (s: string) => latin1Bytes(s) as Uint8Array;
const text = (b: Uint8Array | number[]) => String.fromCharCode(...b);
const INDEX = '1!IDX:+4500/R180000/F180000/S18000\r';
const STATUS = '1?STA*48\r';
const INDEX_ACK = '1=IDX:OK*67\r';
const STATUS_REPLY = '1=STA:+0004500,R*14\r';
const JOG = '1!JOG:+100\r';

const index: SequenceLibraryEntry = { id: 'idx', name: 'Index 45°', movesMachinery: true, template: indexMoveTemplate, fieldValues: { address: 1, angle: 45, accel: 5, decel: 5, speed: 0.5 }, replyTemplate: indexAckTemplate };
const status: SequenceLibraryEntry = { id: 'sta', name: 'Status query', movesMachinery: false, template: statusQueryTemplate, fieldValues: { address: 1 }, replyTemplate: statusReplyTemplate };
const jog: SequenceLibraryEntry = { id: 'jog', name: 'Jog +1°', movesMachinery: false, template: jogTemplate('+'), fieldValues: { address: 1, angle: 1 }, replyTemplate: null };
const EMPTY = { version: 1 as const, segments: [] };
const sequence = (id: string, name: string, seq: SavedSequence, extra: Partial<SequenceLibraryEntry> = {}): SequenceLibraryEntry =>
  ({ id, name, movesMachinery: false, template: EMPTY, fieldValues: {}, replyTemplate: null, sequence: seq, ...extra });
const indexThenStatus = (mode: SavedSequence['mode'], delayMs = 0) =>
  sequence('seq', 'Index and report', { mode, delayMs, steps: [{ commandId: 'idx', values: {} }, { commandId: 'sta', values: {} }] });

const simulated: SimulatedCommand[] = [index, status, jog].map((c) => ({ id: c.id, name: c.name, template: c.template, replyTemplate: c.replyTemplate }));
const port = portSettingsSchema.parse({ baud: 9600, responseTimeoutMs: 150, frameRules: { terminator: '0D' } });
const links: LiveLink[] = [];
async function connect(sim: Partial<Parameters<typeof createFakeSerial>[0]> = {}) {
  const serial = createFakeSerial({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 }, commands: simulated, responseDelayMs: 3, replyValues: { sta: { position: 45, state: 'ready' } }, ...sim });
  const link = await LiveLink.open(await serial.requestPort(), port);
  links.push(link);
  return { serial, link };
}
afterEach(async () => {
  for (const l of links.splice(0)) await l.close();
});
const one = (list: SequenceLibraryEntry[], id = 'seq') => liveSequences(list).find((s) => s.id === id)!;

describe('a saved sequence as the live link sends it', () => {
  it('resolves its steps against the library: bytes, replies, machinery', () => {
    const s = one([index, status, indexThenStatus('separate', 50)]);
    expect(s.refusal).toBeNull();
    expect(s.steps.map((x) => [x.name, text(x.bytes), x.replyTemplate === null])).toEqual([['Index 45°', INDEX, false], ['Status query', STATUS, false]]);
    expect(text(s.bytes)).toBe(INDEX + STATUS);
    expect(s).toMatchObject({ mode: 'separate', delayMs: 50 });
    // Not flagged itself, but its first step's command moves machinery.
    expect(s.movesMachinery).toBe(true);
    expect(liveSequences([index, status])).toEqual([]);
  });

  it('shows a sequence with a gap but refuses to send it, saying why', async () => {
    const gap = 'Step 1: the command "Index 45°" is in the trash; restore it or replace the step.';
    const trashed = indexThenStatus('one-string');
    trashed.steps = [{ index: 0, kind: 'command', commandId: 'idx', name: 'Index 45°', state: 'trash', gap }, { index: 1, kind: 'command', commandId: 'sta', name: 'Status query', state: 'ok' }];
    // The trashed command is not in the library list; the server's step view names it and the reason.
    const s = one([status, trashed]);
    expect(s.refusal).toBe(gap);
    expect(s.steps.map((x) => x.name)).toEqual(['Index 45°', 'Status query']);
    const { serial, link } = await connect();
    await expect(runSequence(link, s)).rejects.toThrow(/cannot be sent: Step 1: the command "Index 45°" is in the trash/);
    expect(serial.evidence.written).toEqual([]);
    // Without the server's view, a command missing from the library is still a gap.
    expect(one([status, indexThenStatus('one-string')]).refusal).toMatch(/^Step 1: /);
  });
});

describe('the simulated device reads one command per terminator', () => {
  it('splits a one-string write into its requests and answers each in turn', () => {
    expect(splitRequests(simulated, ascii(INDEX + STATUS)).map(text)).toEqual([INDEX, STATUS]);
    // An unknown request in the middle is read to its terminator and goes unanswered.
    expect(splitRequests(simulated, ascii(`${STATUS}HELLO\r${JOG}`)).map(text)).toEqual([STATUS, 'HELLO\r', JOG]);
    for (const junk of [[0x00], [0x7f], [0x80], [0xff], [0x00, 0x7f, 0x80, 0xff]]) expect(splitRequests(simulated, Uint8Array.from(junk)).map((b) => [...b])).toEqual([junk]);
    expect(splitRequests(simulated, new Uint8Array(0))).toEqual([]);
    const answers = answerWrite({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 }, commands: simulated, replyValues: { sta: { position: 45, state: 'ready' } } }, ascii(INDEX + STATUS), { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 });
    expect(answers.map((a) => [a.end, a.answer.command?.id, text(a.answer.sent)])).toEqual([[35, 'idx', INDEX_ACK], [44, 'sta', STATUS_REPLY]]);
  });

  it('knows where back-to-back replies end', () => {
    const replies = [indexAckTemplate, null, statusReplyTemplate];
    expect(stepsReplyProgress(replies, ascii(INDEX_ACK.slice(0, 5)))).toEqual({ whole: null, between: false });
    expect(stepsReplyProgress(replies, ascii(INDEX_ACK))).toEqual({ whole: null, between: true });
    expect(stepsReplyProgress(replies, ascii(INDEX_ACK + STATUS_REPLY))).toEqual({ whole: 32, between: false });
  });
});

describe('sending a sequence to the simulated drive', () => {
  it('as one string: one write, each step\'s reply split out and its checksum good, timed against the whole string', async () => {
    const { serial, link } = await connect();
    const seen: SequenceRun[] = [];
    const run = await runSequence(link, one([index, status, indexThenStatus('separate', 50)]), { mode: 'one-string', progress: (r) => seen.push(r) });
    expect(serial.evidence.written.map(text)).toEqual([INDEX + STATUS]);
    expect(serial.evidence.answers.map((a) => a.command?.id)).toEqual(['idx', 'sta']);
    expect(text(run.whole!.reply)).toBe(INDEX_ACK + STATUS_REPLY);
    expect(run.whole!.endedBy).toBe('terminator');
    // 44 characters out and 32 back, 10 bits each at 9600 bit/s: 76 × 10 / 9600 s = 79.167 ms.
    expect(run.whole!.wireMs).toBeCloseTo(79.1667, 3);
    // The fake port delivers on timers that may fire up to a millisecond early against the clock the link reads.
    expect(run.whole!.roundTripMs!).toBeGreaterThanOrEqual(78);
    expect(run.steps.map((s) => s.outcome)).toEqual(['answered', 'answered']);
    expect(run.steps.map((s) => s.reply!.checksums.map((c) => [c.algorithm, c.ok]))).toEqual([[['XOR-8', true]], [['XOR-8', true]]]);
    expect(run.steps[0]!.reply!.fields.result?.value).toBe('accepted');
    expect(run.steps[1]!.reply!.fields.position?.value).toBe(45);
    expect(run.stopped).toBeNull();
    expect(seen[0]!.steps.map((s) => s.outcome)).toEqual(['waiting', 'waiting']);
    expect(seen.at(-1)!.running).toBe(false);
    expect(link.exchangeLog.filter((e) => e.kind === 'sent').map((e) => e.kind === 'sent' && e.label)).toEqual(['Index and report (one string, 2 steps)']);
    expect(link.exchangeLog.at(-1)).toMatchObject({ kind: 'note', text: 'Sequence "Index and report" (one string): step 1 answered, step 2 answered.' });
  });

  it('as one string, waits for the next step\'s reply through a device pause longer than the silence that ends one reply', async () => {
    // 40 ms before each reply: longer than the 20 ms silence, shorter than the 150 ms response timeout.
    const { link } = await connect({ responseDelayMs: 40 });
    const run = await runSequence(link, one([index, status, indexThenStatus('one-string')]));
    expect(text(run.whole!.reply)).toBe(INDEX_ACK + STATUS_REPLY);
    expect(run.steps.map((s) => s.outcome)).toEqual(['answered', 'answered']);
  });

  it('separately: step by step, each reply awaited, the pause between sends', async () => {
    const { serial, link } = await connect();
    const pauses: number[] = [];
    const run = await runSequence(link, one([index, status, indexThenStatus('separate', 50)]), { sleep: async (ms) => { pauses.push(ms); } });
    expect(serial.evidence.written.map(text)).toEqual([INDEX, STATUS]);
    expect(pauses).toEqual([50]);
    expect(run.steps.map((s) => [s.outcome, text(s.exchange!.reply), s.exchange!.endedBy])).toEqual([['answered', INDEX_ACK, 'terminator'], ['answered', STATUS_REPLY, 'terminator']]);
    expect(link.exchangeLog.map((e) => e.kind)).toEqual(['sent', 'received', 'sent', 'received', 'note']);
    expect(link.exchangeLog.filter((e) => e.kind === 'sent').map((e) => e.kind === 'sent' && e.label)).toEqual(['Index and report, step 1 of 2: Index 45°', 'Index and report, step 2 of 2: Status query']);
  });

  it('separately: a step without a reply template is sent without waiting for a reply', async () => {
    const { serial, link } = await connect();
    const seq = sequence('seq', 'Jog and report', { mode: 'separate', delayMs: 0, steps: [{ commandId: 'jog', values: {} }, { commandId: 'sta', values: {} }] });
    const t0 = performance.now();
    const run = await runSequence(link, one([jog, status, seq]));
    expect(serial.evidence.written.map(text)).toEqual([JOG, STATUS]);
    expect(run.steps.map((s) => s.outcome)).toEqual(['sent', 'answered']);
    expect(run.steps[0]!.exchange!.endedBy).toBe('none-expected');
    // The jog took its time on the wire and a 20 ms silence, not the 150 ms response timeout.
    expect(performance.now() - t0).toBeLessThan(150);
  });

  it('separately: a step without a reply stops the sequence, naming the step; the rest are not sent', async () => {
    const { serial, link } = await connect({ fault: 'no-reply' });
    const run = await runSequence(link, one([index, status, indexThenStatus('separate', 10)]));
    expect(serial.evidence.written.map(text)).toEqual([INDEX]);
    expect(run.steps.map((s) => s.outcome)).toEqual(['timed-out', 'not-sent']);
    expect(run.stopped).toEqual({ by: 'timeout', message: 'Step 1 (Index 45°): no reply within the response timeout (150 ms); the steps after it were not sent.' });
  });

  it('separately: a step\'s own reply timeout replaces the port\'s', async () => {
    const { link } = await connect({ fault: 'no-reply' });
    const seq = sequence('seq', 'Index and report', { mode: 'separate', delayMs: 0, steps: [{ commandId: 'sta', values: {}, waitForReplyMs: 60 }, { commandId: 'idx', values: {} }] });
    const run = await runSequence(link, one([index, status, seq]));
    expect(run.stopped?.message).toBe('Step 1 (Status query): no reply within the response timeout (60 ms); the steps after it were not sent.');
    expect(run.steps[0]!.timeoutMs).toBe(60);
  });

  it('separately: Stop sends no further step', async () => {
    const { serial, link } = await connect();
    const stop = new AbortController();
    const run = await runSequence(link, one([index, status, indexThenStatus('separate', 0)]), { signal: stop.signal, progress: (r) => { if (r.steps[0]!.outcome === 'sending') stop.abort(); } });
    expect(serial.evidence.written.map(text)).toEqual([INDEX]);
    expect(run.steps.map((s) => s.outcome)).toEqual(['answered', 'not-sent']);
    expect(run.stopped).toEqual({ by: 'stop', message: 'Stopped before step 2 (Status query); it and the steps after it were not sent.' });
  });

  it('as one string without any reply: says which step went unanswered', async () => {
    const { link } = await connect({ fault: 'no-reply' });
    const run = await runSequence(link, one([index, status, indexThenStatus('one-string')]));
    expect(run.whole!.endedBy).toBe('timeout');
    expect(run.steps.map((s) => s.outcome)).toEqual(['timed-out', 'timed-out']);
    expect(run.stopped?.message).toBe('Step 1 (Index 45°): no reply within the response timeout (150 ms).');
  });
});
