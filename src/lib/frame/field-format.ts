/**
 * Numbers of numeric fields in exact decimal arithmetic (big.js): reading the typed text, scaling
 * between engineering units and raw values, rounding half away from zero, and the text sent.
 * Binary floating point never touches a value on its way to the wire.
 */
import Big from 'big.js';
import type { DecimalField, IntegerField, Scale } from './template';

/** A constructor of our own, so these settings never change another user of big.js. */
const Dec = Big();
/** Places kept when a division does not terminate (decoding with a divisor or factor). */
Dec.DP = 40;
/** big.js "round half up" rounds half away from zero: 2.5 → 3, −2.5 → −3. */
Dec.RM = Dec.roundHalfUp;
// toString in plain digits, never exponent notation
Dec.NE = -1e6;
Dec.PE = 1e6;

export type Decimal = Big;

/** The most characters a number field can send (the widest `width` a template allows). */
export const MAX_NUMBER_CHARS = 32;

/** Plain decimal text: optional sign, digits, optional point and fraction. */
const PLAIN = /^[+-]?(\d+\.?\d*|\.\d+)$/;

/** `plain`: the text is no number at all; `form`: a number in a form that is refused (hex, exponent, decimal comma). */
export type NumberReading = { ok: true; value: Decimal } | { ok: false; kind: 'plain' | 'form'; reason: string };

/** Decimal of a finite JS number by its shortest round-trip text (1.005 → 1.005), or undefined. */
export function decimalOf(n: number): Decimal | undefined {
  return Number.isFinite(n) ? Dec(n) : undefined;
}

/**
 * The number a user typed: plain decimal digits with an optional sign and point, surrounding spaces
 * ignored. Hex (`0x10`), binary (`0b11`), exponents (`1e2`), decimal commas and words
 * such as `Infinity` are refused with a reason that names the decimal value where there is one.
 * A JS number is taken as its shortest round-trip text; NaN and ±Infinity are refused.
 */
export function readTypedNumber(input: string | number): NumberReading {
  if (typeof input === 'number') {
    const d = decimalOf(input);
    return d ? { ok: true, value: d } : { ok: false, kind: 'plain', reason: `${input} is not a finite number` };
  }
  const t = input.trim();
  if (PLAIN.test(t)) return { ok: true, value: Dec(t.startsWith('+') ? t.slice(1) : t) };
  const shown = t.length > 40 ? `"${t.slice(0, 40)}…"` : `"${t}"`;
  const based = /^([+-]?)(0x[0-9a-f]{1,40}|0b[01]{1,40})$/i.exec(t);
  if (based) {
    const kind = /x/i.test(based[2]!) ? 'hex' : 'binary';
    return { ok: false, kind: 'form', reason: `${shown} is ${kind}; enter the value in decimal digits (${based[1] === '-' ? '-' : ''}${BigInt(based[2]!)})` };
  }
  if (/^[+-]?(\d+\.?\d*|\.\d+)e[+-]?\d{1,2}$/i.test(t)) {
    return { ok: false, kind: 'form', reason: `${shown} uses an exponent; write the digits out (${Dec(t.replace(/^\+/, '')).toString()})` };
  }
  if (/^[+-]?\d+,\d+$/.test(t)) return { ok: false, kind: 'form', reason: `${shown} has a decimal comma; use a point (${t.replace(',', '.')})` };
  return { ok: false, kind: 'plain', reason: `${shown} is not a number; enter digits with an optional sign and decimal point` };
}

/** Unrounded raw value: value × factor ÷ divisor + offset; undefined when the scale is unusable (0 or not finite). */
export function scaleExact(value: Decimal, scale: Scale | undefined): Decimal | undefined {
  if (!scale) return value;
  const factor = decimalOf(scale.factor);
  const divisor = decimalOf(scale.divisor ?? 1);
  const offset = decimalOf(scale.offset ?? 0);
  if (!factor || !divisor || !offset || factor.eq(0) || divisor.eq(0)) return undefined;
  const product = value.times(factor);
  return (divisor.eq(1) ? product : product.div(divisor)).plus(offset);
}

/** Engineering value of a raw value: (raw − offset) × divisor ÷ factor (40 places when it does not terminate). */
export function engineeringExact(raw: Decimal, scale: Scale | undefined): Decimal | undefined {
  if (!scale) return raw;
  const factor = decimalOf(scale.factor);
  const divisor = decimalOf(scale.divisor ?? 1);
  const offset = decimalOf(scale.offset ?? 0);
  if (!factor || !divisor || !offset || factor.eq(0) || divisor.eq(0)) return undefined;
  return raw.minus(offset).times(divisor).div(factor);
}

/** Rounds to `places` decimals, half away from zero (a jog of −0.5 step sends −1). */
export function roundExact(x: Decimal, places = 0): Decimal {
  return x.round(places, Dec.roundHalfUp);
}

/** Exact decimal text of a typed value rounded half away from zero, or undefined when it is not a number. */
export function roundHalfAway(x: string | number, places = 0): string | undefined {
  const r = readTypedNumber(x);
  return r.ok ? roundExact(r.value, places).toString() : undefined;
}

/** Exact raw value (unrounded) of a typed engineering value as decimal text, or undefined. */
export function scaleToRaw(value: string | number, scale: Scale | undefined): string | undefined {
  const r = readTypedNumber(value);
  return r.ok ? scaleExact(r.value, scale)?.toString() : undefined;
}

/** Engineering value of a raw value as decimal text, or undefined. */
export function rawToEngineering(raw: string | number, scale: Scale | undefined): string | undefined {
  const r = readTypedNumber(raw);
  return r.ok ? engineeringExact(r.value, scale)?.toString() : undefined;
}

/** Text sent for a rounded raw value (`-4500`, `1.01`): sign and padding applied to `width`. */
export function formatNumber(rawText: string, field: IntegerField | DecimalField): string {
  const negative = rawText.charCodeAt(0) === 0x2d;
  const sign = negative ? '-' : field.sign === 'always' ? '+' : '';
  const digits = negative ? rawText.slice(1) : rawText;
  const width = field.width ?? 0;
  const fill = width - sign.length - digits.length;
  if (fill <= 0) return sign + digits;
  return field.pad === 'zero' ? sign + '0'.repeat(fill) + digits : ' '.repeat(fill) + sign + digits;
}

/**
 * Raw number from received field text, or undefined: leading spaces, an optional sign, digits, and for
 * decimal fields an optional fraction. Integer fields reject a fraction.
 */
export function readNumber(text: string, decimal: boolean): Decimal | undefined {
  const re = decimal ? /^ *[+-]?(\d+(\.\d*)?|\.\d+)$/ : /^ *[+-]?\d+$/;
  if (!re.test(text)) return undefined;
  const t = text.trim();
  return Dec(t.startsWith('+') ? t.slice(1) : t);
}

/** The nearest JS number of an exact decimal, for labels and JSON (the bytes sent are exact). */
export function toNumber(d: Decimal): number {
  return Number(d.toString());
}
