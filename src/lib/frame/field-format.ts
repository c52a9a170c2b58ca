/** Scaling between engineering units and raw values, and the text forms of numeric fields. */
import type { DecimalField, IntegerField, Scale } from './template';

/** Rounds half away from zero, so +0.5 and -0.5 step the same distance (a jog of -0.5 step sends -1). */
export function roundHalfAway(x: number): number {
  return x < 0 ? -Math.round(-x) : Math.round(x);
}

/** Unrounded raw value: value × factor + offset. */
export function scaleToRaw(value: number, scale: Scale | undefined): number {
  if (!scale) return value;
  // toPrecision(15) drops binary noise such as 45 × (36000/360) = 4499.999999999999.
  return Number((value * scale.factor + scale.offset).toPrecision(15));
}

/** Engineering value of a raw value: (raw − offset) ÷ factor. */
export function rawToEngineering(raw: number, scale: Scale | undefined): number {
  if (!scale) return raw;
  return Number(((raw - scale.offset) / scale.factor).toPrecision(15));
}

/** Rounds to `decimals` places, half away from zero, without binary surprises (1.005 → 1.01). */
export function roundDecimals(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return roundHalfAway(Number((x * f).toPrecision(15))) / f;
}

/** Text of a raw number: digits with fixed decimals, sign and padding applied to `width`. */
export function formatNumber(raw: number, field: IntegerField | DecimalField): string {
  const decimals = field.type === 'decimal' ? field.decimals : 0;
  const negative = raw < 0 && roundDecimals(-raw, decimals) !== 0;
  const digits = Math.abs(raw).toFixed(decimals);
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
