/** Scaling between engineering units and raw values, and the text forms of numeric fields. */
import type { DecimalField, IntegerField, Scale } from './template';

/** Rounds half away from zero, so +0.5 and -0.5 step the same distance (a jog of -0.5 step sends -1). */
export function roundHalfAway(x: number): number {
  return x < 0 ? -Math.round(-x) : Math.round(x);
}

/** Within this relative distance two numbers are the same value; absorbs binary noise such as 4499.999999999999. */
const EPSILON = 1e-9;

/** True when a and b differ by more than binary noise. */
export function differs(a: number, b: number): boolean {
  return Math.abs(a - b) > EPSILON * Math.max(1, Math.abs(a), Math.abs(b));
}

/** x, or the nearest whole number when x is that number plus binary noise. */
function snap(x: number): number {
  const r = Math.round(x);
  return differs(x, r) ? x : r;
}

/** Unrounded raw value: value × factor + offset (snapped to a whole number within binary noise). */
export function scaleToRaw(value: number, scale: Scale | undefined): number {
  if (!scale) return value;
  return snap(value * scale.factor + scale.offset);
}

/** Engineering value of a raw value: (raw − offset) ÷ factor. */
export function rawToEngineering(raw: number, scale: Scale | undefined): number {
  if (!scale) return raw;
  return snap((raw - scale.offset) / scale.factor);
}

/** Rounds to `decimals` places, half away from zero, without binary surprises (1.005 → 1.01). */
export function roundDecimals(x: number, decimals: number): number {
  const f = 10 ** decimals;
  const y = x * f;
  // nudge by binary noise so 1.005 × 100 = 100.49999999999999 rounds like 100.5
  return roundHalfAway(y + Math.sign(y) * EPSILON * Math.abs(y)) / f;
}

/** Non-negative x with exactly `decimals` decimals; integer arithmetic where it is exact, toFixed beyond. */
function fixedDigits(x: number, decimals: number): string {
  if (decimals === 0 && Number.isSafeInteger(x)) return String(x);
  const scaled = Math.round(x * 10 ** decimals);
  if (!Number.isSafeInteger(scaled)) return x.toFixed(decimals);
  const s = String(scaled).padStart(decimals + 1, '0');
  return decimals === 0 ? s : s.slice(0, s.length - decimals) + '.' + s.slice(s.length - decimals);
}

/** Text of a raw number: digits with fixed decimals, sign and padding applied to `width`. */
export function formatNumber(raw: number, field: IntegerField | DecimalField): string {
  const decimals = field.type === 'decimal' ? field.decimals : 0;
  const negative = raw < 0 && roundDecimals(-raw, decimals) !== 0;
  const digits = fixedDigits(Math.abs(raw), decimals);
  const sign = negative ? '-' : field.sign === 'always' ? '+' : '';
  const width = field.width ?? 0;
  const fill = width - sign.length - digits.length;
  if (fill <= 0) return sign + digits;
  return field.pad === 'zero' ? sign + '0'.repeat(fill) + digits : ' '.repeat(fill) + sign + digits;
}

/**
 * Raw number from field text, or undefined: leading spaces, an optional sign, digits, and for decimal
 * fields an optional fraction. Integer fields reject a fraction.
 */
export function readNumber(text: string, decimal: boolean): number | undefined {
  const re = decimal ? /^ *[+-]?(\d+(\.\d*)?|\.\d+)$/ : /^ *[+-]?\d+$/;
  if (!re.test(text)) return undefined;
  return Number(text.trim());
}
