/**
 * How a numeric field's scaling is done in DINT integer arithmetic. The input is a whole number N of the
 * field's smallest typed unit (10^−p engineering units); the raw value in units of 10^−decimals is
 * round((N × A + B) ÷ C), half away from zero, with integers A, B, C worked out exactly from the scale:
 * the same digits as the engine's exact decimal `round(value × factor ÷ divisor + offset)`.
 */
import { decimalOf } from '../field-format';
import type { DecimalField, IntegerField } from '../template';

/** Largest DINT. */
export const DINT_MAX = 2 ** 31 - 1;
/** Most input decimals offered (a finer unit would rarely fit a DINT). */
const MAX_INPUT_DECIMALS = 9;

export interface NumberPlan {
  /** The input counts 10^−inputDecimals engineering units (2: hundredths). */
  inputDecimals: number;
  /** Raw decimals sent (the field's `decimals`, 0 for integers). */
  decimals: number;
  a: number;
  b: number;
  c: number;
  /** Input limits in input units, inclusive: the field's min and max, or what DINT arithmetic allows. */
  lo: number;
  hi: number;
  /** True when lo/hi come from the field's min and max (else from the arithmetic's limit). */
  fromLimits: { lo: boolean; hi: boolean };
}

/** m × 10^−s of a finite JS number, by its shortest round-trip decimal text. */
function fraction(n: number): { m: bigint; s: number } {
  const text = decimalOf(n)!.toString();
  const negative = text.startsWith('-');
  const [int, frac = ''] = text.replace('-', '').split('.');
  const m = BigInt(int! + frac);
  return { m: negative ? -m : m, s: frac.length };
}

const TEN = 10n;
const pow10 = (k: number) => TEN ** BigInt(k);
const abs = (x: bigint) => (x < 0n ? -x : x);
function gcd(a: bigint, b: bigint): bigint {
  a = abs(a);
  b = abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}
/** Floor and ceiling of p ÷ q for q > 0. */
const floorDiv = (p: bigint, q: bigint) => (p >= 0n ? p / q : -((-p + q - 1n) / q));
const ceilDiv = (p: bigint, q: bigint) => -floorDiv(-p, q);

export type PlanResult = { ok: true; plan: NumberPlan } | { ok: false; reason: string };

/**
 * The integer plan of a numeric field, or why DINT arithmetic cannot give the engine's digits. The input
 * unit is the coarsest power of ten at which one input step moves the raw value by at most one unit of
 * its last digit (a 2-decimal field without scale: hundredths; 36,000 steps per 360°: hundredths of a degree).
 */
export function planNumber(field: IntegerField | DecimalField): PlanResult {
  const decimals = field.type === 'decimal' ? field.decimals : 0;
  const scale = field.scale;
  const f = fraction(scale?.factor ?? 1);
  const g = fraction(scale?.divisor ?? 1);
  const o = fraction(scale?.offset ?? 0);
  // raw × 10^d = N × 10^−p × (f.m / 10^f.s) × (10^g.s / g.m) × 10^d + (o.m / 10^o.s) × 10^d
  const step = abs(f.m) * pow10(g.s + decimals); // one engineering unit in raw units, times den
  const den = pow10(f.s) * g.m;
  let p = 0;
  while (p < MAX_INPUT_DECIMALS && step > den * pow10(p)) p++;
  let a = f.m * pow10(g.s + decimals) * pow10(o.s);
  let c = den * pow10(p) * pow10(o.s);
  let b = o.m * pow10(decimals) * den * pow10(p);
  const k = gcd(gcd(a, b), c);
  a /= k;
  b /= k;
  c /= k;
  const max = BigInt(DINT_MAX);
  const where = `${field.label || field.name}`;
  if (2n * c > max) return { ok: false, reason: `${where}: the scale's divisor in input units (${c}) is too large for DINT arithmetic` };
  if (abs(b) >= max) return { ok: false, reason: `${where}: the offset in raw units (${b} ÷ ${c}) does not fit DINT arithmetic` };
  // |N × A + B| must stay within DINT, and so must its negation
  const safe = (max - abs(b)) / abs(a);
  let lo = -safe;
  let hi = safe;
  const fromLimits = { lo: false, hi: false };
  const unit = pow10(p);
  if (field.min !== undefined && Number.isFinite(field.min)) {
    const m = fraction(field.min);
    const v = ceilDiv(m.m * unit, pow10(m.s));
    if (v < -safe) return { ok: false, reason: tooWide(where, field.min, p, safe) };
    lo = v;
    fromLimits.lo = true;
  }
  if (field.max !== undefined && Number.isFinite(field.max)) {
    const m = fraction(field.max);
    const v = floorDiv(m.m * unit, pow10(m.s));
    if (v > safe) return { ok: false, reason: tooWide(where, field.max, p, safe) };
    hi = v;
    fromLimits.hi = true;
  }
  if (lo > hi) return { ok: false, reason: `${where}: no whole number of ${unitName(p)} lies between min ${field.min} and max ${field.max}` };
  return { ok: true, plan: { inputDecimals: p, decimals, a: Number(a), b: Number(b), c: Number(c), lo: Number(lo), hi: Number(hi), fromLimits } };
}

function unitName(p: number): string {
  return p === 0 ? 'whole units' : `units of ${p === 1 ? '0.1' : `0.${'0'.repeat(p - 1)}1`}`;
}

function tooWide(where: string, limit: number, p: number, safe: bigint): string {
  return `${where}: the limit ${limit} in ${unitName(p)} does not fit DINT arithmetic with this scale (at most ±${safe}); narrow min and max or change the scale`;
}

/** `0.01` for 2 input decimals, `1` for none: the input unit in words for comments. */
export function inputUnitText(p: number): string {
  return p === 0 ? 'whole' : `0.${'0'.repeat(p - 1)}1`;
}
