/**
 * The statements of generated Structured Text: constants, digits, text characters and checksums appended to
 * the STRING (and to the byte buffer the checksums read), in the subset docs/frame-engine.md lists.
 */
import { resolveChecksum } from '../checksum';
import { renderIecLiteral } from '../notations/iec';
import type { ChecksumSegment, ChoiceField, DecimalField, IntegerField, TextField } from '../template';
import { checksumCode, hexLiteral } from './checksum-code';
import type { PlcForm } from './generate';
import type { NumberPlan } from './number-plan';

export const PRINTABLE = Uint8Array.from({ length: 95 }, (_, i) => 0x20 + i);

/** ASCII spellings of the signs units and names use; anything else outside ASCII becomes `?` (source files stay ASCII). */
const ASCII_OF: Record<string, string> = { '°': 'deg', '²': '^2', '³': '^3', 'µ': 'u', 'Ω': 'ohm', '−': '-', '±': '+/-', '×': 'x', '÷': '/', '–': '-', '—': '-' };
const asciiText = (text: string) => text.replace(/[^\x20-\x7e]/g, (c) => ASCII_OF[c] ?? '?');
export const comment = (text: string) => `(* ${asciiText(text).replace(/\(\*|\*\)/g, (m) => (m === '(*' ? '( *' : '* )'))} *)`;
export const lit = (bytes: Uint8Array) => renderIecLiteral(bytes);
export const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0) & 0xff);

export class Writer {
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

export interface Ctx {
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

export function useVar(ctx: Ctx, name: string, type: string) {
  ctx.vars.set(name, type);
}

export function appendConst(ctx: Ctx, bytes: Uint8Array) {
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

export function emitNumber(ctx: Ctx, field: IntegerField | DecimalField, input: string, plan: NumberPlan, errorCode: number) {
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

export function emitText(ctx: Ctx, field: TextField, input: string, errorCode: number) {
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

export function emitChoice(ctx: Ctx, field: ChoiceField, input: string, errorCode: number) {
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

export function emitChecksum(ctx: Ctx, s: ChecksumSegment, step: number) {
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
}
