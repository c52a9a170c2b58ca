/** Turns one field value into the characters sent, with findings about the value. */
import { differs, formatNumber, roundDecimals, roundHalfAway, scaleToRaw } from './field-format';
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

function encodeNumber(field: IntegerField | DecimalField, input: string | number): EncodedField {
  const findings: Finding[] = [];
  const value = typeof input === 'number' ? input : input.trim() === '' ? Number.NaN : Number(input.trim());
  if (!Number.isFinite(value)) {
    return {
      text: '',
      findings: [{ severity: 'error', code: 'field-invalid', segmentId: field.id, message: `${title(field)} must be a number; "${input}" is not.` }],
    };
  }
  if (field.min !== undefined && value < field.min) {
    findings.push({ severity: 'error', code: 'field-out-of-range', segmentId: field.id, message: `${title(field)} ${show(field, value)} is below the minimum ${show(field, field.min)}; enter ${show(field, field.min)} or more.` });
  }
  if (field.max !== undefined && value > field.max) {
    findings.push({ severity: 'error', code: 'field-out-of-range', segmentId: field.id, message: `${title(field)} ${show(field, value)} is above the maximum ${show(field, field.max)}; enter ${show(field, field.max)} or less.` });
  }
  const exact = scaleToRaw(value, field.scale);
  let raw: number;
  if (field.type === 'integer') {
    raw = roundHalfAway(exact);
    if (raw !== exact) {
      findings.push({ severity: 'warning', code: 'field-not-integer', segmentId: field.id, message: `${title(field)} ${show(field, value)} gives ${exact} raw, not a whole number; ${raw} will be sent. Enter a value that scales to a whole number.` });
    }
  } else {
    raw = roundDecimals(exact, field.decimals);
    if (differs(raw, exact)) {
      findings.push({ severity: 'warning', code: 'field-rounded', segmentId: field.id, message: `${title(field)} ${exact} has more than ${field.decimals} decimals; ${raw} will be sent.` });
    }
  }
  const text = formatNumber(raw, field);
  if (field.width !== undefined && text.length > field.width) {
    findings.push({ severity: 'error', code: 'field-too-wide', segmentId: field.id, range: [0, text.length], message: `${title(field)} needs ${text.length} characters ("${text}") but the field is ${field.width} wide; enter a smaller value or widen the field.` });
  }
  return { text, value, raw, findings };
}

function encodeText(field: TextField, input: string | number): EncodedField {
  const findings: Finding[] = [];
  const value = String(input);
  const text = field.case === 'upper' ? value.toUpperCase() : field.case === 'lower' ? value.toLowerCase() : value;
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
  const option = field.options.find((o) => o.value === key) ?? field.options.find((o) => o.value.toLowerCase() === key.toLowerCase());
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
