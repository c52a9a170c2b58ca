/**
 * The public sequence tool through the running server (the handler alone is in tests/frame/tools-api.test.ts,
 * the engine in tests/frame/sequence.test.ts). Commands in the demo drive's invented syntax
 * (src/lib/composer/demo.ts); expected bytes and times worked out with Python (`python3 -c`).
 */
import { describe, expect, inject, test } from 'vitest';

/** Like a script would call it: JSON, no Origin header, no session. */
const post = async (body: unknown) => {
  const res = await fetch(`${inject('baseUrl')}/api/tools/sequence`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as any };
};
const hex = (text: string) => Buffer.from(text, 'latin1').toString('hex').toUpperCase().replace(/(..)(?!$)/g, '$1 ');
const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', min: 1, max: 31 };
const cr = { type: 'terminator', id: 'cr', bytes: '0D' };
const setting = (arg: string, name: string, max: number) => ({
  version: 1,
  segments: [address, { type: 'literal', id: 'verb', bytes: hex(`!SET:/${arg}`) }, { type: 'integer', id: name, name, label: name, scale: { factor: 36000 }, min: 0.01, max }, cr],
});
const index = {
  version: 1,
  segments: [address, { type: 'literal', id: 'verb', bytes: hex('!IDX:') }, { type: 'integer', id: 'angle', name: 'angle', label: 'Index angle', scale: { factor: 36000, divisor: 360 }, sign: 'always', min: -360, max: 360 }, cr],
};
const rules = { frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper', maxLength: 64 } };
const steps = [
  { template: setting('R', 'accel', 50), values: { address: 1, accel: 5 } },
  { template: setting('F', 'decel', 50), values: { address: 1, decel: 4 } },
  { template: setting('S', 'speed', 10), values: { address: 1, speed: 0.5 } },
  { template: index, values: { address: 1, angle: 45 } },
];

describe('POST /api/tools/sequence through the running server', () => {
  test('four commands in one PLC string: bytes, spans, the literal with four $0D, time at 9600 8-N-1', async () => {
    const r = await post({ steps, settings: rules });
    expect(r.status).toBe(200);
    // python3: 15 + 15 + 14 + 12 = 56 bytes; 56 × 10 / 9600 s = 58.333 ms; widest 17 + 17 + 16 + 14 = 64
    // ("31", 50 rev/s² = "1800000", 10 rev/s = "360000", "+36000")
    expect(r.body).toMatchObject({
      ok: true, mode: 'one-string', byteCount: 56, findings: [],
      notations: { iecLiteral: "'1!SET:/R180000$0D1!SET:/F144000$0D1!SET:/S18000$0D1!IDX:+4500$0D'" },
      plcString: { scope: 'whole-string', capacity: null, length: 56, longestLength: 64 },
      timing: { port: '9600 8-N-1', frameTimeMs: 58.333333, sends: 1, totalMs: 58.333333 },
    });
    expect(r.body.steps.map((s: any) => [s.index, s.start, s.end, s.byteCount])).toEqual([[0, 0, 15, 15], [1, 15, 30, 15], [2, 30, 44, 14], [3, 44, 56, 12]]);
  });

  test('findings carry whole-string ranges and the step they come from', async () => {
    // angle 400° is above 360°: step 4 starts at 44, "1!IDX:" is 6 bytes, "+40000" is bytes 50-55; capacity 60 < widest 64
    const r = await post({ steps: [...steps.slice(0, 3), { template: index, values: { address: 1, angle: 400 } }], settings: rules, plcStringCapacity: 60 });
    expect(r.status).toBe(200);
    expect(r.body.ok).toBe(false);
    expect(r.body.findings.map((f: any) => ({ code: f.code, step: f.step, range: f.range }))).toEqual([
      { code: 'field-out-of-range', step: 3, range: [50, 56] },
      { code: 'plc-string-may-overflow', step: undefined, range: undefined },
    ]);
    expect(r.body.steps[3].findings).toEqual([r.body.findings[0]]);
  });

  test('separate sends add the delays; bad input answers 422 with fields', async () => {
    // python3: 56 * 10 / 9600 * 1000 + 3 * 25 = 133.333…
    const r = await post({ steps, settings: rules, mode: 'separate', delayMs: 25 });
    expect(r.body.timing).toMatchObject({ frameTimeMs: 58.333333, sends: 4, delayMs: 25, delayTotalMs: 75, totalMs: 133.333333 });
    const tooMany = await post({ steps: Array.from({ length: 33 }, () => steps[0]) });
    expect(tooMany).toMatchObject({ status: 422, body: { error: 'steps: A sequence has at most 32 steps', fields: { steps: 'A sequence has at most 32 steps' } } });
    const delay = await post({ steps, delayMs: 5 });
    expect(delay).toMatchObject({ status: 422, body: { fields: { delayMs: expect.stringContaining('separate') } } });
  });
});
