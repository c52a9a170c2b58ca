/** Number formatting for the composer panels (milliseconds, microseconds, rates). */

/** 1.0417 → "1.042 ms"; at least 3 significant digits, no more than 3 decimals. */
export function ms(value: number): string {
  if (!Number.isFinite(value)) return '–';
  const decimals = value >= 100 ? 1 : 3;
  return `${value.toFixed(decimals)} ms`;
}

export function us(value: number): string {
  if (value === 0) return '0 µs';
  return value >= 1000 ? ms(value / 1000) : `${value.toFixed(value >= 100 ? 0 : 1)} µs`;
}

/** 27.4 → "27.4"; 960 → "960"; thousands with thin spaces. */
export function rate(value: number): string {
  if (!Number.isFinite(value)) return '–';
  const fixed = value >= 100 ? Math.round(value).toString() : value.toFixed(1);
  return fixed.replace(/\B(?=(\d{3})+(?!\d))/g, '\u202f');
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}
