/** Running generated Structured Text in the test evaluator and reading back the bytes it built. */
import type { PlcCode } from '~/lib/frame/plc-code';
import { runSt } from './st-eval';

export interface StRun {
  error: number;
  bytes: Uint8Array;
}

/** Runs the POU with inputs keyed by input name; the bytes of the STRING result or of Bytes[1..Length]. */
export function runPlc(code: PlcCode, inputs: Record<string, number | string>): StRun {
  const r = runSt(code.code, inputs);
  const error = r.outputs.ERROR as number;
  if (code.form === 'string') return { error, bytes: Uint8Array.from(r.result!, (c) => c.charCodeAt(0)) };
  const length = r.outputs.LENGTH as number;
  return { error, bytes: Uint8Array.from((r.outputs.BYTES as number[]).slice(0, length)) };
}

/** Decimal text of n × 10^−p, written here independently: (−5, 2) → `-0.05`. */
export function scaledText(n: number, p: number): string {
  const digits = String(Math.abs(n)).padStart(p + 1, '0');
  const text = p ? `${digits.slice(0, digits.length - p)}.${digits.slice(digits.length - p)}` : digits;
  return n < 0 ? `-${text}` : text;
}

export const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));
export const hex = (b: Uint8Array) => Array.from(b, (x) => x.toString(16).toUpperCase().padStart(2, '0')).join(' ');
