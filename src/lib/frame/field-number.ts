/**
 * One numeric field value from typed text to the raw value sent, exactly. Small values (the usual case)
 * are computed as integers scaled by a power of ten, which doubles hold exactly below 2^53; anything
 * larger, or a scale with a divisor, goes through big.js. Both give the same digits.
 */
import { type Decimal, type NumberReading, decimalOf, readTypedNumber, roundExact, scaleExact, toNumber } from './field-format';
import type { DecimalField, IntegerField, Scale } from './template';

export interface ScaledNumber {
  /** Nearest JS number of the typed value. */
  value: number;
  /** Typed value, exact and normalised (`007.50` → `7.5`). */
  valueText: string;
  /** Unrounded raw value, exact and normalised. */
  exactText: string;
  /** Nearest JS number of the rounded raw value. */
  raw: number;
  /** Rounded raw value with the field's decimals, `-` when below zero: `-4500`, `1.01`, `0.00`. */
  rawText: string;
  /** True when rounding changed the raw value. */
  rounded: boolean;
  belowMin: boolean;
  aboveMax: boolean;
}

export type ScaleOutcome =
  | { ok: true; number: ScaledNumber }
  | { ok: false; problem: 'reading'; kind: 'plain' | 'form'; reason: string }
  | { ok: false; problem: 'scale' };

/** m × 10^−s with m a safe integer. */
interface Fixed {
  m: number;
  s: number;
}

const PLAIN = /^[+-]?(\d+\.?\d*|\.\d+)$/;
const POW10 = Array.from({ length: 16 }, (_, k) => 10 ** k);
const MAX_SCALE = 15;

function fixedOfText(t: string): Fixed | undefined {
  const negative = t.charCodeAt(0) === 0x2d;
  const from = negative || t.charCodeAt(0) === 0x2b ? 1 : 0;
  const dot = t.indexOf('.', from);
  const frac = dot < 0 ? '' : t.slice(dot + 1);
  const digits = (dot < 0 ? t.slice(from) : t.slice(from, dot)) + frac;
  let first = 0;
  while (first < digits.length - 1 && digits.charCodeAt(first) === 0x30) first++;
  if (digits.length - first > 15 || frac.length > MAX_SCALE) return undefined;
  const m = digits.length ? Number(digits.slice(first)) : 0;
  return { m: negative && m !== 0 ? -m : m, s: frac.length };
}

function fixedOfNumber(n: number): Fixed | undefined {
  if (!Number.isFinite(n)) return undefined;
  const t = String(n);
  return t.includes('e') ? undefined : fixedOfText(t);
}

/** x with scale s (≥ x.s), or undefined when that is not exact. */
function align(x: Fixed, s: number): number | undefined {
  const k = s - x.s;
  if (k > MAX_SCALE) return undefined;
  const m = x.m * POW10[k]!;
  return Number.isSafeInteger(m) ? m : undefined;
}

function times(a: Fixed, b: Fixed): Fixed | undefined {
  const m = a.m * b.m;
  return Number.isSafeInteger(m) && a.s + b.s <= MAX_SCALE ? { m, s: a.s + b.s } : undefined;
}

function plus(a: Fixed, b: Fixed): Fixed | undefined {
  const s = Math.max(a.s, b.s);
  const x = align(a, s);
  const y = align(b, s);
  if (x === undefined || y === undefined) return undefined;
  const m = x + y;
  return Number.isSafeInteger(m) ? { m, s } : undefined;
}

/** x rounded half away from zero to `d` places, as an integer scaled by 10^d, and whether it was exact. */
function roundFixed(x: Fixed, d: number): { r: number; exact: boolean } | undefined {
  if (x.s <= d) {
    const r = align(x, d);
    return r === undefined ? undefined : { r, exact: true };
  }
  const unit = POW10[x.s - d]!;
  const a = Math.abs(x.m);
  if (a + unit > Number.MAX_SAFE_INTEGER) return undefined;
  // a / unit is rounded by less than 1 / unit below 2^53, so its floor is the true quotient
  let q = Math.floor(a / unit);
  const rest = a - q * unit;
  if (2 * rest >= unit) q++;
  return { r: x.m < 0 ? -q : q, exact: rest === 0 };
}

/** Normalised decimal text of an integer scaled by 10^s (no trailing fraction zeros, no `-0`). */
function scaledText(m: number, s: number, keep = false): string {
  if (m === 0 && !keep) return '0';
  const digits = String(Math.abs(m)).padStart(s + 1, '0');
  let text = s === 0 ? digits : `${digits.slice(0, digits.length - s)}.${digits.slice(digits.length - s)}`;
  if (!keep && s > 0) text = text.replace(/\.?0+$/, '');
  return m < 0 ? '-' + text : text;
}

const scaleCache = new WeakMap<Scale, { factor: Fixed; offset: Fixed } | null>();

function fixedScale(scale: Scale): { factor: Fixed; offset: Fixed } | null {
  let c = scaleCache.get(scale);
  if (c === undefined) {
    const factor = fixedOfNumber(scale.factor);
    const offset = fixedOfNumber(scale.offset ?? 0);
    c = factor && offset && factor.m !== 0 && (scale.divisor === undefined || scale.divisor === 1) ? { factor, offset } : null;
    scaleCache.set(scale, c);
  }
  return c;
}

const ONE: Fixed = { m: 1, s: 0 };
const ZERO: Fixed = { m: 0, s: 0 };

function fast(field: IntegerField | DecimalField, input: string | number, decimals: number): ScaledNumber | undefined {
  let value: Fixed | undefined;
  let n: number;
  if (typeof input === 'number') {
    value = fixedOfNumber(input);
    n = input + 0;
  } else {
    const t = input.trim();
    if (!PLAIN.test(t)) return undefined;
    value = fixedOfText(t);
    n = Number(t) + 0;
  }
  if (!value) return undefined;
  const scale = field.scale ? fixedScale(field.scale) : { factor: ONE, offset: ZERO };
  if (!scale) return undefined;
  const product = times(value, scale.factor);
  const exact = product && plus(product, scale.offset);
  const rounded = exact && roundFixed(exact, decimals);
  if (!exact || !rounded) return undefined;
  const valueText = scaledText(value.m, value.s);
  const limits = field.min !== undefined || field.max !== undefined ? outOfRange(field, readTypedNumber(valueText)) : NO_LIMITS;
  return {
    value: n,
    valueText,
    exactText: scaledText(exact.m, exact.s),
    raw: rounded.r / POW10[decimals]! + 0,
    rawText: scaledText(rounded.r, decimals, true),
    rounded: !rounded.exact,
    ...limits,
  };
}

const NO_LIMITS = { belowMin: false, aboveMax: false };

/** The limits compare exactly in big.js (a field with limits is the rarer case). */
function outOfRange(field: IntegerField | DecimalField, read: NumberReading): { belowMin: boolean; aboveMax: boolean } {
  const min = field.min === undefined ? undefined : decimalOf(field.min);
  const max = field.max === undefined ? undefined : decimalOf(field.max);
  return read.ok ? { belowMin: !!min && read.value.lt(min), aboveMax: !!max && read.value.gt(max) } : NO_LIMITS;
}

function exactly(field: IntegerField | DecimalField, value: Decimal, decimals: number): ScaleOutcome {
  const exact = scaleExact(value, field.scale);
  if (!exact) return { ok: false, problem: 'scale' };
  const raw = roundExact(exact, decimals);
  return {
    ok: true,
    number: {
      value: toNumber(value),
      valueText: value.toString(),
      exactText: exact.toString(),
      raw: toNumber(raw),
      rawText: (raw.lt(0) ? '-' : '') + raw.abs().toFixed(decimals),
      rounded: !raw.eq(exact),
      ...outOfRange(field, { ok: true, value }),
    },
  };
}

/**
 * The typed value of a numeric field scaled and rounded half away from zero to the field's decimals:
 * raw = round(value × factor ÷ divisor + offset). `decimals` must be a whole number 0-9 (callers check
 * fields built in code).
 */
export function scaleFieldNumber(field: IntegerField | DecimalField, input: string | number): ScaleOutcome {
  const decimals = field.type === 'decimal' ? field.decimals : 0;
  const quick = fast(field, input, decimals);
  if (quick) return { ok: true, number: quick };
  const read = readTypedNumber(input);
  if (!read.ok) return { ok: false, problem: 'reading', kind: read.kind, reason: read.reason };
  return exactly(field, read.value, decimals);
}

/** The big.js path alone, for tests that compare it with the integer path. */
export function scaleFieldNumberExactly(field: IntegerField | DecimalField, input: string | number): ScaleOutcome {
  const read = readTypedNumber(input);
  if (!read.ok) return { ok: false, problem: 'reading', kind: read.kind, reason: read.reason };
  return exactly(field, read.value, field.type === 'decimal' ? field.decimals : 0);
}
