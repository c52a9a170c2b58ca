/**
 * Command sequences. The commands are in the demo drive's syntax (src/lib/composer/demo.ts, our own
 * invention): `<address>!<VERB>:<args>`, arguments `/<letter><number>`, a carriage return after each.
 * Expected bytes, spans and times were worked out with Python (`python3 -c`, exact fractions for the
 * scaling, `len(s) * 10 / 9600 * 1000` for the time at 9600 8-N-1), not by the code under test.
 */
import { describe, expect, test } from 'vitest';
import { type SequenceStepInput, type Template, assembleSequence, checkFrame, defaultPortSettings, longestFrame, portSettingsSchema } from '~/lib/frame';
import { hexOf, tpl } from './helpers';

const codes = (f: { code: string }[]) => f.map((x) => x.code);
const errors = (f: { severity: string }[]) => f.filter((x) => x.severity === 'error');

const address = { type: 'integer', id: 'addr', name: 'address', label: 'Drive address', min: 1, max: 31 } as const;
const cr = { type: 'terminator', id: 'cr', bytes: '0D' } as const;
const lit = (text: string) => ({ type: 'literal', id: 'verb', bytes: hexOf(text) }) as const;
/** rev/s and rev/s² to steps/s and steps/s² at 36,000 steps per revolution. */
const perRev = { factor: 36000 };
const setting = (arg: string, name: string, label: string, max: number) =>
  tpl([address, lit(`!SET:/${arg}`), { type: 'integer', id: name, name, label, scale: perRev, min: 0.01, max }, cr]);
/** 45° at 36,000 steps per revolution = 4,500 steps: the scaled-number field (factor 36000, divisor 360). */
const index = tpl([address, lit('!IDX:'), { type: 'integer', id: 'angle', name: 'angle', label: 'Index angle', unit: '°', scale: { factor: 36000, divisor: 360 }, sign: 'always', min: -360, max: 360 }, cr]);

const move: SequenceStepInput[] = [
  { template: setting('R', 'accel', 'Acceleration', 50), values: { address: 1, accel: 5 } },
  { template: setting('F', 'decel', 'Deceleration', 50), values: { address: 1, decel: 4 } },
  { template: setting('S', 'speed', 'Velocity', 10), values: { address: 1, speed: 0.5 } },
  { template: index, values: { address: 1, angle: 45 } },
];
/** The demo drive's service port (src/lib/server/seed/commands.ts): 9600 8-N-1, CR-terminated printable uppercase ASCII. */
const demoPort = portSettingsSchema.parse({ frameRules: { terminator: '0D', byteSet: 'printable', letterCase: 'upper', maxLength: 64, addressRange: { min: 1, max: 31 } } });
const withRules = (rules: object) => portSettingsSchema.parse({ frameRules: rules });

// python3: b'1!SET:/R180000\r' + b'1!SET:/F144000\r' + b'1!SET:/S18000\r' + b'1!IDX:+4500\r'
const MOVE_HEX = '31 21 53 45 54 3A 2F 52 31 38 30 30 30 30 0D 31 21 53 45 54 3A 2F 46 31 34 34 30 30 30 0D 31 21 53 45 54 3A 2F 53 31 38 30 30 30 0D 31 21 49 44 58 3A 2B 34 35 30 30 0D';
const MOVE_IEC = "'1!SET:/R180000$0D1!SET:/F144000$0D1!SET:/S18000$0D1!IDX:+4500$0D'";

describe('one string of four commands', () => {
  const s = assembleSequence(move, { settings: demoPort });

  test('bytes, byte count, notations: four CRs, the IEC 61131-3 literal with four $0D', () => {
    expect(s.mode).toBe('one-string');
    expect(s.notations.hex).toBe(MOVE_HEX);
    expect(s.byteCount).toBe(56);
    expect(s.bytes.filter((b) => b === 0x0d).length).toBe(4);
    expect(s.notations.iecLiteral).toBe(MOVE_IEC);
    expect(s.notations.iecLiteral.split('$0D').length - 1).toBe(4);
    expect(s.notations.escaped).toBe('1!SET:/R180000\\r1!SET:/F144000\\r1!SET:/S18000\\r1!IDX:+4500\\r');
  });

  test('no findings: each step is checked as its own frame, so the CR ending a step is correct', () => {
    expect(s.findings).toEqual([]);
    expect(s.ok).toBe(true);
    for (const step of s.steps) expect(step.findings).toEqual([]);
    // the same bytes checked as one frame: every inner CR is reported twice (cut short, and not printable)
    const whole = checkFrame(s.bytes, undefined, demoPort.frameRules);
    expect(codes(whole).sort()).toEqual(['byte-outside-set', 'byte-outside-set', 'byte-outside-set', 'terminator-in-payload', 'terminator-in-payload', 'terminator-in-payload']);
  });

  test('per-step spans in whole-string offsets, end exclusive; byte counts and times at 9600 8-N-1', () => {
    // python3: lengths 15, 15, 14, 12; each × 10 / 9600 s
    expect(s.steps.map(({ index, start, end, byteCount, frameTimeMs }) => ({ index, start, end, byteCount, frameTimeMs }))).toEqual([
      { index: 0, start: 0, end: 15, byteCount: 15, frameTimeMs: 15.625 },
      { index: 1, start: 15, end: 30, byteCount: 15, frameTimeMs: 15.625 },
      { index: 2, start: 30, end: 44, byteCount: 14, frameTimeMs: 14.583333 },
      { index: 3, start: 44, end: 56, byteCount: 12, frameTimeMs: 12.5 },
    ]);
    // "1!IDX:" is 6 bytes from 44, so the distance field is bytes 50-54: "+4500"
    expect(s.steps[3]!.segments[2]).toMatchObject({ id: 'angle', start: 50, end: 55, value: 45, raw: 4500 });
    expect(s.steps[3]!.segments[3]).toMatchObject({ type: 'terminator', start: 55, end: 56 });
  });

  test('time on the wire: 56 bytes × 10 bits ÷ 9600 bit/s = 58.333 ms', () => {
    // python3: 56 * 10 / 9600 * 1000 = 58.3333…; published 9600 8-N-1 character time 1.04167 ms
    expect(s.timing).toMatchObject({ port: '9600 8-N-1', bitsPerChar: 10, charsPerSecond: 960, charTimeMs: 1.041667, frameTimeMs: 58.333333, sends: 1, delayMs: 0, delayTotalMs: 0, totalMs: 58.333333 });
  });

  test('PLC string length: one character per byte, though the literal writes each CR as three', () => {
    // 45 printable characters + 4 CRs = 56 + 4 × 2 extra for "$0D" + 2 quotes = 66 characters of literal text
    expect(s.plcString).toEqual({ scope: 'whole-string', capacity: null, length: 56, longestLength: 64 });
    expect(MOVE_IEC.length).toBe(66);
  });

  test('the frame rules\' maxLength is the device\'s limit per step, not the whole string', () => {
    expect(assembleSequence(move, { settings: withRules({ terminator: '0D', maxLength: 15 }) }).findings).toEqual([]);
    const short = assembleSequence(move, { settings: withRules({ terminator: '0D', maxLength: 14 }) });
    expect(short.findings.map(({ code, step, range }) => ({ code, step, range }))).toEqual([
      { code: 'frame-too-long', step: 0, range: [14, 15] },
      { code: 'frame-too-long', step: 1, range: [29, 30] },
    ]);
    expect(short.findings[1]!.message).toMatch(/^Step 2: The frame is 15 bytes/);
  });
});

describe('findings inside a step', () => {
  const tag = tpl([address, lit('!TAG:'), { type: 'text', id: 'tag', name: 'tag', label: 'Tag', maxLength: 8 }, cr]);

  test('a CR inside a text field value is still an error, at its whole-string offset', () => {
    // step 1 is 15 bytes; step 2 "1!TAG:" (6) + "AB\rC" + CR: the field's CR at 15 + 6 + 2 = 23, the terminator at 25
    const s = assembleSequence([move[0]!, { template: tag, values: { address: 1, tag: 'AB\rC' } }], { settings: demoPort });
    expect(s.ok).toBe(false);
    expect(s.steps[1]).toMatchObject({ start: 15, end: 26 });
    const found = s.findings.map(({ code, step, range }) => ({ code, step, range }));
    expect(found).toContainEqual({ code: 'terminator-in-payload', step: 1, range: [23, 24] });
    expect(found).toContainEqual({ code: 'field-invalid-char', step: 1, range: [23, 24] });
    expect(found).toContainEqual({ code: 'byte-outside-set', step: 1, range: [23, 24] });
    expect(found.every((f) => f.range?.[0] === 23)).toBe(true);
    expect(s.steps[0]!.findings).toEqual([]);
    expect(s.steps[1]!.findings).toEqual(s.findings);
  });

  test('field findings keep the field\'s span, shifted to the whole string', () => {
    // angle 400° is above the maximum 360°; step 4's field is bytes 50-55 (python3: "+40000" is 6 characters)
    const s = assembleSequence([...move.slice(0, 3), { template: index, values: { address: 1, angle: 400 } }], { settings: demoPort });
    expect(s.findings.map(({ code, step, range }) => ({ code, step, range }))).toEqual([{ code: 'field-out-of-range', step: 3, range: [50, 56] }]);
  });

  test('checksum protocol checks run per step too', () => {
    // Modbus over Serial Line V1.02, 2.5.1.2: CRC-16/MODBUS is sent low byte first
    const rtu = (byteOrder: 'low-first' | 'high-first') => tpl([{ type: 'literal', id: 'p', bytes: '02 07' }, { type: 'checksum', id: 'crc', algorithm: 'CRC-16/MODBUS', byteOrder }]);
    const s = assembleSequence([{ template: rtu('low-first') }, { template: rtu('high-first') }], { settings: portSettingsSchema.parse({ protocol: 'modbus-rtu' }), mode: 'separate' });
    // 02 07 gives 0x1241 (Modbus guide 6.2.2): 02 07 41 12 then 02 07 12 41
    expect(s.notations.hex).toBe('02 07 41 12 02 07 12 41');
    expect(s.findings.map(({ code, step, range }) => ({ code, step, range }))).toEqual([{ code: 'checksum-byte-order', step: 1, range: [6, 8] }]);
  });
});

describe('PLC string capacity', () => {
  test('the widest case exceeds the capacity though the actual string fits: an error', () => {
    // widest (python3): address "31" 2, accel and decel "1800000" 7, velocity "360000" 6, angle "+36000" 6:
    // 2+7+7+1, 2+7+7+1, 2+7+6+1, 2+5+6+1 = 17 + 17 + 16 + 14 = 64
    const s = assembleSequence(move, { settings: demoPort, plcStringCapacity: 60 });
    expect(s.plcString).toEqual({ scope: 'whole-string', capacity: 60, length: 56, longestLength: 64 });
    expect(s.steps.map((x) => x.longestByteCount)).toEqual([17, 17, 16, 14]);
    expect(s.ok).toBe(false);
    expect(s.findings).toEqual([{ severity: 'error', code: 'plc-string-may-overflow', message: expect.stringContaining('64 characters, more than the 60') }]);
    expect(s.findings[0]!.message).toContain('STRING[64]');
  });
  test('widest exactly at the capacity: no finding', () => {
    expect(assembleSequence(move, { settings: demoPort, plcStringCapacity: 64 }).findings).toEqual([]);
  });
  test('the actual string exceeds the capacity: an error over the characters that do not fit', () => {
    const s = assembleSequence(move, { settings: demoPort, plcStringCapacity: 55 });
    expect(s.findings).toMatchObject([{ severity: 'error', code: 'plc-string-too-long', range: [55, 56] }]);
    expect(s.findings[0]!.message).toContain('56 characters; the PLC string holds 55');
  });
  test('a text field without maxLength leaves the string unbounded', () => {
    const free = tpl([address, lit('!TAG:'), { type: 'text', id: 'tag', name: 'tag', label: 'Tag' }, cr]);
    const s = assembleSequence([move[0]!, { template: free, values: { address: 1, tag: 'A' } }], { plcStringCapacity: 80 });
    expect(s.plcString).toMatchObject({ length: 15 + 8, longestLength: null });
    expect(s.findings).toMatchObject([{ code: 'plc-string-may-overflow', severity: 'error' }]);
    expect(s.findings[0]!.message).toContain('"Tag" (step 2) has no maxLength');
  });
  test('a number without width or limits is counted at 32 characters, and named', () => {
    const open = tpl([lit('!JOG:'), { type: 'integer', id: 'n', name: 'n', label: 'Steps' }, cr]);
    // "!JOG:" 5 + 32 + CR 1 = 38 (MAX_NUMBER_CHARS, the widest a number field sends)
    const s = assembleSequence([{ template: open, values: { n: 7 } }], { plcStringCapacity: 30 });
    expect(s.plcString).toMatchObject({ length: 7, longestLength: 38 });
    expect(s.findings[0]!.message).toContain('"Steps" (step 1) has no width and no min and max, so it is counted at 32 characters');
  });
  test('longest frame per field kind', () => {
    // width: 8; choice: longest send "FAST" 4; XOR-8 as ASCII hex: 2 characters; decimal -1.5..2.25 with 2
    // decimals: "-1.50" 5 (longer than "2.25"); literal 2 bytes; terminator CR LF 2 → 8 + 4 + 2 + 5 + 2 + 2 = 23
    const t = tpl([
      { type: 'literal', id: 'l', bytes: '00 FF' },
      { type: 'integer', id: 'w', name: 'w', label: 'W', width: 8 },
      { type: 'choice', id: 'c', name: 'c', label: 'C', options: [{ value: 'slow', send: 'S' }, { value: 'fast', send: 'FAST' }] },
      { type: 'decimal', id: 'd', name: 'd', label: 'D', decimals: 2, min: -1.5, max: 2.25 },
      { type: 'checksum', id: 'x', algorithm: 'XOR-8', encoding: 'ascii-hex' },
      { type: 'terminator', id: 'e', bytes: '0D 0A' },
    ]);
    expect(longestFrame(t)).toEqual({ byteCount: 23, unlimited: [] });
  });
  test('separate sends: the capacity applies to each step\'s own string', () => {
    // steps 15, 15, 14, 12 bytes; widest 17, 17, 16, 14
    const s = assembleSequence(move, { settings: demoPort, mode: 'separate', plcStringCapacity: 14 });
    expect(s.plcString).toEqual({ scope: 'each-step', capacity: 14, length: 15, longestLength: 17 });
    expect(s.findings.map(({ code, step, range }) => ({ code, step, range }))).toEqual([
      { code: 'plc-string-too-long', step: 0, range: [14, 15] },
      { code: 'plc-string-too-long', step: 1, range: [29, 30] },
      { code: 'plc-string-may-overflow', step: 2, range: undefined },
    ]);
    expect(s.steps[2]!.findings[0]!.message).toMatch(/^With every field at its widest, step 3 is 16 characters/);
    expect(assembleSequence(move, { settings: demoPort, mode: 'separate', plcStringCapacity: 17 }).findings).toEqual([]);
  });
});

describe('separate sends', () => {
  test('timing: the whole string\'s time on the wire plus a delay between each two sends', () => {
    // python3: 56 * 10 / 9600 * 1000 + 3 * 20 = 118.3333…
    const s = assembleSequence(move, { settings: demoPort, mode: 'separate', delayMs: 20 });
    expect(s.mode).toBe('separate');
    expect(s.timing).toMatchObject({ frameTimeMs: 58.333333, sends: 4, delayMs: 20, delayTotalMs: 60, totalMs: 118.333333 });
    expect(s.findings).toEqual([]);
    expect(s.notations.hex).toBe(MOVE_HEX);
  });
  test('a step without a terminator: a warning in one string, not when sent separately', () => {
    const bare = tpl([address, lit('!STP')]);
    const steps = [{ template: bare, values: { address: 1 } }, move[3]!];
    const one = assembleSequence(steps);
    expect(one.findings).toMatchObject([{ severity: 'warning', code: 'step-unterminated', step: 0 }]);
    expect(one.ok).toBe(true);
    expect(assembleSequence(steps, { mode: 'separate' }).findings).toEqual([]);
    // with the device's terminator in the rules, the step check itself says it is missing
    expect(codes(assembleSequence(steps, { settings: withRules({ terminator: '0D' }) }).findings)).toEqual(['missing-terminator']);
  });
  test('a delay in one-string mode is ignored', () => {
    expect(assembleSequence(move, { delayMs: 50 }).timing).toMatchObject({ sends: 1, delayMs: 0, totalMs: 58.333333 });
  });
});

describe('edge bytes and empty input', () => {
  test('0x00, 0x7F, 0x80, 0xFF pass through unchanged across steps', () => {
    const s = assembleSequence([{ template: tpl([{ type: 'literal', id: 'a', bytes: '00 7F' }]) }, { template: tpl([{ type: 'literal', id: 'b', bytes: '80 FF' }]) }], { mode: 'separate' });
    expect(s.notations.hex).toBe('00 7F 80 FF');
    expect(s.notations.iec).toBe('$00$7F$80$FF');
    expect(s.steps.map((x) => [x.start, x.end])).toEqual([[0, 2], [2, 4]]);
    expect(s.findings).toEqual([]);
    // on 7 data bits 0x80 and 0xFF do not fit (step 2, bytes 2 and 3 of the whole string)
    const seven = assembleSequence([{ template: tpl([{ type: 'literal', id: 'a', bytes: '00 7F' }]) }, { template: tpl([{ type: 'literal', id: 'b', bytes: '80 FF' }]) }], { settings: { ...defaultPortSettings, dataBits: 7 }, mode: 'separate' });
    expect(seven.findings.map(({ code, range }) => ({ code, range }))).toEqual([{ code: 'byte-exceeds-data-bits', range: [2, 3] }, { code: 'byte-exceeds-data-bits', range: [3, 4] }]);
  });
  test('an empty step and an empty sequence are warnings', () => {
    const empty = assembleSequence([{ template: tpl([]) }], { mode: 'separate' });
    expect(empty.findings).toMatchObject([{ code: 'empty-frame', severity: 'warning', step: 0 }]);
    const none = assembleSequence([]);
    expect(none).toMatchObject({ ok: true, byteCount: 0, steps: [], findings: [{ code: 'empty-frame', severity: 'warning' }], timing: { frameTimeMs: 0, sends: 0, totalMs: 0 } });
    expect(none.plcString).toEqual({ scope: 'whole-string', capacity: null, length: 0, longestLength: 0 });
  });
  test('options given in code without the schema: a finding each, never a throw', () => {
    for (const plcStringCapacity of [0, -1, 1.5, Number.NaN, Number.POSITIVE_INFINITY]) {
      const s = assembleSequence(move, { plcStringCapacity });
      expect(codes(s.findings)).toEqual(['field-invalid']);
      expect(s.plcString.capacity).toBeNull();
    }
    expect(codes(assembleSequence(move, { mode: 'both' as never }).findings)).toEqual(['field-invalid']);
    // templates built in code without the schema: limits that are not numbers count as no limit
    const typed = { version: 1, segments: [
      { type: 'integer', id: 'a', name: 'a', label: 'A', width: Number.POSITIVE_INFINITY, pad: 'zero', sign: 'negative' },
      { type: 'integer', id: 'b', name: 'b', label: 'B', min: Number.NEGATIVE_INFINITY, max: Number.NaN, pad: 'zero', sign: 'negative' },
      { type: 'text', id: 't', name: 't', label: 'T', maxLength: Number.NaN, case: 'as-is' },
    ] } as unknown as Template;
    expect(longestFrame(typed)).toMatchObject({ byteCount: null, unlimited: [{ id: 'b', countedAs: 32 }, { id: 't', countedAs: null }] });
    expect(assembleSequence([{ template: typed, values: { a: 1, b: 2, t: 'x' } }], { plcStringCapacity: 80 }).findings.map((f) => f.code)).toEqual(['field-invalid', 'plc-string-may-overflow']);
    const late = assembleSequence(move, { mode: 'separate', delayMs: -1 });
    expect(codes(late.findings)).toEqual(['field-invalid']);
    expect(late.timing.delayTotalMs).toBe(0);
  });
});
