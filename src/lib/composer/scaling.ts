/** Units and scaling for numeric fields: engineering value in, raw value sent, shown as both. */
import { decimalOf, roundExact, scaleExact, toNumber } from '../frame/field-format';
import { scaleFieldNumber } from '../frame/field-number';
import type { DecimalField, IntegerField, Scale } from '../frame/template';

/** Degrees of one revolution; a drive set to N steps per revolution scales degrees by N / 360. */
export const DEGREES_PER_REV = 360;

/**
 * Scale for an angle in degrees on a drive with `stepsPerRev` steps per revolution: factor N / 360 when
 * that is an exact short decimal (36,000 → factor 100), else factor N with divisor 360 (1,000 → 1000 / 360),
 * so 90° is exactly 250 steps.
 */
export function scaleFromStepsPerRev(stepsPerRev: number): Scale {
  const factor = stepsPerRev / DEGREES_PER_REV;
  const steps = decimalOf(stepsPerRev);
  const back = decimalOf(factor)?.times(DEGREES_PER_REV);
  if (steps && back && back.eq(steps)) return { factor, offset: 0 };
  return { factor: stepsPerRev, divisor: DEGREES_PER_REV, offset: 0 };
}

/** The steps per revolution a degrees field's scale stands for (factor ÷ divisor × 360), or null when the unit is not degrees. */
export function stepsPerRevOf(field: Pick<IntegerField, 'unit' | 'scale'>): number | null {
  if (!field.scale || !isDegrees(field.unit)) return null;
  const perDegree = scaleExact(decimalOf(1)!, { ...field.scale, offset: 0 });
  return perDegree ? toNumber(roundExact(perDegree.times(DEGREES_PER_REV), 9)) : null;
}

export function isDegrees(unit: string | undefined): boolean {
  return unit === '°' || unit === 'deg' || unit === 'degrees';
}

/** "45 ° = 4500 steps" (the raw value as sent) — or null when the field has no scale or the value is not a number. */
export function bothUnits(field: IntegerField | DecimalField, value: unknown, rawUnit = 'raw'): string | null {
  if (!field.scale) return null;
  if (typeof value !== 'number' && typeof value !== 'string') return null;
  const r = scaleFieldNumber(field, value);
  if (!r.ok) return null;
  return `${r.number.valueText}${field.unit ? ` ${field.unit}` : ''} = ${r.number.rawText} ${rawUnit || 'raw'}`;
}
