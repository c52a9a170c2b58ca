/** Units and scaling for numeric fields: engineering value in, raw value sent, shown as both. */
import { scaleToRaw, roundHalfAway } from '../frame/field-format';
import type { DecimalField, IntegerField, Scale } from '../frame/template';

/** Degrees of one revolution; a drive set to N steps per revolution scales degrees by N / 360. */
export const DEGREES_PER_REV = 360;

/** Scale for an angle in degrees on a drive with `stepsPerRev` steps per revolution (36,000 → factor 100). */
export function scaleFromStepsPerRev(stepsPerRev: number): Scale {
  return { factor: stepsPerRev / DEGREES_PER_REV, offset: 0 };
}

/** The steps per revolution a degrees field's factor stands for, or null when the unit is not degrees. */
export function stepsPerRevOf(field: Pick<IntegerField, 'unit' | 'scale'>): number | null {
  if (!field.scale || !isDegrees(field.unit)) return null;
  return Math.round(field.scale.factor * DEGREES_PER_REV * 1e9) / 1e9;
}

export function isDegrees(unit: string | undefined): boolean {
  return unit === '°' || unit === 'deg' || unit === 'degrees';
}

/** "45 ° = 4500 steps" — or null when the field has no scale or the value is not a number. */
export function bothUnits(field: IntegerField | DecimalField, value: unknown, rawUnit = 'raw'): string | null {
  if (!field.scale) return null;
  const v = typeof value === 'number' ? value : Number(String(value ?? '').trim());
  if (value === '' || value === null || value === undefined || !Number.isFinite(v)) return null;
  const exact = scaleToRaw(v, field.scale);
  const raw = field.type === 'integer' ? roundHalfAway(exact) : exact;
  return `${v}${field.unit ? ` ${field.unit}` : ''} = ${raw} ${rawUnit || 'raw'}`;
}
