import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { assembleFrame, decodeReply, toHex } from '~/lib/frame';
import { scaleFieldNumber, scaleFieldNumberExactly } from '~/lib/frame/field-number';
import { ascii, hexOf, tpl } from './helpers';

type Scale = { factor: number; offset?: number; divisor?: number };
const integerField = (scale?: Scale, extra: object = {}) => tpl([{ type: 'integer', id: 'n', name: 'n', label: 'N', ...(scale ? { scale } : {}), ...extra }]);
const decimalField = (decimals: number, scale?: Scale, extra: object = {}) =>
  tpl([{ type: 'decimal', id: 'n', name: 'n', label: 'N', decimals, ...(scale ? { scale } : {}), ...extra }]);
const sent = (t: ReturnType<typeof tpl>, value: string | number) => {
  const r = assembleFrame(t, { n: value });
  return String.fromCharCode(...r.bytes);
};

describe('scaling and rounding are exact decimal arithmetic on the typed text', () => {
  // Expected values computed with Python's decimal module, ROUND_HALF_UP (half away from zero), 100-digit
  // precision: Decimal(value) * Decimal(factor) / Decimal(divisor) + Decimal(offset), quantized to the places.
  // [typed value, factor, offset, divisor, decimal places, expected text]
  const PYTHON_DECIMAL: [string, number, number, number, number, string][] = [
    ['1.005', 100, 0, 1, 0, '101'],
    ['-1.005', 100, 0, 1, 0, '-101'],
    ['0.145', 100, 0, 1, 0, '15'],
    ['68.475', 100, 0, 1, 0, '6848'],
    ['0.285', 100, 0, 1, 0, '29'],
    ['4.35', 100, 0, 1, 0, '435'],
    ['1.15', 10, 0, 1, 0, '12'],
    ['-1.15', 10, 0, 1, 0, '-12'],
    ['2.5', 1, 0, 1, 0, '3'],
    ['-2.5', 1, 0, 1, 0, '-3'],
    ['15', 0.1, 0, 1, 0, '2'],
    ['-25', 0.1, 0, 1, 0, '-3'],
    ['-12.55', 10, 400, 1, 0, '275'],
    ['90', 1000, 0, 360, 0, '250'],
    ['1', 1000, 0, 360, 0, '3'],
    ['0.18', 1000, 0, 360, 0, '1'],
    ['1234567890', 1, 0, 1, 0, '1234567890'],
    ['600000000', 1, 0, 1, 0, '600000000'],
    ['9007199254740993', 1, 0, 1, 0, '9007199254740993'],
    ['50000', 1, 0, 1, 4, '50000.0000'],
    ['2.675', 1, 0, 1, 2, '2.68'],
    ['1.005', 1, 0, 1, 2, '1.01'],
    ['-0.005', 1, 0, 1, 2, '-0.01'],
    ['8.345', 1, 0, 1, 2, '8.35'],
    ['1.0049999', 1, 0, 1, 2, '1.00'],
    ['123456789012.345678', 1, 0, 1, 3, '123456789012.346'],
    ['0.1', 3, 0, 1, 1, '0.3'],
  ];
  test.each(PYTHON_DECIMAL)('%s × %s + %s ÷ %s, %s places → %s', (value, factor, offset, divisor, places, expected) => {
    const scale = { factor, offset, ...(divisor !== 1 ? { divisor } : {}) };
    const t = places === 0 ? integerField(scale) : decimalField(places, scale);
    expect(sent(t, value)).toBe(expected);
    if (places === 0 && factor === 1 && divisor === 1) expect(sent(decimalField(0), value)).toBe(expected);
  });

  test('a number input counts as its shortest round-trip text (1.005 is "1.005")', () => {
    expect(sent(integerField({ factor: 100 }), 1.005)).toBe('101');
    expect(sent(integerField({ factor: 100 }), -1.005)).toBe('-101');
    expect(sent(decimalField(0), 1234567890)).toBe('1234567890');
    expect(sent(decimalField(4), 50000)).toBe('50000.0000');
  });

  test('the segment map still carries numbers for value and raw', () => {
    const r = assembleFrame(integerField({ factor: 100 }), { n: '1.005' });
    expect(r.segments[0]).toMatchObject({ value: 1.005, raw: 101 });
    expect(r.findings).toMatchObject([{ code: 'field-not-integer', severity: 'warning' }]);
    expect(r.findings[0]!.message).toContain('100.5');
  });

  test('a value that rounds to zero sends no minus sign', () => {
    expect(sent(decimalField(2), '-0.004')).toBe('0.00');
    expect(sent(decimalField(2, undefined, { sign: 'always' }), '-0.004')).toBe('+0.00');
    expect(sent(integerField(), '-0')).toBe('0');
  });

  // x.xx5 values sit exactly halfway between two steps at 100 steps per unit. The expected raw value is
  // computed here with BigInt from the digits (independently of the engine): half away from zero.
  test('1,500 random x.xx5 values at 100 steps per unit round half away from zero', () => {
    const steps = integerField({ factor: 100 });
    const hundredths = decimalField(2);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 9_999_999 }), fc.boolean(), (k, negative) => {
        const thousandths = BigInt(k) * 10n + 5n;
        const whole = thousandths / 1000n;
        const frac = String(thousandths % 1000n).padStart(3, '0');
        const typed = `${negative ? '-' : ''}${whole}.${frac}`;
        const rounded = (thousandths + 5n) / 10n; // |value| × 100, half away from zero
        const expectedRaw = `${negative ? '-' : ''}${rounded}`;
        const expectedText = `${negative ? '-' : ''}${rounded / 100n}.${String(rounded % 100n).padStart(2, '0')}`;
        expect(sent(steps, typed)).toBe(expectedRaw);
        expect(sent(hundredths, typed)).toBe(expectedText);
      }),
      { numRuns: 1500 },
    );
  });

  // Any typed decimal × any decimal factor, rounded to 0-6 places, against the same computation in BigInt.
  test('random typed values and factors match an independent BigInt computation', () => {
    const digits = (max: number) => fc.bigInt({ min: 0n, max: 10n ** BigInt(max) - 1n });
    fc.assert(
      fc.property(digits(12), fc.integer({ min: 0, max: 8 }), fc.boolean(), fc.integer({ min: 1, max: 999_999 }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 6 }),
        (a, p, negative, b, q, places) => {
          const typed = decimalText(negative ? -a : a, p);
          const factorText = decimalText(BigInt(b), q);
          const factor = Number(factorText); // at most 6 significant digits: its shortest text is the same decimal
          // exact = a·b / 10^(p+q); scaled by 10^places and rounded half away from zero
          const num = (negative ? -a : a) * BigInt(b) * 10n ** BigInt(places);
          const den = 10n ** BigInt(p + q);
          const abs = num < 0n ? -num : num;
          const r = (2n * abs + den) / (2n * den);
          const expected = decimalText(num < 0n && r !== 0n ? -r : r, places);
          const t = places === 0 ? integerField({ factor }) : decimalField(places, { factor });
          const out = assembleFrame(t, { n: typed });
          if (expected.length <= 32) expect(String.fromCharCode(...out.bytes)).toBe(expected);
        }),
      { numRuns: 1500 },
    );
  });

  // The engine computes small values as scaled integers and falls back to big.js; both must agree.
  test('the integer fast path and the big.js path give the same result', () => {
    const typed = fc.oneof(
      fc.tuple(fc.bigInt({ min: -(10n ** 18n), max: 10n ** 18n }), fc.integer({ min: 0, max: 18 })).map(([a, p]) => decimalText(a, p)),
      fc.double({ noNaN: true, noDefaultInfinity: true }),
      fc.constantFrom('007.50', '+5', '.5', '5.', '-0', ' 12 ', '0x10', '1e2', '-0.0049', '999999999999999.5'),
    );
    const factor = fc.oneof(fc.constantFrom(1, 100, 0.1, -2, 1e-9, 36000 / 360, 1000 / 360, 1e15, 123456.789), fc.double({ min: -1e6, max: 1e6, noNaN: true }).filter((f) => f !== 0));
    fc.assert(
      fc.property(typed, factor, fc.constantFrom(0, 0.5, 400, -1e-7), fc.integer({ min: 0, max: 9 }), fc.boolean(), (value, f, offset, decimals, decimal) => {
        const field = (decimal ? decimalField(decimals, { factor: f, offset }) : integerField({ factor: f, offset })).segments[0] as never;
        expect(scaleFieldNumber(field, value)).toEqual(scaleFieldNumberExactly(field, value));
      }),
      { numRuns: 3000 },
    );
  });
});

/** Decimal text of n / 10^places with exactly `places` decimals. */
function decimalText(n: bigint, places: number): string {
  const negative = n < 0n;
  const s = String(negative ? -n : n).padStart(places + 1, '0');
  const body = places === 0 ? s : `${s.slice(0, s.length - places)}.${s.slice(s.length - places)}`;
  return (negative ? '-' : '') + body;
}

describe('numbers that cannot be sent are error findings', () => {
  test('non-finite numbers are refused', () => {
    for (const v of [Infinity, -Infinity, Number.NaN]) {
      const r = assembleFrame(integerField(), { n: v });
      expect(r.ok).toBe(false);
      expect(r.findings).toMatchObject([{ code: 'field-invalid', severity: 'error' }]);
      expect(r.bytes.length).toBe(0);
    }
  });
  test('1e21 as a number is sent as its digits, never as "1e+21"', () => {
    const r = assembleFrame(integerField(), { n: 1e21 });
    expect(String.fromCharCode(...r.bytes)).toBe('1000000000000000000000');
    expect(r.ok).toBe(true);
  });
  test('more than 32 characters is too wide to send, and nothing is sent', () => {
    const huge = assembleFrame(integerField(), { n: 1e40 });
    expect(huge).toMatchObject({ ok: false, byteCount: 0, findings: [{ code: 'field-too-wide', severity: 'error' }] });
    // a scale that overflows a double: 10 × 1e308
    const overflow = assembleFrame(integerField({ factor: 1e308 }), { n: '10' });
    expect(overflow).toMatchObject({ ok: false, byteCount: 0, findings: [{ code: 'field-too-wide', severity: 'error' }] });
    expect(overflow.findings[0]!.message).not.toMatch(/Infinity|e\+/);
  });
  test('a value wider than the field width is an error', () => {
    const r = assembleFrame(integerField({ factor: 100 }, { width: 4 }), { n: '-45' });
    expect(r).toMatchObject({ ok: false, findings: [{ code: 'field-too-wide', severity: 'error' }] });
    const d = assembleFrame(decimalField(2, undefined, { width: 5 }), { n: '123.4' });
    expect(d).toMatchObject({ ok: false, findings: [{ code: 'field-too-wide', severity: 'error' }] });
  });
});

describe('numeric input forms', () => {
  // Decision: only plain decimal digits are numbers; other notations are refused with a hint, so a typo
  // can never send a different value.
  test.each([
    ['0x10', /hex.*16/],
    ['0b11', /binary.*3/],
    ['0o17', /not a number/],
    ['1e2', /exponent.*100/],
    ['2.5E-1', /exponent.*0\.25/],
    ['Infinity', /number/],
    ['NaN', /number/],
    ['1,5', /point/],
    ['1.2.3', /number/],
    ['--1', /number/],
    ['1 000', /number/],
    ['٣', /number/],
  ])('%s is refused', (typed, message) => {
    const r = assembleFrame(integerField(), { n: typed });
    expect(r).toMatchObject({ ok: false, byteCount: 0, findings: [{ code: 'field-invalid', severity: 'error' }] });
    expect(r.findings[0]!.message).toMatch(message);
  });
  test.each([
    [' 12 ', '12'],
    ['+5', '5'],
    ['-0', '0'],
    ['007', '7'],
    ['.5', '1'],
    ['5.', '5'],
  ])('%j is accepted as %s', (typed, expected) => {
    expect(sent(integerField(), typed)).toBe(expected);
  });
  test('min and max compare exactly', () => {
    const t = integerField(undefined, { min: 0, max: 0.3 });
    expect(assembleFrame(t, { n: '0.3' }).findings.map((f) => f.code)).not.toContain('field-out-of-range');
    expect(assembleFrame(t, { n: '0.30000000000000001' }).findings.map((f) => f.code)).toContain('field-out-of-range');
  });
});

describe('decoding inverts the scale exactly', () => {
  test('steps per revolution as factor ÷ divisor', () => {
    const t = tpl([
      { type: 'literal', id: 'h', bytes: hexOf('P') },
      { type: 'integer', id: 'p', name: 'angle', label: 'Angle', unit: '°', scale: { factor: 1000, divisor: 360 } },
      { type: 'terminator', id: 'e', bytes: '0D' },
    ]);
    expect(toHex(assembleFrame(t, { angle: '90' }).bytes)).toBe(hexOf('P250\r'));
    expect(assembleFrame(t, { angle: '90' }).findings).toEqual([]);
    expect(decodeReply(t, ascii('P250\r')).fields.angle).toMatchObject({ raw: 250, value: 90 });
  });
  test('decimal reply with offset', () => {
    const t = tpl([{ type: 'decimal', id: 't', name: 't', label: 'T', decimals: 1, scale: { factor: 10, offset: 400 } }, { type: 'terminator', id: 'e', bytes: '0D' }]);
    // (274.5 − 400) ÷ 10 = −12.55
    expect(decodeReply(t, ascii('274.5\r')).fields.t).toMatchObject({ raw: 274.5, value: -12.55 });
  });
});
