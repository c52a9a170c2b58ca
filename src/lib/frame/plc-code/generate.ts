/**
 * Structured Text (IEC 61131-3) that builds a command's bytes at run time from its fields, giving exactly
 * the bytes `assembleFrame` gives for the same values. See docs/frame-engine.md, "PLC code".
 */
import { segmentBytes } from '../assemble';
import { resolveChecksum } from '../checksum';
import { encodeField } from '../field-encode';
import { longestFrame } from '../longest';
import { renderIecLiteral } from '../notations/iec';
import { type Result, failure, success } from '../result';
import type { ChecksumSegment, ChoiceField, DecimalField, FieldValues, IntegerField, Segment, Template, TextField } from '../template';
import { checksumCode, hexLiteral } from './checksum-code';
import { IdentifierPool, identifierProblem, toIdentifier } from './identifiers';
import { type NumberPlan, inputUnitText, planNumber } from './number-plan';

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
const PRINTABLE = Uint8Array.from({ length: 95 }, (_, i) => 0x20 + i);
const LOCALS = ['Out', 'Count', 'Error', 'Buf', 'Bytes', 'Length', 'T', 'Q', 'Rem', 'Neg', 'Mag', 'Tmp', 'Div', 'NDig', 'Fill', 'D', 'I', 'K',
  'Code', 'Txt', 'Acc', 'X', 'Crc', 'Rf', 'Cv', 'Bt', 'Cd', 'Nb', 'Hv', 'Lv', 'From', 'Upto', 'Printable'];

/** ASCII spellings of the signs units and names use; anything else outside ASCII becomes `?` (source files stay ASCII). */
const ASCII_OF: Record<string, string> = { '°': 'deg', '²': '^2', '³': '^3', 'µ': 'u', 'Ω': 'ohm', '−': '-', '±': '+/-', '×': 'x', '÷': '/', '–': '-', '—': '-' };
const asciiText = (text: string) => text.replace(/[^\x20-\x7e]/g, (c) => ASCII_OF[c] ?? '?');
const comment = (text: string) => `(* ${asciiText(text).replace(/\(\*|\*\)/g, (m) => (m === '(*' ? '( *' : '* )'))} *)`;
const lit = (bytes: Uint8Array) => renderIecLiteral(bytes);
const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0) & 0xff);

class Writer {
  lines: string[] = [];
  private depth = 0;
  line(...ls: string[]) {
    for (const l of ls) this.lines.push('    '.repeat(this.depth) + l);
  }
  block(open: string, body: () => void, close: string) {
    this.line(open);
    this.depth++;
    body();
    this.depth--;
    this.line(close);
  }
  /** IF … ELSIF … ELSE … END_IF; a null condition is the ELSE branch (last). */
  chain(branches: [string | null, () => void][]) {
    branches.forEach(([cond, body], i) => {
      this.line(cond === null ? 'ELSE' : `${i ? 'ELSIF' : 'IF'} ${cond} THEN`);
      this.depth++;
      body();
      this.depth--;
    });
    this.line('END_IF;');
  }
}

interface Ctx {
  w: Writer;
  form: PlcForm;
  /** Buffer of bytes written: `Bytes` (byte form), `Buf` (string form with checksums), or null. */
  buf: string | null;
  pou: string;
  vars: Map<string, string>;
  /** Segments whose start/end positions a checksum needs: step → segment index. */
  marks: Set<string>;
}

function fail(ctx: Ctx, code: number | string) {
  ctx.w.line(`Error := ${code};`);
  if (ctx.form === 'string') ctx.w.line(`${ctx.pou} := '';`);
  else ctx.w.line('Length := 0;');
  ctx.w.line('RETURN;');
}

function useVar(ctx: Ctx, name: string, type: string) {
  ctx.vars.set(name, type);
}

function appendConst(ctx: Ctx, bytes: Uint8Array) {
  if (bytes.length === 0) return;
  if (ctx.form === 'string') ctx.w.line(`Out := CONCAT(Out, ${lit(bytes)});`);
  if (ctx.buf) bytes.forEach((b, i) => ctx.w.line(`${ctx.buf}[Count + ${i + 1}] := ${hexLiteral(b, 2)};`));
  ctx.w.line(`Count := Count + ${bytes.length};`);
}

/** Appends one character taken from `table` at 1-based position `pos`, whose byte is `byteExpr` (INT). */
function appendFrom(ctx: Ctx, table: string, pos: string, byteExpr: string) {
  if (ctx.form === 'string') ctx.w.line(`Out := CONCAT(Out, MID(IN := ${table}, L := 1, P := ${pos}));`);
  ctx.w.line('Count := Count + 1;');
  if (ctx.buf) ctx.w.line(`${ctx.buf}[Count] := INT_TO_BYTE(${byteExpr});`);
}

const appendDigit = (ctx: Ctx, d: string) => appendFrom(ctx, "'0123456789'", `${d} + 1`, `${d} + 48`);

function appendHexDigit(ctx: Ctx, n: string, lower: boolean) {
  // digits 10-15 are letters: 7 (or 39) more than 48 + value; n / 10 is 1 exactly for them
  appendFrom(ctx, lower ? "'0123456789abcdef'" : "'0123456789ABCDEF'", `${n} + 1`, `${n} + 48 + ${lower ? 39 : 7} * (${n} / 10)`);
}

function emitNumber(ctx: Ctx, field: IntegerField | DecimalField, input: string, plan: NumberPlan, errorCode: number) {
  const { w } = ctx;
  for (const [n, t] of [['T', 'DINT'], ['Neg', 'BOOL'], ['Mag', 'DINT'], ['Tmp', 'DINT'], ['Div', 'DINT'], ['NDig', 'INT'], ['D', 'INT'], ['I', 'INT']]) useVar(ctx, n!, t!);
  w.block(`IF ${input} < ${plan.lo} OR ${input} > ${plan.hi} THEN`, () => fail(ctx, errorCode), 'END_IF;');
  const product = plan.a === 1 ? input : `${input} * ${plan.a < 0 ? `(${plan.a})` : plan.a}`;
  w.line(`T := ${plan.b === 0 ? product : `${product} ${plan.b < 0 ? '-' : '+'} ${Math.abs(plan.b)}`};`);
  w.line('Neg := T < 0;');
  w.block('IF Neg THEN', () => w.line('T := -T;'), 'END_IF;');
  if (plan.c === 1) w.line('Mag := T;');
  else {
    useVar(ctx, 'Q', 'DINT');
    useVar(ctx, 'Rem', 'DINT');
    w.line(comment(`divide by ${plan.c}, rounding half away from zero`));
    w.line(`Q := T / ${plan.c};`, `Rem := T - Q * ${plan.c};`);
    w.block(`IF Rem * 2 >= ${plan.c} THEN`, () => w.line('Q := Q + 1;'), 'END_IF;');
    w.line('Mag := Q;', 'Neg := Neg AND Q <> 0;');
  }
  const d = plan.decimals;
  w.line(comment(`digits: at least ${d + 1}`), 'NDig := 1;', 'Div := 1;', 'Tmp := Mag;');
  w.block('WHILE Tmp >= 10 DO', () => w.line('Tmp := Tmp / 10;', 'Div := Div * 10;', 'NDig := NDig + 1;'), 'END_WHILE;');
  if (d > 0) w.block(`WHILE NDig < ${d + 1} DO`, () => w.line('Div := Div * 10;', 'NDig := NDig + 1;'), 'END_WHILE;');
  const signAlways = field.sign === 'always';
  const emitSign = () => {
    if (signAlways) w.chain([['Neg', () => appendConst(ctx, ascii('-'))], [null, () => appendConst(ctx, ascii('+'))]]);
    else w.block('IF Neg THEN', () => appendConst(ctx, ascii('-')), 'END_IF;');
  };
  if (field.width !== undefined) {
    useVar(ctx, 'Fill', 'INT');
    const fixed = (d > 0 ? 1 : 0) + (signAlways ? 1 : 0);
    w.line(`Fill := ${field.width} - NDig${fixed ? ` - ${fixed}` : ''};`);
    if (!signAlways) w.block('IF Neg THEN', () => w.line('Fill := Fill - 1;'), 'END_IF;');
    w.block('IF Fill < 0 THEN', () => {
      w.line(comment(`wider than the field's ${field.width} characters`));
      fail(ctx, errorCode);
    }, 'END_IF;');
    const fill = (ch: string) => w.block('FOR I := 1 TO Fill DO', () => appendConst(ctx, ascii(ch)), 'END_FOR;');
    if (field.pad === 'space') {
      fill(' ');
      emitSign();
    } else {
      emitSign();
      fill('0');
    }
  } else emitSign();
  w.block('FOR I := NDig TO 1 BY -1 DO', () => {
    w.line('D := DINT_TO_INT(Mag / Div);', 'Mag := Mag MOD Div;', 'Div := Div / 10;');
    appendDigit(ctx, 'D');
    if (d > 0) w.block(`IF I = ${d + 1} THEN`, () => appendConst(ctx, ascii('.')), 'END_IF;');
  }, 'END_FOR;');
}

function emitText(ctx: Ctx, field: TextField, input: string, errorCode: number) {
  const { w } = ctx;
  const max = field.maxLength!;
  const held = /^STRING\((\d+)\)$/.exec(ctx.vars.get('Txt') ?? '');
  useVar(ctx, 'Txt', `STRING(${Math.max(max, held ? Number(held[1]) : 0)})`);
  useVar(ctx, 'I', 'INT');
  useVar(ctx, 'K', 'INT');
  useVar(ctx, 'Code', 'INT');
  ctx.vars.set('Printable', `STRING(95) := ${lit(PRINTABLE)}`);
  w.line(`Txt := ${input};`);
  const def = field.default;
  // an empty input sends the default, as the engine does; an empty default sends nothing
  if (def === '') w.line(comment('empty sends nothing (the default is empty)'));
  else if (def !== undefined && def.length <= max && [...def].every((c) => c.charCodeAt(0) <= 0xff)) {
    w.block('IF LEN(Txt) = 0 THEN', () => w.line(`Txt := ${lit(ascii(def))};`), 'END_IF;');
  } else w.block('IF LEN(Txt) = 0 THEN', () => fail(ctx, errorCode), 'END_IF;');
  w.block('FOR I := 1 TO LEN(Txt) DO', () => {
    w.line(comment('the character code, found in the printable characters (0x20-0x7E)'));
    w.line('K := FIND(IN1 := Printable, IN2 := MID(IN := Txt, L := 1, P := I));');
    w.block('IF K = 0 THEN', () => fail(ctx, errorCode), 'END_IF;');
    w.line('Code := K + 31;');
    if (field.case === 'upper') w.block('IF Code >= 97 AND Code <= 122 THEN', () => w.line('Code := Code - 32;'), 'END_IF;');
    if (field.case === 'lower') w.block('IF Code >= 65 AND Code <= 90 THEN', () => w.line('Code := Code + 32;'), 'END_IF;');
    if (field.allowed !== undefined) {
      w.block(`IF FIND(IN1 := ${lit(ascii(field.allowed))}, IN2 := MID(IN := Printable, L := 1, P := Code - 31)) = 0 THEN`, () => fail(ctx, errorCode), 'END_IF;');
    }
    appendFrom(ctx, 'Printable', 'Code - 31', 'Code');
  }, 'END_FOR;');
}

function emitChoice(ctx: Ctx, field: ChoiceField, input: string, errorCode: number) {
  const { w } = ctx;
  w.line(`CASE ${input} OF`);
  field.options.forEach((o, i) => {
    w.block(`${i + 1}:`, () => {
      w.line(comment(`${o.value}${o.label ? ` (${o.label})` : ''}`));
      if (o.send.length) appendConst(ctx, ascii(o.send));
      else w.line(';');
    }, '');
    w.lines.pop();
  });
  w.block('ELSE', () => fail(ctx, errorCode), 'END_CASE;');
}

function emitChecksum(ctx: Ctx, s: ChecksumSegment, step: number, index: number) {
  const { w } = ctx;
  const a = resolveChecksum(s)!;
  const code = checksumCode(a);
  if (typeof code === 'string') throw new Error(code);
  for (const [n, t] of Object.entries(code.vars)) useVar(ctx, n, t);
  for (const [n, t] of [['Cv', 'DWORD'], ['Bt', 'BYTE'], ['I', 'INT'], ['K', 'INT'], ['From', 'INT'], ['Upto', 'INT']]) useVar(ctx, n!, t!);
  const from = s.range.from === 'start' ? `Start${step}` : `S${step}_${s.range.from}`;
  const to = s.range.to === 'checksum' ? 'Count' : `E${step}_${s.range.to}`;
  w.line(comment(`${a.name}${s.over === 'decoded-hex' ? ' over the bytes the hex characters stand for' : ''}, placed as ${s.encoding}`));
  w.line(`From := ${from};`, `Upto := ${to};`, ...code.init);
  if (s.over === 'decoded-hex') {
    useVar(ctx, 'Hv', 'INT');
    useVar(ctx, 'Lv', 'INT');
    w.line('I := From;');
    w.block('WHILE I <= Upto DO', () => {
      w.block('IF I = Upto THEN', () => {
        w.line(comment('an odd number of hex characters'));
        fail(ctx, -2);
      }, 'END_IF;');
      for (const [v, at] of [['Hv', 'I'], ['Lv', 'I + 1']] as const) {
        w.line(`${v} := BYTE_TO_INT(${ctx.buf}[${at}]);`);
        w.chain([
          [`${v} >= 48 AND ${v} <= 57`, () => w.line(`${v} := ${v} - 48;`)],
          [`${v} >= 65 AND ${v} <= 70`, () => w.line(`${v} := ${v} - 55;`)],
          [`${v} >= 97 AND ${v} <= 102`, () => w.line(`${v} := ${v} - 87;`)],
          [null, () => fail(ctx, -2)],
        ]);
      }
      w.line('Bt := INT_TO_BYTE(Hv * 16 + Lv);', ...code.update, 'I := I + 2;');
    }, 'END_WHILE;');
  } else {
    w.block('FOR I := From TO Upto DO', () => w.line(`Bt := ${ctx.buf}[I];`, ...code.update), 'END_FOR;');
  }
  w.line(...code.final);
  const n = Math.ceil(a.width / 8);
  if (s.encoding === 'ascii-decimal') {
    const digits = String(2 ** a.width - 1).length;
    useVar(ctx, 'Cd', 'DINT');
    useVar(ctx, 'Div', 'DINT');
    useVar(ctx, 'D', 'INT');
    w.line('Cd := DWORD_TO_DINT(Cv);', `Div := ${10 ** (digits - 1)};`);
    w.block(`FOR K := 1 TO ${digits} DO`, () => {
      w.line('D := DINT_TO_INT(Cd / Div);', 'Cd := Cd MOD Div;', 'Div := Div / 10;');
      appendDigit(ctx, 'D');
    }, 'END_FOR;');
  } else {
    if (s.encoding === 'ascii-hex') useVar(ctx, 'Nb', 'INT');
    for (let k = 0; k < n; k++) {
      const shift = 8 * (s.byteOrder === 'low-first' ? k : n - 1 - k);
      w.line(`Bt := DWORD_TO_BYTE(${shift ? `SHR(Cv, ${shift})` : 'Cv'} AND 16#000000FF);`);
      if (s.encoding === 'binary') w.line('Count := Count + 1;', `${ctx.buf}[Count] := Bt;`);
      else {
        w.line('Nb := BYTE_TO_INT(SHR(Bt, 4));');
        appendHexDigit(ctx, 'Nb', s.case === 'lower');
        w.line('Nb := BYTE_TO_INT(Bt AND 16#0F);');
        appendHexDigit(ctx, 'Nb', s.case === 'lower');
      }
    }
  }
  void index;
}

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
  const pou = new IdentifierPool(options.taken).take(prefix ? (prefix.endsWith('_') ? prefix + base : `${prefix}_${base}`) : base);
  const nameProblem = identifierProblem(pou);
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
      else if (s.type === 'checksum') emitChecksum(ctx, s, si, i);
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
  const errors = ['0: built', inputs.length ? `1-${inputs.length}: that input (in the order above) is out of its range or not allowed` : null,
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
