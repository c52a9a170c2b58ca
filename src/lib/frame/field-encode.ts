/** Turns one field value into the characters sent, with findings about the value. */
import { MAX_NUMBER_CHARS, formatNumber } from './field-format';
import { scaleFieldNumber } from './field-number';
import type { Finding } from './findings';
import type { ChoiceField, DecimalField, FieldSegment, FieldValues, IntegerField, TextField } from './template';

export interface EncodedField {
  /** Characters sent (each char code is one byte). */
  text: string;
  value?: number | string;
  raw?: number | string;
  /** Findings with ranges relative to the field's first byte. */
  findings: Finding[];
}

/** ASCII letters only change case: Unicode mappings would turn ſ into S or ß into SS behind the user's back. */
function asciiCase(text: string, to: 'upper' | 'lower'): string {
  // for ASCII text the built-in mapping is the ASCII one
  if (/^[\x00-\x7f]*$/.test(text)) return to === 'upper' ? text.toUpperCase() : text.toLowerCase();
  return to === 'upper' ? text.replace(/[a-z]+/g, (m) => m.toUpperCase()) : text.replace(/[A-Z]+/g, (m) => m.toLowerCase());
}

const show = (f: FieldSegment, v: number | string) => `${v}${f.unit ? ` ${f.unit}` : ''}`;
const title = (f: FieldSegment) => f.label || f.name;

function pick(field: FieldSegment, values: FieldValues): string | number | undefined {
  const v = values[field.name];
  if (v === undefined || v === null || v === '') return field.default ?? undefined;
  return v;
}

function missing(field: FieldSegment): EncodedField {
  return {
    text: '',
    findings: [{ severity: 'error', code: 'field-missing', segmentId: field.id, message: `${title(field)} has no value; enter one or give the field a default.` }],
  };
}

/** What is wrong with a numeric field built in code without the schema, or null. */
function numberFieldProblem(field: IntegerField | DecimalField): string | null {
  if (field.type === 'decimal' && !(Number.isInteger(field.decimals) && field.decimals >= 0 && field.decimals <= 9)) return `has ${field.decimals} decimals; use 0 to 9`;
  if (field.width !== undefined && !(Number.isInteger(field.width) && field.width >= 1 && field.width <= MAX_NUMBER_CHARS)) return `is ${field.width} characters wide; use 1 to ${MAX_NUMBER_CHARS}`;
  return null;
}

function encodeNumber(field: IntegerField | DecimalField, input: string | number): EncodedField {
  const findings: Finding[] = [];
  const error = (code: 'field-invalid' | 'field-too-wide', message: string): EncodedField => ({
    text: '',
    findings: [{ severity: 'error', code, segmentId: field.id, message }],
  });
  const shape = numberFieldProblem(field);
  if (shape) return error('field-invalid', `${title(field)} ${shape}; fix the field.`);
  const outcome = scaleFieldNumber(field, input);
  if (!outcome.ok) {
    return outcome.problem === 'reading'
      ? error('field-invalid', `${title(field)}: ${outcome.reason}.`)
      : error('field-invalid', `${title(field)} has a scale that cannot be used (factor and divisor must be finite and not 0); fix the field's scale.`);
  }
  const n = outcome.number;
  const shown = show(field, n.valueText);
  if (n.belowMin) {
    findings.push({ severity: 'error', code: 'field-out-of-range', segmentId: field.id, message: `${title(field)} ${shown} is below the minimum ${show(field, field.min!)}; enter ${show(field, field.min!)} or more.` });
  }
  if (n.aboveMax) {
    findings.push({ severity: 'error', code: 'field-out-of-range', segmentId: field.id, message: `${title(field)} ${shown} is above the maximum ${show(field, field.max!)}; enter ${show(field, field.max!)} or less.` });
  }
  if (n.rounded) {
    findings.push(field.type === 'integer'
      ? { severity: 'warning', code: 'field-not-integer', segmentId: field.id, message: `${title(field)} ${shown} gives ${n.exactText} raw, not a whole number; ${n.rawText} will be sent. Enter a value that scales to a whole number.` }
      : { severity: 'warning', code: 'field-rounded', segmentId: field.id, message: `${title(field)} ${n.exactText} has more than ${field.decimals} decimals; ${n.rawText} will be sent.` });
  }
  const text = formatNumber(n.rawText, field);
  if (text.length > MAX_NUMBER_CHARS) {
    const digits = n.rawText.replace('-', '').length;
    return { text: '', findings: [...findings, { severity: 'error', code: 'field-too-wide', segmentId: field.id, message: `${title(field)} ${shown} gives a raw value of ${digits} characters, more than the ${MAX_NUMBER_CHARS} a number field can send; enter a smaller value or check the scale.` }] };
  }
  if (field.width !== undefined && text.length > field.width) {
    findings.push({ severity: 'error', code: 'field-too-wide', segmentId: field.id, range: [0, text.length], message: `${title(field)} needs ${text.length} characters ("${text}") but the field is ${field.width} wide; enter a smaller value or widen the field.` });
  }
  return { text, value: n.value, raw: n.raw, findings };
}

function encodeText(field: TextField, input: string | number): EncodedField {
  const findings: Finding[] = [];
  const value = String(input);
  const text = field.case === 'upper' ? asciiCase(value, 'upper') : field.case === 'lower' ? asciiCase(value, 'lower') : value;
  if (field.maxLength !== undefined && text.length > field.maxLength) {
    findings.push({ severity: 'error', code: 'field-too-long', segmentId: field.id, range: [field.maxLength, text.length], message: `${title(field)} is ${text.length} characters long; the limit is ${field.maxLength}. Shorten it.` });
  }
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    const ok = field.allowed !== undefined ? field.allowed.includes(text[i]!) : c >= 0x20 && c <= 0x7e;
    if (!ok) {
      const what = c >= 0x20 && c <= 0x7e ? `"${text[i]}"` : `U+${c.toString(16).toUpperCase().padStart(4, '0')}`;
      findings.push({ severity: 'error', code: 'field-invalid-char', segmentId: field.id, range: [i, i + 1], message: `${title(field)} contains ${what} at character ${i}, which the field does not allow; remove it.` });
      break;
    }
  }
  return { text, value, raw: text, findings };
}

function encodeChoice(field: ChoiceField, input: string | number): EncodedField {
  const key = String(input);
  const folded = asciiCase(key, 'lower');
  const option = field.options.find((o) => o.value === key) ?? field.options.find((o) => asciiCase(o.value, 'lower') === folded);
  if (!option) {
    const list = field.options.map((o) => o.value).join(', ');
    return { text: '', findings: [{ severity: 'error', code: 'field-invalid', segmentId: field.id, message: `${title(field)} "${key}" is not one of the choices; pick one of ${list}.` }] };
  }
  return { text: option.send, value: option.value, raw: option.send, findings: [] };
}

export function encodeField(field: FieldSegment, values: FieldValues): EncodedField {
  const input = pick(field, values);
  if (input === undefined) return missing(field);
  switch (field.type) {
    case 'integer':
    case 'decimal':
      return encodeNumber(field, input);
    case 'text':
      return encodeText(field, input);
    case 'choice':
      return encodeChoice(field, input);
  }
}
