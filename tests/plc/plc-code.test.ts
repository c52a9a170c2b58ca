/**
 * Generated Structured Text, run in the test evaluator (tests/plc/st-eval.ts), against the frame engine's
 * bytes: the demo drive's commands as fixed cases, then random templates and values.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { indexMoveTemplate, jogTemplate, statusQueryTemplate } from '~/lib/composer/demo';
import { type FieldValues, type Template, type TemplateInput, assembleFrame, listChecksumAlgorithms, templateSchema } from '~/lib/frame';
import { type PlcCode, generatePlcCode } from '~/lib/frame/plc-code';
import { ascii, hex, runPlc, scaledText } from './helpers';

const parse = (t: TemplateInput | Template) => templateSchema.parse(t);
const gen = (t: TemplateInput | Template, name = 'Test', fixed?: FieldValues, form?: 'string' | 'bytes') => {
  const r = generatePlcCode([{ template: parse(t), ...(fixed ? { fixed } : {}) }], { name, ...(form ? { form } : {}) });
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
};

describe('the demo drive', () => {
  it('index move: hundredths of a degree in, the seeded command out', () => {
    const code = gen(indexMoveTemplate, 'Index 45°', undefined);
    expect(code.name).toBe('Index_45');
    expect(code.form).toBe('string');
    const angle = code.inputs.find((i) => i.field === 'angle')!;
    // 36,000 steps per 360°: one step is 0.01°, so the input counts hundredths of a degree
    expect(angle).toMatchObject({ name: 'angle', inputDecimals: 2, lo: -36000, hi: 36000 });
    // accel 5 rev/s², decel 5, speed 0.5 rev/s in 0.00001 units
    const run = runPlc(code, { address: 1, angle: 4500, accel: 500000, decel: 500000, speed: 50000 });
    expect(run.error).toBe(0);
    expect(hex(run.bytes)).toBe(hex(ascii('1!IDX:+4500/R180000/F180000/S18000\r')));
    expect(code.code).toContain('FUNCTION Index_45 : STRING(');
    expect(code.code).toContain("'$0D'");
  });

  it('index move: every angle in range gives the engine bytes, out of range an error', () => {
    const code = gen(indexMoveTemplate, 'Index');
    fc.assert(fc.property(fc.integer({ min: -36001, max: 36001 }), fc.integer({ min: 9999, max: 5000001 }), fc.integer({ min: 999, max: 1000001 }), (angle, accel, speed) => {
      const run = runPlc(code, { address: 7, angle, accel, decel: accel, speed });
      const frame = assembleFrame(parse(indexMoveTemplate), { address: 7, angle: scaledText(angle, 2), accel: scaledText(accel, 5), decel: scaledText(accel, 5), speed: scaledText(speed, 5) });
      if (frame.ok) expect([run.error, hex(run.bytes)]).toEqual([0, hex(frame.bytes)]);
      else expect(run.error).not.toBe(0);
    }), { numRuns: 400 });
  });

  it.each([['+', 100, '1!JOG:+100\r'], ['-', -100, '1!JOG:-100\r'], ['+', 5, '1!JOG:+5\r'], ['-', 0, '1!JOG:+0\r']] as const)('jog %s: angle %i sends %j', (dir, angle, sent) => {
    const code = gen(jogTemplate(dir), `Jog ${dir === '+' ? '+' : '−'}1°`);
    expect(code.name).toBe(dir === '+' ? 'Jog_Plus_1' : 'Jog_Minus_1');
    expect(code.inputs.map((i) => i.name)).toEqual(['address', 'angle']);
    const run = runPlc(code, { address: 1, angle });
    expect([run.error, hex(run.bytes)]).toEqual([0, hex(ascii(sent))]);
  });

  it('jogs: run-time distance over the whole range, as the engine', () => {
    for (const dir of ['+', '-'] as const) {
      const t = parse(jogTemplate(dir));
      const code = gen(t, 'Jog');
      fc.assert(fc.property(fc.integer({ min: -1001, max: 1001 }), fc.integer({ min: 0, max: 32 }), (angle, address) => {
        const run = runPlc(code, { address, angle });
        const frame = assembleFrame(t, { address, angle: scaledText(angle, 2) });
        if (frame.ok) expect([run.error, hex(run.bytes)]).toEqual([0, hex(frame.bytes)]);
        else expect(run.error).not.toBe(0);
      }), { numRuns: 300 });
    }
  });

  it('a preset fixes its values as constants', () => {
    const code = gen(indexMoveTemplate, 'Index one station', { angle: 45 });
    expect(code.inputs.map((i) => i.field)).toEqual(['address', 'accel', 'decel', 'speed']);
    expect(code.code).toContain("'+4500'");
    const run = runPlc(code, { address: 2, accel: 100000, decel: 200000, speed: 5000 });
    expect(hex(run.bytes)).toBe(hex(ascii('2!IDX:+4500/R36000/F72000/S1800\r')));
  });

  it('status query: XOR-8 as hex characters over the address and verb', () => {
    const code = gen(statusQueryTemplate, 'Status query');
    for (const address of [1, 9, 10, 31]) {
      const run = runPlc(code, { address });
      expect(hex(run.bytes)).toBe(hex(assembleFrame(parse(statusQueryTemplate), { address }).bytes));
    }
    // "1?STA": 31 ^ 3F = 0E, ^ 53 = 5D, ^ 54 = 09, ^ 41 = 48 (worked by hand)
    expect(String.fromCharCode(...runPlc(code, { address: 1 }).bytes)).toBe('1?STA*48\r');
  });

  it('a sequence of two status queries: each XOR-8 covers its own step only', () => {
    const t = parse(statusQueryTemplate);
    const r = generatePlcCode([{ template: t }, { template: t }], { name: 'Two queries' });
    if (!r.ok) throw new Error(r.error.message);
    const run = runPlc(r.value, { address: 1, address_2: 12 });
    const expected = [...assembleFrame(t, { address: 1 }).bytes, ...assembleFrame(t, { address: 12 }).bytes];
    expect(hex(run.bytes)).toBe(hex(Uint8Array.from(expected)));
    expect(String.fromCharCode(...run.bytes).startsWith('1?STA*48\r12?STA*')).toBe(true);
  });

  it('a sequence joins its steps in one STRING', () => {
    const steps = [{ template: parse(indexMoveTemplate), fixed: { accel: 5, decel: 5, speed: 0.5 } }, { template: parse(jogTemplate('+')) }];
    const r = generatePlcCode(steps, { name: 'Index then jog', prefix: 'DRV' });
    if (!r.ok) throw new Error(r.error.message);
    expect(r.value.name).toBe('DRV_Index_then_jog');
    expect(r.value.inputs.map((i) => i.name)).toEqual(['address', 'angle', 'address_2', 'angle_2']);
    const run = runPlc(r.value, { address: 1, angle: 4500, address_2: 1, angle_2: -50 });
    expect(String.fromCharCode(...run.bytes)).toBe('1!IDX:+4500/R180000/F180000/S18000\r1!JOG:-50\r');
  });
});

describe('checksums, one algorithm at a time', () => {
  const algorithms = listChecksumAlgorithms().map((a) => a.name);
  it.each(algorithms)('%s as binary, hex and decimal characters', (algorithm) => {
    for (const encoding of ['binary', 'ascii-hex', 'ascii-decimal'] as const) {
      for (const byteOrder of ['low-first', 'high-first'] as const) {
        const t = parse({
          version: 1,
          segments: [
            { type: 'literal', id: 'a', bytes: '02 00 7F 80 FF' },
            { type: 'text', id: 't', name: 'text', label: 'Text', maxLength: 6 },
            { type: 'checksum', id: 'c', algorithm, encoding, byteOrder, case: 'lower' },
          ],
        });
        const r = generatePlcCode([{ template: t }], { name: 'Check' });
        const width = listChecksumAlgorithms().find((a) => a.name === algorithm)!.width;
        if (encoding === 'ascii-decimal' && width === 32) {
          expect(r.ok).toBe(false);
          continue;
        }
        if (!r.ok) throw new Error(r.error.message);
        expect(r.value.form).toBe('bytes');
        for (const text of ['x', '123456789', 'A$\'~ ', 'zz']) {
          const run = runPlc(r.value, { text: text.slice(0, 6) });
          expect(hex(run.bytes), `${algorithm} ${encoding} ${byteOrder} ${text}`).toBe(hex(assembleFrame(t, { text: text.slice(0, 6) }).bytes));
        }
      }
    }
  });
});

describe('refusals', () => {
  const refused = (t: TemplateInput, fixed?: FieldValues) => {
    const r = generatePlcCode([{ template: parse(t), ...(fixed ? { fixed } : {}) }], { name: 'X' });
    expect(r.ok).toBe(false);
    return r.ok ? '' : r.error.message;
  };
  it('a text field without maxLength', () => {
    expect(refused({ version: 1, segments: [{ type: 'text', id: 't', name: 'note', label: 'Note' }] })).toMatch(/maxLength/);
  });
  it('a scale whose limits overflow DINT arithmetic', () => {
    expect(refused({ version: 1, segments: [{ type: 'integer', id: 'n', name: 'n', label: 'N', scale: { factor: 1000000 }, min: -1e6, max: 1e6 }] })).toMatch(/DINT/);
  });
  it('a fixed value the engine refuses', () => {
    expect(refused({ version: 1, segments: [{ type: 'integer', id: 'n', name: 'n', label: 'N', min: 0, max: 9 }] }, { n: 12 })).toMatch(/maximum/);
  });
  it('a prefix that is no identifier, and a name that gives none', () => {
    const t = parse({ version: 1, segments: [] });
    const bad = generatePlcCode([{ template: t }], { name: 'X', prefix: '9a' });
    expect(bad.ok).toBe(false);
    const keyword = generatePlcCode([{ template: t }], { name: 'END IF', prefix: '' });
    expect(keyword.ok && keyword.value.name).toBe('END_IF_1');
  });
});

// ---------------------------------------------------------------- random templates

const ALGORITHMS = listChecksumAlgorithms().map((a) => a.name);
const PRINTABLE = Array.from({ length: 95 }, (_, i) => String.fromCharCode(0x20 + i)).join('');
const printableText = (max: number) => fc.string({ unit: fc.constantFrom(...PRINTABLE), maxLength: max });
const lowHex = fc.uint8Array({ minLength: 1, maxLength: 4 }).map((b) => Array.from(b, (x) => x.toString(16).padStart(2, '0')).join(' '));

const numberField = fc.record({
  integer: fc.boolean(),
  decimals: fc.integer({ min: 0, max: 3 }),
  scale: fc.option(fc.constantFrom({ factor: 100 }, { factor: 36000 }, { factor: 1000, divisor: 360 }, { factor: 0.1 }, { factor: 2.5, offset: 0.5 },
    { factor: -1 }, { factor: 1, offset: -273.15 }, { factor: 0.001 }, { factor: 7, divisor: 3 }, { factor: 1, offset: 10 }), { nil: undefined }),
  min: fc.option(fc.constantFrom(-1000, -10.5, -1, 0, 0.1, 2), { nil: undefined }),
  span: fc.constantFrom(1, 9.99, 100, 5000),
  width: fc.option(fc.integer({ min: 1, max: 12 }), { nil: undefined, freq: 2 }),
  pad: fc.constantFrom('zero', 'space'),
  sign: fc.constantFrom('always', 'negative'),
}).map((r) => ({
  type: r.integer ? 'integer' : 'decimal', ...(r.integer ? {} : { decimals: r.decimals }), ...(r.scale ? { scale: r.scale } : {}),
  ...(r.min !== undefined ? { min: r.min, max: r.min + r.span } : {}), ...(r.width ? { width: r.width } : {}), pad: r.pad, sign: r.sign,
}));
const textField = fc.record({
  maxLength: fc.integer({ min: 1, max: 6 }),
  case: fc.constantFrom('upper', 'lower', 'as-is'),
  allowed: fc.option(fc.constantFrom('0123456789ABCDEF', 'abc$\'XYZ ', '0123456789'), { nil: undefined }),
  default: fc.option(fc.constantFrom('A', 'ok', '', 'too long!'), { nil: undefined }),
}).map((r) => ({ type: 'text', maxLength: r.maxLength, case: r.case, ...(r.allowed !== undefined ? { allowed: r.allowed } : {}), ...(r.default !== undefined ? { default: r.default } : {}) }));
const choiceField = fc.array(printableText(4), { minLength: 1, maxLength: 4 }).map((sends) => ({ type: 'choice', options: sends.map((send, i) => ({ value: `o${i}`, send })) }));
const literal = fc.oneof(lowHex, fc.constantFrom('00', '7F', '80 FF', '24 27', '0D 0A', '3A')).map((bytes) => ({ type: 'literal', bytes }));
const checksum = fc.record({
  algorithm: fc.constantFrom(...ALGORITHMS),
  encoding: fc.constantFrom('binary', 'ascii-hex', 'ascii-decimal', 'ascii-hex'),
  over: fc.constantFrom('bytes', 'bytes', 'decoded-hex'),
  case: fc.constantFrom('upper', 'lower'),
  from: fc.nat(),
  to: fc.option(fc.nat(), { nil: undefined }),
});

const template = fc.array(fc.oneof(numberField, numberField, textField, choiceField, literal), { minLength: 1, maxLength: 6 })
  .chain((parts) => fc.tuple(fc.constant(parts), fc.option(checksum, { nil: undefined }), fc.boolean()))
  .map(([parts, cs, terminated]) => {
    const segments: Record<string, unknown>[] = parts.map((p, i) => ({ ...p, id: `s${i}`, ...('bytes' in p ? {} : { name: `f${i}`, label: `Field ${i}` }) }));
    if (cs) {
      const n = segments.length;
      const from = cs.from % (n + 1);
      const range = { from: from === n ? 'start' : from, to: cs.to === undefined ? 'checksum' : Math.max(from === n ? 0 : from, cs.to % n) };
      segments.push({ type: 'checksum', id: 'cs', algorithm: cs.algorithm, encoding: cs.algorithm.startsWith('CRC-32') && cs.encoding === 'ascii-decimal' ? 'ascii-hex' : cs.encoding, over: cs.over, case: cs.case, range });
    }
    if (terminated) segments.push({ type: 'terminator', id: 'end', bytes: '0D' });
    return parse({ version: 1, segments } as TemplateInput);
  });

/**
 * Random inputs for a generated POU. `edgy` runs also pick values just outside the ranges, characters a field
 * does not allow, empty text and choice numbers that name no option; the others stay valid.
 */
function inputsFor(code: PlcCode, t: Template, seed: number[], edgy: boolean): { st: Record<string, number | string>; engine: FieldValues } {
  const st: Record<string, number | string> = {};
  const engine: FieldValues = {};
  code.inputs.forEach((inp, k) => {
    const r = seed[k % seed.length]! + k * 7919;
    const field = t.segments.find((s) => 'name' in s && s.name === inp.field) as { allowed?: string };
    if (inp.kind === 'number') {
      const lo = inp.lo!;
      const hi = inp.hi!;
      const picks = edgy ? [lo - 1, hi + 1, lo, hi] : [lo, hi, Math.max(lo, Math.min(hi, 0)), lo + (r % (hi - lo + 1)), lo + ((r * 31) % (hi - lo + 1))];
      let n = picks[r % picks.length]!;
      if (n < -(2 ** 31 - 1) || n > 2 ** 31 - 1) n = lo;
      st[inp.name] = n;
      engine[inp.field] = scaledText(n, inp.inputDecimals!);
    } else if (inp.kind === 'text') {
      const alphabet = edgy ? (r % 2 ? PRINTABLE : 'abcXYZ$\' ') : (field.allowed ?? PRINTABLE);
      let text = '';
      const len = edgy ? r % (inp.maxLength! + 1) : 1 + (r % inp.maxLength!);
      for (let i = 0; i < len; i++) text += alphabet[(r * (i + 3) + i * 31) % alphabet.length];
      st[inp.name] = text;
      engine[inp.field] = text;
    } else {
      const count = inp.options!.length;
      const n = edgy ? r % (count + 2) : 1 + (r % count);
      st[inp.name] = n;
      engine[inp.field] = n >= 1 && n <= count ? inp.options![n - 1]! : 'no-such-option';
    }
  });
  return { st, engine };
}

/** Numbers outside limits the generator chose itself (no min/max) are not the engine's errors: skip those runs. */
function outsideOwnLimits(code: PlcCode, t: Template, st: Record<string, number | string>): boolean {
  return code.inputs.some((inp) => {
    if (inp.kind !== 'number') return false;
    const field = t.segments.find((s) => 'name' in s && s.name === inp.field) as { min?: number; max?: number };
    const n = st[inp.name] as number;
    return (n < inp.lo! && field.min === undefined) || (n > inp.hi! && field.max === undefined);
  });
}

describe('random templates: generated code gives the engine bytes', () => {
  it('with some fields fixed (a preset), the rest inputs', () => {
    let compared = 0;
    fc.assert(fc.property(template, fc.array(fc.nat({ max: 1_000_000 }), { minLength: 2, maxLength: 6 }), (t, seeds) => {
      const full = generatePlcCode([{ template: t }], { name: 'Full' });
      if (!full.ok) return;
      const first = inputsFor(full.value, t, seeds, false);
      const fixed: FieldValues = {};
      full.value.inputs.forEach((inp, k) => { if (k % 2 === 0) fixed[inp.field] = first.engine[inp.field]; });
      const r = generatePlcCode([{ template: t, fixed }], { name: 'Preset' });
      const second = inputsFor(full.value, t, seeds.map((x) => x * 3 + 1), false);
      const values = { ...second.engine, ...fixed };
      if (!r.ok) {
        // only a fixed value the engine refuses is a reason: that field alone has an error
        expect(r.error.message).toMatch(/fixed value/);
        return;
      }
      const st = Object.fromEntries(r.value.inputs.map((inp) => [inp.name, second.st[full.value.inputs.find((f) => f.field === inp.field)!.name]!]));
      const frame = assembleFrame(t, values);
      const run = runPlc(r.value, st);
      if (frame.ok) expect([run.error, hex(run.bytes)]).toEqual([0, hex(frame.bytes)]);
      else expect(run.error).not.toBe(0);
      compared++;
    }), { numRuns: 300 });
    expect(compared).toBeGreaterThan(200);
  });

  it('thousands of values over random templates, both forms', () => {
    let generated = 0;
    let compared = 0;
    let built = 0;
    fc.assert(fc.property(template, fc.array(fc.nat({ max: 1_000_000 }), { minLength: 1, maxLength: 8 }), fc.constantFrom('string', 'bytes'), (t, seeds, form) => {
      const r = generatePlcCode([{ template: t }], { name: 'Random', form: form as 'string' | 'bytes' });
      if (!r.ok) {
        expect(r.error.message).toMatch(/DINT|no whole number/);
        return;
      }
      generated++;
      for (const [j, seed] of seeds.entries()) {
        const { st, engine } = inputsFor(r.value, t, seeds.map((s) => s + j * 104729 + seed), j % 4 === 3);
        if (outsideOwnLimits(r.value, t, st)) continue;
        const frame = assembleFrame(t, engine);
        const run = runPlc(r.value, st);
        const what = `${JSON.stringify(t.segments)}\n${JSON.stringify(st)}\n${r.value.code}`;
        if (frame.ok) expect([run.error, hex(run.bytes)], what).toEqual([0, hex(frame.bytes)]);
        else expect(run.error, `${JSON.stringify(frame.findings)}\n${what}`).not.toBe(0);
        compared++;
        if (frame.ok) built++;
      }
    }), { numRuns: 600 });
    expect(generated).toBeGreaterThan(400);
    expect(compared).toBeGreaterThan(1500);
    // both outcomes are exercised: frames built byte for byte, and errors reported where the engine reports one
    expect(built).toBeGreaterThan(700);
    expect(compared - built).toBeGreaterThan(500);
  });
});
