/**
 * Replies to a sequence: waits for a step's reply in the timing (worst case, timeouts counted) and the
 * received replies split per step. Commands and replies in the demo drive's syntax (src/lib/composer/demo.ts,
 * our own invention). Expected values worked out with Python, not by the code under test:
 *   times: fractions.Fraction(10, 9600) * 1000 per character at 9600 8-N-1, plus the delays and timeouts;
 *   XOR-8 checks: functools.reduce(lambda a, b: a ^ b, s.encode(), 0) over the characters before `*`.
 */
import { describe, expect, test } from 'vitest';
import { type SequenceStepInput, assembleSequence, decodeSequenceReply, sequenceSchema } from '~/lib/frame';
import { statusQueryTemplate, statusReplyTemplate } from '~/lib/composer/demo';
import { hexOf, tpl } from './helpers';

const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', min: 1, max: 31 } as const;
const cr = { type: 'terminator', id: 'cr', bytes: '0D' } as const;
const lit = (text: string) => ({ type: 'literal', id: 'verb', bytes: hexOf(text) }) as const;
const perRev = { factor: 36000 };
const setting = (arg: string, name: string) => tpl([address, lit(`!SET:/${arg}`), { type: 'integer', id: name, name, label: name, scale: perRev, min: 0.01, max: 50 }, cr]);
const index = tpl([address, lit('!IDX:'), { type: 'integer', id: 'angle', name: 'angle', label: 'Index angle', scale: { factor: 36000, divisor: 360 }, sign: 'always', min: -360, max: 360 }, cr]);
const latin1 = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));

// 15, 15, 14 and 12 bytes (python3: len(b'1!SET:/R180000\r'), …)
const move = (waits: (number | undefined)[]): SequenceStepInput[] => [
  { template: setting('R', 'accel'), values: { address: 1, accel: 5 }, reply: statusReplyTemplate, waitForReplyMs: waits[0] },
  { template: setting('F', 'decel'), values: { address: 1, decel: 4 }, waitForReplyMs: waits[1] },
  { template: setting('S', 'speed'), values: { address: 1, speed: 0.5 }, reply: statusReplyTemplate, waitForReplyMs: waits[2] },
  { template: index, values: { address: 1, angle: 45 }, reply: statusReplyTemplate, waitForReplyMs: waits[3] },
].map((s) => (s.waitForReplyMs === undefined ? (({ waitForReplyMs: _w, ...rest }) => rest)(s) : s));

describe('waiting for replies between separate sends', () => {
  test('worst case: each waiting step\'s whole timeout and the delay before the next send', () => {
    const s = assembleSequence(move([100, undefined, 100, 50]), { mode: 'separate', delayMs: 5 });
    expect(s.findings).toEqual([]);
    // python3: 56 chars × 10/9600 s = 58.333 ms; delays 3 × 5; timeouts before the last send 100 + 100; the last waits 50 more
    expect(s.timing).toMatchObject({ frameTimeMs: 58.333333, sends: 4, delayTotalMs: 15, waitTotalMs: 200, totalMs: 273.333333, worstCaseMs: 323.333333 });
    // python3: starts 0, 15.625 + 100 + 5 = 120.625, + 15.625 + 5 = 141.25, + 14.583333 + 100 + 5 = 260.833333
    expect(s.steps.map((x) => x.startMs)).toEqual([0, 120.625, 141.25, 260.833333]);
    expect(s.steps.map((x) => x.waitForReplyMs)).toEqual([100, undefined, 100, 50]);
    expect(s.steps.map((x) => x.expectsReply)).toEqual([true, undefined, true, true]);
  });

  test('no waits: the timing is as before (no wait, worst case = total)', () => {
    const s = assembleSequence(move([]), { mode: 'separate', delayMs: 5 });
    // python3: 58.333333 + 3 × 5
    expect(s.timing).toMatchObject({ totalMs: 73.333333, waitTotalMs: 0, worstCaseMs: 73.333333 });
    const one = assembleSequence(move([]));
    expect(one.timing).toMatchObject({ totalMs: 58.333333, waitTotalMs: 0, worstCaseMs: 58.333333 });
    expect(one.steps[0]!.startMs).toBeUndefined();
  });

  test('a wait without a reply, or in one string, is a warning and counts nothing', () => {
    const noReply = assembleSequence(move([undefined, 80]), { mode: 'separate' });
    expect(noReply.findings.map((f) => [f.code, f.step])).toEqual([['step-wait-without-reply', 1]]);
    expect(noReply.timing.waitTotalMs).toBe(0);
    const oneString = assembleSequence(move([100]));
    expect(oneString.findings.map((f) => f.code)).toEqual(['step-wait-in-one-string']);
    expect(oneString.timing.totalMs).toBe(58.333333);
    const bad = assembleSequence(move([-1]), { mode: 'separate' });
    expect(bad.findings.map((f) => [f.severity, f.code])).toEqual([['error', 'field-invalid']]);
  });

  test('the request schema: a wait needs separate sends and a reply template', () => {
    const body = (mode: string, step: object) => ({ mode, steps: [{ template: index, values: { address: 1, angle: 45 }, ...step }] });
    expect(sequenceSchema.safeParse(body('separate', { reply: statusReplyTemplate, waitForReplyMs: 200 })).success).toBe(true);
    const paths = (r: ReturnType<typeof sequenceSchema.safeParse>) => (r.success ? [] : r.error.issues.map((i) => i.path.join('.')));
    expect(paths(sequenceSchema.safeParse(body('one-string', { reply: statusReplyTemplate, waitForReplyMs: 200 })))).toEqual(['steps.0.waitForReplyMs']);
    expect(paths(sequenceSchema.safeParse(body('separate', { waitForReplyMs: 200 })))).toEqual(['steps.0.waitForReplyMs']);
    expect(paths(sequenceSchema.safeParse(body('separate', { reply: statusReplyTemplate, waitForReplyMs: 60_001 })))).toEqual(['steps.0.waitForReplyMs']);
  });
});

describe('the replies of a sequence, split per step', () => {
  // python3: XOR-8 of "1=STA:+0004500,R" = 0x14, of "1=STA:+0009000,M" = 0x03; each reply 20 bytes
  const first = '1=STA:+0004500,R*14\r';
  const second = '1=STA:+0009000,M*03\r';
  const replies = [statusReplyTemplate, null, statusReplyTemplate];

  test('each step\'s reply in order, with its own fields and checksum verdict; a step without a reply takes no bytes', () => {
    const r = decodeSequenceReply(replies, latin1(first + second));
    expect(r.ok).toBe(true);
    expect(r.findings).toEqual([]);
    expect(r.steps.map((s) => [s.step, s.start, s.end, s.ok])).toEqual([[0, 0, 20, true], [2, 20, 40, true]]);
    expect(r.steps[0]!.fields.position).toMatchObject({ text: '+0004500', value: 45, range: [6, 14] });
    expect(r.steps[1]!.fields.state).toMatchObject({ value: 'moving', range: [35, 36] });
    expect(r.steps.map((s) => s.checksums.map((c) => [c.segmentId, c.expected, c.received, c.ok]))).toEqual([[['bcc', 0x14, 0x14, true]], [['bcc', 0x03, 0x03, true]]]);
    // segments keep their own ids and indexes within their step's template
    expect(r.steps[1]!.segments[0]).toMatchObject({ index: 0, id: 'addr', start: 20, end: 21 });
  });

  test('a corrupted check in the second reply: that step\'s verdict only', () => {
    const r = decodeSequenceReply(replies, latin1(first + second.replace('*03', '*04')));
    expect(r.ok).toBe(false);
    expect(r.steps.map((s) => s.ok)).toEqual([true, false]);
    expect(r.steps[1]!.checksums[0]).toMatchObject({ expected: 0x03, received: 0x04, ok: false, range: [37, 39] });
    expect(r.steps[1]!.findings.map((f) => f.code)).toEqual(['checksum-mismatch']);
    expect(r.steps[1]!.findings[0]!.message).toMatch(/^Step 3: /);
  });

  test('a reply cut short names the step it ran out in; bytes after the last reply are the sequence\'s', () => {
    const short = decodeSequenceReply(replies, latin1(first + second.slice(0, 10)));
    expect(short.steps[0]!.ok).toBe(true);
    expect(short.steps[1]!.findings.map((f) => f.code)).toContain('reply-too-short');
    const extra = decodeSequenceReply(replies, latin1(first + second + 'X'));
    expect(extra.steps.map((s) => s.ok)).toEqual([true, true]);
    expect(extra.findings.map((f) => [f.code, f.range])).toEqual([['reply-extra-bytes', [40, 41]]]);
  });

  test('a checksum from the start of its template covers only its own step\'s reply', () => {
    // the status query's check covers segments 0-1 ("1?STA"); python3: XOR-8 of "1?STA" = 0x48
    const query = '1?STA*48\r';
    const r = decodeSequenceReply([statusQueryTemplate, statusQueryTemplate], latin1(query + query));
    expect(r.steps.map((s) => s.checksums[0]!.ok)).toEqual([true, true]);
    expect(r.steps[1]!.checksums[0]!.range).toEqual([15, 17]);
  });

  test('empty input and edge bytes: no step expecting a reply, and replies of 0x00, 0x7F, 0x80, 0xFF', () => {
    expect(decodeSequenceReply([null, null], new Uint8Array())).toEqual({ ok: true, steps: [], findings: [] });
    const stray = decodeSequenceReply([null], Uint8Array.of(0x00, 0x7f, 0x80, 0xff));
    expect(stray.findings.map((f) => [f.code, f.range])).toEqual([['reply-extra-bytes', [0, 4]]]);
    const raw = tpl([{ type: 'literal', id: 'a', bytes: '00 7F' }]);
    const raw2 = tpl([{ type: 'literal', id: 'b', bytes: '80 FF' }]);
    const r = decodeSequenceReply([raw, raw2], Uint8Array.of(0x00, 0x7f, 0x80, 0xff));
    expect(r.steps.map((s) => [s.start, s.end, s.ok])).toEqual([[0, 2, true], [2, 4, true]]);
    const wrong = decodeSequenceReply([raw, raw2], Uint8Array.of(0x00, 0x7f, 0x80, 0xfe));
    expect(wrong.steps.map((s) => s.findings.map((f) => f.code))).toEqual([[], ['reply-mismatch']]);
    expect(decodeSequenceReply([raw], new Uint8Array()).steps[0]!.findings.map((f) => f.code)).toEqual(['reply-too-short']);
  });
});
