/**
 * Structured Text (IEC 61131-3) that builds a command's bytes at run time from its fields, giving exactly
 * the bytes `assembleFrame` gives for the same values. See docs/frame-engine.md, "PLC code".
 */
import { segmentBytes } from '../assemble';
import { resolveChecksum } from '../checksum';
import { encodeField } from '../field-encode';
import { longestFrame } from '../longest';
import { type Result, failure, success } from '../result';
import type { FieldValues, Segment, Template } from '../template';
import { checksumCode } from './checksum-code';
import { type Ctx, Writer, appendConst, ascii, comment, emitChecksum, emitChoice, emitNumber, emitText, useVar } from './emit';
import { IdentifierPool, identifierProblem, toIdentifier } from './identifiers';
import { inputUnitText, planNumber } from './number-plan';

/** `string`: a FUNCTION returning STRING(n); `bytes`: a FUNCTION_BLOCK with an ARRAY OF BYTE and a length. */
export type PlcForm = 'string' | 'bytes';

export interface PlcStepInput {
  template: Template;
  /** Fields given here are fixed: their text is worked out now and written as a constant. */
  fixed?: FieldValues;
}

export interface PlcCodeOptions {
  /** Name of the command (or sequence) the POU is named after. */
  name: string;
  /** Put in front of the POU name (`DRV_` → `DRV_Index_45`); empty by default. */
  prefix?: string;
  /** Preferred form; a frame a STRING cannot carry is always given in the byte form. */
  form?: PlcForm;
  /** Write the caution at the top (default true; a file of several POUs writes it once). */
  caution?: boolean;
  /** Names the POU must not take (other POUs of the same file), compared without letter case. */
  taken?: Iterable<string>;
}

/** One input of the generated POU. */
export interface PlcInput {
  name: string;
  step: number;
  field: string;
  kind: 'number' | 'text' | 'choice';
  /** Numbers: input unit 10^−inputDecimals, inclusive limits in input units. */
  inputDecimals?: number;
  lo?: number;
  hi?: number;
  /** Text: declared STRING length. */
  maxLength?: number;
  /** Choices: option values in the order of their numbers (1 = first). */
  options?: string[];
}

export interface PlcNote {
  severity: 'info' | 'warning';
  message: string;
}

export interface PlcCode {
  /** POU name. */
  name: string;
  form: PlcForm;
  code: string;
  /** Declared length: STRING(n) or ARRAY [1..n] OF BYTE. */
  capacity: number;
  inputs: PlcInput[];
  findings: PlcNote[];
}

/** Caution written at the top of every generated file. */
export const PLC_CAUTION = [
  'CAUTION: the commands this code builds move machinery. Test it with the machine in a safe state,',
  "under the site's lockout procedure, and against the device's own manual before it runs in production.",
];

/** Most characters many controllers allow in one STRING. */
const COMMON_STRING_LIMIT = 254;
const LOCALS = ['Out', 'Count', 'Error', 'Buf', 'Bytes', 'Length', 'T', 'Q', 'Rem', 'Neg', 'Mag', 'Tmp', 'Div', 'NDig', 'Fill', 'D', 'I', 'K',
  'Code', 'Txt', 'Acc', 'X', 'Crc', 'Rf', 'Cv', 'Bt', 'Cd', 'Nb', 'Hv', 'Lv', 'From', 'Upto', 'Printable'];

/** Why a segment cannot be generated (null = it can). */
function segmentProblem(s: Segment, fixed: boolean): string | null {
  if (s.type === 'checksum') {
    const a = resolveChecksum(s);
    if (!a) return `Checksum "${s.algorithm}" is not in the catalogue`;
    const code = checksumCode(a);
    if (typeof code === 'string') return code;
    if (s.encoding === 'ascii-decimal' && a.width > 31) return `${a.name} as decimal characters needs 32-bit unsigned arithmetic; place it as hex characters or binary`;
    return null;
  }
  if (fixed || s.type === 'literal' || s.type === 'terminator') return null;
  if (s.type === 'text') {
    const name = s.label || s.name;
    if (s.maxLength === undefined) return `Text field "${name}" has no maxLength, so its STRING input cannot be declared; give it one`;
    if (s.maxLength < 1) return `Text field "${name}" has maxLength 0; give it 1 or more, or make it a literal`;
    if (s.allowed !== undefined && [...s.allowed].some((c) => c.charCodeAt(0) < 0x20 || c.charCodeAt(0) > 0x7e)) {
      return `Text field "${name}" allows characters outside printable ASCII, which the generated code cannot look up; allow printable characters only`;
    }
  }
  return null;
}

/** The fixed text of a field, or the engine's reason it cannot be sent. */
function fixedText(s: Segment, fixed: FieldValues | undefined): Result<Uint8Array> | null {
  if (!fixed || s.type === 'literal' || s.type === 'terminator' || s.type === 'checksum') return null;
  const v = fixed[s.name];
  if (v === undefined) return null;
  const e = encodeField(s, fixed);
  const error = e.findings.find((f) => f.severity === 'error');
  return error ? failure(0, error.message) : success(ascii(e.text));
}

/** Why `prefix` cannot start a POU name, or null (empty is fine). */
export function prefixProblem(prefix: string): string | null {
  if (!prefix || /^[A-Za-z][A-Za-z0-9]*(_[A-Za-z0-9]+)*_?$/.test(prefix)) return null;
  return `The prefix "${prefix}" is not the start of an IEC 61131-3 identifier: use letters, digits and single underscores, starting with a letter`;
}

/**
 * Generates one POU that builds the steps' bytes back to back. Refuses (with a message) what it cannot
 * generate exactly: a text field without maxLength, a scale DINT arithmetic cannot follow, a fixed value
 * the engine refuses, a 32-bit checksum as decimal characters.
 */
export function generatePlcCode(steps: readonly PlcStepInput[], options: PlcCodeOptions): Result<PlcCode> {
  if (steps.length === 0) return failure(0, 'There is nothing to generate: give at least one template');
  const prefix = options.prefix ?? '';
  const bad = prefixProblem(prefix);
  if (bad) return failure(0, bad);
  const base = toIdentifier(options.name, 'Cmd');
  // locals and the checksum's position variables (Start0, S0_1, E0_2) are never the POU's name
  const pou = new IdentifierPool([...(options.taken ?? []), ...LOCALS]).take(prefix ? (prefix.endsWith('_') ? prefix + base : `${prefix}_${base}`) : base);
  const nameProblem = /^(Start\d+|[SE]\d+_\d+)$/i.test(pou) ? `"${pou}" is the name of a variable inside the code; choose another name or a prefix` : identifierProblem(pou);
  if (nameProblem) return failure(0, `The name does not make a usable POU name: ${nameProblem}`);

  // What each segment is, checked before any code is written
  const findings: PlcNote[] = [];
  const constants = new Map<string, Uint8Array>();
  let binary = false;
  for (const [si, step] of steps.entries()) {
    for (const [i, s] of step.template.segments.entries()) {
      const fx = fixedText(s, step.fixed);
      if (fx && !fx.ok) return failure(0, `${steps.length > 1 ? `Step ${si + 1}: ` : ''}the fixed value cannot be sent: ${fx.error.message}`);
      if (fx?.ok) constants.set(`${si}:${i}`, fx.value);
      const problem = segmentProblem(s, !!fx);
      if (problem) return failure(0, `${steps.length > 1 ? `Step ${si + 1}: ` : ''}${problem}`);
      const bytes = fx?.ok ? fx.value : s.type === 'literal' || s.type === 'terminator' ? segmentBytes(s) : null;
      if (bytes?.includes(0)) binary = true;
      if (s.type === 'checksum' && s.encoding === 'binary') binary = true;
    }
  }
  let form: PlcForm = options.form ?? 'string';
  if (form === 'string' && binary) {
    form = 'bytes';
    findings.push({ severity: 'info', message: 'The frame can contain a NUL byte (a binary checksum or a 00 byte), which a STRING cannot carry; the code fills an ARRAY OF BYTE instead.' });
  }

  // Longest frame, as the STRING or array is declared
  let capacity = 0;
  for (const step of steps) {
    const widest = longestFrame(step.template);
    capacity += widest.byteCount ?? 0;
  }
  capacity = Math.max(1, capacity);
  if (form === 'string' && capacity > COMMON_STRING_LIMIT) {
    findings.push({ severity: 'warning', message: `The longest string is ${capacity} characters; many controllers allow at most ${COMMON_STRING_LIMIT} in a STRING. Use the byte form if yours does.` });
  }

  const marks = new Set<string>();
  const needsBuf = steps.some((st) => st.template.segments.some((s) => s.type === 'checksum'));
  steps.forEach((st, si) => st.template.segments.forEach((s) => {
    if (s.type !== 'checksum') return;
    marks.add(s.range.from === 'start' ? `start:${si}` : `s:${si}:${s.range.from}`);
    if (s.range.to !== 'checksum') marks.add(`e:${si}:${s.range.to}`);
  }));

  const markNames = [...marks].map((m) => {
    const [kind, si, i] = m.split(':');
    return kind === 'start' ? `Start${si}` : `${kind === 's' ? 'S' : 'E'}${si}_${i}`;
  });
  const pool = new IdentifierPool([...LOCALS, ...markNames, pou]);
  const inputs: PlcInput[] = [];
  const decls: string[] = [];
  const w = new Writer();
  const ctx: Ctx = { w, form, buf: form === 'bytes' ? 'Bytes' : needsBuf ? 'Buf' : null, pou, vars: new Map(), marks };

  for (const [si, step] of steps.entries()) {
    const tag = steps.length > 1 ? `Step ${si + 1}` : null;
    if (tag) w.line('', comment(tag));
    if (marks.has(`start:${si}`)) {
      useVar(ctx, `Start${si}`, 'INT');
      w.line(`Start${si} := Count + 1;`);
    }
    for (const [i, s] of step.template.segments.entries()) {
      const label = s.type === 'literal' || s.type === 'terminator' || s.type === 'checksum' ? s.type : `${s.type} field ${s.name}`;
      w.line(comment(`segment ${i}: ${label}`));
      if (marks.has(`s:${si}:${i}`)) {
        useVar(ctx, `S${si}_${i}`, 'INT');
        w.line(`S${si}_${i} := Count + 1;`);
      }
      const constant = constants.get(`${si}:${i}`) ?? (s.type === 'literal' || s.type === 'terminator' ? segmentBytes(s) : null);
      if (constant) appendConst(ctx, constant);
      else if (s.type === 'checksum') emitChecksum(ctx, s, si);
      else if (s.type !== 'literal' && s.type !== 'terminator') {
        const name = pool.take(toIdentifier(s.name, 'F'));
        const errorCode = inputs.length + 1;
        const where = `${tag ? `${tag}, ` : ''}${s.label || s.name}`;
        if (s.type === 'integer' || s.type === 'decimal') {
          const planned = planNumber(s);
          if (!planned.ok) return failure(0, `${tag ? `${tag}: ` : ''}${planned.reason}`);
          const plan = planned.plan;
          const unit = s.unit ? ` ${s.unit}` : '';
          const limits = `${plan.lo} to ${plan.hi}${plan.fromLimits.lo && plan.fromLimits.hi ? '' : ' (the most DINT arithmetic allows here)'}`;
          const inUnit = plan.inputDecimals ? `in ${inputUnitText(plan.inputDecimals)}${unit || ' units'}` : `whole${unit || ' units'}`;
          decls.push(`${name} : DINT; ${comment(`${where}: ${inUnit}, ${limits}`)}`);
          inputs.push({ name, step: si, field: s.name, kind: 'number', inputDecimals: plan.inputDecimals, lo: plan.lo, hi: plan.hi });
          emitNumber(ctx, s, name, plan, errorCode);
        } else if (s.type === 'text') {
          decls.push(`${name} : STRING(${s.maxLength}); ${comment(`${where}: text, at most ${s.maxLength} characters${s.case !== 'as-is' ? `, sent in ${s.case} case` : ''}${s.default ? `; empty sends the default` : ''}`)}`);
          inputs.push({ name, step: si, field: s.name, kind: 'text', maxLength: s.maxLength! });
          emitText(ctx, s, name, errorCode);
        } else {
          const list = s.options.map((o, k) => `${k + 1} = ${o.value}`).join(', ');
          decls.push(`${name} : INT; ${comment(`${where}: ${list}`)}`);
          inputs.push({ name, step: si, field: s.name, kind: 'choice', options: s.options.map((o) => o.value) });
          emitChoice(ctx, s, name, errorCode);
        }
      }
      if (marks.has(`e:${si}:${i}`)) {
        useVar(ctx, `E${si}_${i}`, 'INT');
        w.line(`E${si}_${i} := Count;`);
      }
    }
  }

  const out: string[] = [];
  if (options.caution ?? true) out.push(...PLC_CAUTION.map(comment));
  out.push(comment(`Structured Text (IEC 61131-3) generated for "${options.name}". Numbers are turned into text by the code`));
  out.push(comment('below, not by a conversion function: vendor conversion functions differ in padding and truncation.'));
  out.push(comment('Number inputs are whole numbers of the unit named beside them, scaled with integer arithmetic'));
  out.push(comment('exactly as the command template scales them (rounding half away from zero).'));
  out.push('');
  const header = form === 'string' ? `FUNCTION ${pou} : STRING(${capacity})` : `FUNCTION_BLOCK ${pou}`;
  out.push(header);
  if (decls.length) {
    out.push('VAR_INPUT');
    out.push(...decls.map((d) => `    ${d}`));
    out.push('END_VAR');
  }
  out.push('VAR_OUTPUT');
  if (form === 'bytes') {
    out.push(`    Bytes : ARRAY [1..${capacity}] OF BYTE; ${comment('the frame, Length bytes from Bytes[1]')}`);
    out.push(`    Length : INT; ${comment('bytes in the frame; 0 when Error is not 0')}`);
  }
  const errors = ['0: built', inputs.length === 1 ? '1: the input is out of its range or not allowed' : inputs.length ? `1-${inputs.length}: that input (in the order above) is out of its range or not allowed` : null,
    form === 'string' ? '-1: the STRING came out shorter than built' : null, steps.some((st) => st.template.segments.some((s) => s.type === 'checksum' && s.over === 'decoded-hex')) ? '-2: the checksum covers characters that are not hex pairs' : null]
    .filter(Boolean).join('; ');
  out.push(`    Error : INT; ${comment(errors)}`);
  out.push('END_VAR');
  out.push('VAR');
  if (form === 'string') out.push(`    Out : STRING(${capacity});`);
  if (ctx.buf === 'Buf') out.push(`    Buf : ARRAY [1..${capacity}] OF BYTE;`);
  out.push('    Count : INT;');
  for (const [n, t] of [...ctx.vars].filter(([n]) => n !== 'Printable').sort(([x], [y]) => x.localeCompare(y))) out.push(`    ${n} : ${t};`);
  out.push('END_VAR');
  if (ctx.vars.has('Printable')) {
    out.push('VAR CONSTANT');
    out.push(`    Printable : ${ctx.vars.get('Printable')};`);
    out.push('END_VAR');
  }
  out.push('');
  out.push('Error := 0;', 'Count := 0;');
  if (form === 'string') out.push("Out := '';");
  else out.push('Length := 0;');
  out.push(...w.lines);
  out.push('');
  if (form === 'string') {
    out.push(comment(`the STRING must hold every character built; a controller that cuts it short is caught here`));
    out.push('IF LEN(Out) <> Count THEN', '    Error := -1;', `    ${pou} := '';`, '    RETURN;', 'END_IF;');
    out.push(`${pou} := Out;`);
    out.push('END_FUNCTION');
  } else {
    out.push('Length := Count;');
    out.push('END_FUNCTION_BLOCK');
  }
  return success({ name: pou, form, code: out.join('\n') + '\n', capacity, inputs, findings });
}
