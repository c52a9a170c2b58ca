/**
 * An evaluator for exactly the Structured Text (IEC 61131-3) subset the PLC code generator emits, written
 * apart from the generator and the frame engine (it imports neither), so tests can run generated code and
 * compare its bytes with the engine's.
 *
 * Strict where controllers differ, so generated code never relies on a behaviour some controller lacks:
 * - types never mix: INT with DINT, or BYTE with DWORD, is an error (an untyped integer literal takes the
 *   other operand's type); arithmetic only on INT/DINT, bit operations only on BYTE/WORD/DWORD (and BOOL);
 * - INT and DINT overflow is an error, as is `/` or `MOD` with a negative operand or a zero divisor;
 * - a conversion (`DINT_TO_BYTE`, …) of a value outside the target's range is an error;
 * - a STRING assignment longer than the declared length is an error, as is MID outside the string or an
 *   array index outside its bounds;
 * - assigning the FOR variable inside its loop is an error; loops are capped at a step budget.
 *
 * Supported: FUNCTION / FUNCTION_BLOCK with VAR_INPUT, VAR_OUTPUT, VAR, VAR CONSTANT; BOOL, INT, DINT, BYTE,
 * WORD, DWORD, STRING(n), ARRAY [a..b] OF BYTE; assignments, IF/ELSIF/ELSE, FOR (BY), WHILE, CASE (integer
 * labels), RETURN, the empty statement; CONCAT, LEN, MID, FIND, SHL, SHR, NOT, AND, OR, XOR, MOD and the
 * conversions between the integer and bit types; literals 123, 16#FF, 2#1010, 8#17 and '…' with $ escapes.
 */

type Ty = 'BOOL' | 'INT' | 'DINT' | 'BYTE' | 'WORD' | 'DWORD' | 'STRING' | 'LIT';
type Val = { t: Ty; v: number | string | boolean };
type VarType = { kind: 'scalar'; t: Exclude<Ty, 'LIT'>; len?: number } | { kind: 'array'; lo: number; hi: number; of: 'BYTE' };

export class StError extends Error {}

const RANGE: Record<string, [number, number]> = {
  INT: [-32768, 32767], DINT: [-(2 ** 31), 2 ** 31 - 1], BYTE: [0, 0xff], WORD: [0, 0xffff], DWORD: [0, 0xffffffff],
};
const INTS = new Set(['INT', 'DINT']);
const BITS = new Set(['BYTE', 'WORD', 'DWORD']);
const BIT_WIDTH: Record<string, number> = { BYTE: 8, WORD: 16, DWORD: 32 };

// ---------------------------------------------------------------- tokens

type Tok = { k: 'id' | 'num' | 'str' | 'op'; s: string; n?: number; pos: number };

/** Bytes of an IEC 61131-3 single-byte string literal body (between the quotes), read here independently. */
export function readStringLiteral(body: string): string {
  let out = '';
  for (let i = 0; i < body.length; i++) {
    const c = body[i]!;
    const code = c.charCodeAt(0);
    if (code < 0x20 || code > 0x7e) throw new StError(`character U+${code.toString(16)} in a string literal; write it as $hh`);
    if (c === "'") throw new StError("a single quote inside a string literal is written $'");
    if (c !== '$') {
      out += c;
      continue;
    }
    const e = body[i + 1];
    if (e === undefined) throw new StError('$ at the end of a string literal');
    if (/[0-9A-Fa-f]/.test(e)) {
      const pair = body.slice(i + 1, i + 3);
      if (!/^[0-9A-Fa-f]{2}$/.test(pair)) throw new StError(`$${pair} needs two hex digits`);
      out += String.fromCharCode(parseInt(pair, 16));
      i += 2;
      continue;
    }
    const named: Record<string, number> = { $: 0x24, "'": 0x27, L: 0x0a, N: 0x0a, P: 0x0c, R: 0x0d, T: 0x09 };
    const b = named[e.toUpperCase()];
    if (b === undefined) throw new StError(`unknown escape $${e}`);
    out += String.fromCharCode(b);
    i += 1;
  }
  return out;
}

const OPS = new Set(['..', ':=', '=>', '<>', '<=', '>=', ':', '=', '<', '>', '+', '-', '*', '/', '(', ')', '[', ']', ',', ';', '&']);

function tokenize(src: string): Tok[] {
  const toks: Tok[] = [];
  let i = 0;
  while (i < src.length) {
    const c = src[i]!;
    if (/\s/.test(c)) {
      i++;
      continue;
    }
    if (src.startsWith('(*', i)) {
      const end = src.indexOf('*)', i + 2);
      if (end < 0) throw new StError('unterminated comment');
      i = end + 2;
      continue;
    }
    if (c === "'") {
      let j = i + 1;
      while (j < src.length && src[j] !== "'") j += src[j] === '$' ? 2 : 1;
      if (j >= src.length) throw new StError('unterminated string literal');
      toks.push({ k: 'str', s: readStringLiteral(src.slice(i + 1, j)), pos: i });
      i = j + 1;
      continue;
    }
    const num = /^(?:(2|8|16)#([0-9A-Fa-f_]+)|(\d[\d_]*))/.exec(src.slice(i));
    if (num && !/[A-Za-z_]/.test(src[i - 1] ?? '')) {
      const n = num[1] ? parseInt(num[2]!.replace(/_/g, ''), Number(num[1])) : Number(num[3]!.replace(/_/g, ''));
      if (!Number.isSafeInteger(n)) throw new StError(`bad number ${num[0]}`);
      toks.push({ k: 'num', s: num[0], n, pos: i });
      i += num[0].length;
      continue;
    }
    const id = /^[A-Za-z_][A-Za-z0-9_]*/.exec(src.slice(i));
    if (id) {
      if (/__/.test(id[0]) || id[0].endsWith('_')) throw new StError(`invalid identifier ${id[0]}`);
      toks.push({ k: 'id', s: id[0].toUpperCase(), pos: i });
      i += id[0].length;
      continue;
    }
    const op = ['..', ':=', '=>', '<>', '<=', '>='].find((o) => src.startsWith(o, i)) ?? c;
    if (!OPS.has(op)) throw new StError(`unexpected character ${c}`);
    toks.push({ k: 'op', s: op, pos: i });
    i += op.length;
  }
  return toks;
}

// ---------------------------------------------------------------- syntax tree

type Expr =
  | { e: 'lit'; v: Val }
  | { e: 'var'; name: string }
  | { e: 'idx'; name: string; index: Expr }
  | { e: 'call'; name: string; args: { name?: string; x: Expr }[] }
  | { e: 'un'; op: string; x: Expr }
  | { e: 'bin'; op: string; a: Expr; b: Expr };
type Target = { name: string; index?: Expr };
type Stmt =
  | { s: 'assign'; to: Target; x: Expr }
  | { s: 'if'; branches: { cond: Expr | null; body: Stmt[] }[] }
  | { s: 'for'; v: string; from: Expr; to: Expr; by: Expr | null; body: Stmt[] }
  | { s: 'while'; cond: Expr; body: Stmt[] }
  | { s: 'case'; sel: Expr; arms: { labels: number[]; body: Stmt[] }[]; other: Stmt[] | null }
  | { s: 'return' }
  | { s: 'empty' };

interface Decl {
  name: string;
  type: VarType;
  section: string;
  init?: Expr;
}

export interface Pou {
  kind: 'FUNCTION' | 'FUNCTION_BLOCK';
  name: string;
  result?: VarType;
  decls: Decl[];
  body: Stmt[];
}

class Parser {
  private at = 0;
  constructor(private readonly toks: Tok[]) {}
  private peek(o = 0) {
    return this.toks[this.at + o];
  }
  private is(s: string, o = 0) {
    const t = this.peek(o);
    return !!t && (t.k === 'id' || t.k === 'op') && t.s === s;
  }
  private next() {
    const t = this.toks[this.at++];
    if (!t) throw new StError('unexpected end of code');
    return t;
  }
  private expect(s: string) {
    const t = this.next();
    if (t.s !== s || (t.k !== 'id' && t.k !== 'op')) throw new StError(`expected ${s} at ${t.pos}, found ${t.s}`);
  }
  private ident() {
    const t = this.next();
    if (t.k !== 'id') throw new StError(`expected a name at ${t.pos}`);
    return t.s;
  }
  pou(): Pou {
    const kind = this.ident();
    if (kind !== 'FUNCTION' && kind !== 'FUNCTION_BLOCK') throw new StError('expected FUNCTION or FUNCTION_BLOCK');
    const name = this.ident();
    let result: VarType | undefined;
    if (kind === 'FUNCTION') {
      this.expect(':');
      result = this.type();
    }
    const decls: Decl[] = [];
    while (this.peek()?.k === 'id' && this.peek()!.s.startsWith('VAR')) {
      let section = this.ident();
      if (section === 'VAR' && this.is('CONSTANT')) {
        this.next();
        section = 'VAR_CONSTANT';
      }
      while (!this.is('END_VAR')) {
        const n = this.ident();
        this.expect(':');
        const type = this.type();
        let init: Expr | undefined;
        if (this.is(':=')) {
          this.next();
          init = this.expr();
        }
        this.expect(';');
        decls.push({ name: n, type, section, ...(init ? { init } : {}) });
      }
      this.next();
    }
    const body = this.stmts(['END_FUNCTION', 'END_FUNCTION_BLOCK']);
    this.expect(kind === 'FUNCTION' ? 'END_FUNCTION' : 'END_FUNCTION_BLOCK');
    if (this.peek()) throw new StError('code after the end of the POU');
    return { kind, name, ...(result ? { result } : {}), decls, body };
  }
  private type(): VarType {
    const t = this.ident();
    if (t === 'STRING') {
      this.expect('(');
      const n = this.next();
      this.expect(')');
      if (n.k !== 'num' || !n.n || n.n < 1) throw new StError('STRING needs a length');
      return { kind: 'scalar', t: 'STRING', len: n.n };
    }
    if (t === 'ARRAY') {
      this.expect('[');
      const lo = this.next().n!;
      this.expect('..');
      const hi = this.next().n!;
      this.expect(']');
      this.expect('OF');
      if (this.ident() !== 'BYTE') throw new StError('only ARRAY OF BYTE is in the subset');
      return { kind: 'array', lo, hi, of: 'BYTE' };
    }
    if (!['BOOL', 'INT', 'DINT', 'BYTE', 'WORD', 'DWORD'].includes(t)) throw new StError(`type ${t} is not in the subset`);
    return { kind: 'scalar', t: t as Exclude<Ty, 'LIT' | 'STRING'> };
  }
  private stmts(ends: string[]): Stmt[] {
    const out: Stmt[] = [];
    while (this.peek() && !ends.some((e) => this.is(e))) out.push(this.stmt());
    return out;
  }
  private stmt(): Stmt {
    if (this.is(';')) {
      this.next();
      return { s: 'empty' };
    }
    if (this.is('IF')) {
      this.next();
      const branches: { cond: Expr | null; body: Stmt[] }[] = [];
      let cond: Expr | null = this.expr();
      this.expect('THEN');
      for (;;) {
        const body = this.stmts(['ELSIF', 'ELSE', 'END_IF']);
        branches.push({ cond, body });
        if (this.is('ELSIF')) {
          this.next();
          cond = this.expr();
          this.expect('THEN');
        } else if (this.is('ELSE')) {
          this.next();
          branches.push({ cond: null, body: this.stmts(['END_IF']) });
          break;
        } else break;
      }
      this.expect('END_IF');
      this.expect(';');
      return { s: 'if', branches };
    }
    if (this.is('FOR')) {
      this.next();
      const v = this.ident();
      this.expect(':=');
      const from = this.expr();
      this.expect('TO');
      const to = this.expr();
      let by: Expr | null = null;
      if (this.is('BY')) {
        this.next();
        by = this.expr();
      }
      this.expect('DO');
      const body = this.stmts(['END_FOR']);
      this.expect('END_FOR');
      this.expect(';');
      return { s: 'for', v, from, to, by, body };
    }
    if (this.is('WHILE')) {
      this.next();
      const cond = this.expr();
      this.expect('DO');
      const body = this.stmts(['END_WHILE']);
      this.expect('END_WHILE');
      this.expect(';');
      return { s: 'while', cond, body };
    }
    if (this.is('CASE')) {
      this.next();
      const sel = this.expr();
      this.expect('OF');
      const arms: { labels: number[]; body: Stmt[] }[] = [];
      let other: Stmt[] | null = null;
      while (!this.is('END_CASE')) {
        if (this.is('ELSE')) {
          this.next();
          other = this.stmts(['END_CASE']);
          break;
        }
        const labels: number[] = [];
        do {
          if (labels.length) this.next();
          const neg = this.is('-') ? (this.next(), -1) : 1;
          const n = this.next();
          if (n.k !== 'num') throw new StError('CASE labels are integers here');
          labels.push(neg * n.n!);
        } while (this.is(','));
        this.expect(':');
        // an arm's statements run up to the next label (a number then ':') or ELSE / END_CASE
        const body: Stmt[] = [];
        while (!this.is('ELSE') && !this.is('END_CASE') && !(this.peek()?.k === 'num' && (this.is(':', 1) || this.is(',', 1)))) body.push(this.stmt());
        arms.push({ labels, body });
      }
      this.expect('END_CASE');
      this.expect(';');
      return { s: 'case', sel, arms, other };
    }
    if (this.is('RETURN')) {
      this.next();
      this.expect(';');
      return { s: 'return' };
    }
    const name = this.ident();
    let index: Expr | undefined;
    if (this.is('[')) {
      this.next();
      index = this.expr();
      this.expect(']');
    }
    this.expect(':=');
    const x = this.expr();
    this.expect(';');
    return { s: 'assign', to: { name, ...(index ? { index } : {}) }, x };
  }
  private static LEVELS = [['OR'], ['XOR'], ['AND', '&'], ['=', '<>'], ['<', '>', '<=', '>='], ['+', '-'], ['*', '/', 'MOD']];
  expr(level = 0): Expr {
    if (level === Parser.LEVELS.length) return this.unary();
    let a = this.expr(level + 1);
    while (Parser.LEVELS[level]!.some((o) => this.is(o))) {
      const op = this.next().s;
      const b = this.expr(level + 1);
      a = { e: 'bin', op: op === '&' ? 'AND' : op, a, b };
    }
    return a;
  }
  private unary(): Expr {
    if (this.is('-') || this.is('NOT')) {
      const op = this.next().s;
      return { e: 'un', op, x: this.unary() };
    }
    return this.primary();
  }
  private primary(): Expr {
    const t = this.next();
    if (t.k === 'num') return { e: 'lit', v: { t: 'LIT', v: t.n! } };
    if (t.k === 'str') return { e: 'lit', v: { t: 'STRING', v: t.s } };
    if (t.k === 'op' && t.s === '(') {
      const x = this.expr();
      this.expect(')');
      return x;
    }
    if (t.k !== 'id') throw new StError(`unexpected ${t.s} at ${t.pos}`);
    if (t.s === 'TRUE' || t.s === 'FALSE') return { e: 'lit', v: { t: 'BOOL', v: t.s === 'TRUE' } };
    if (this.is('(')) {
      this.next();
      const args: { name?: string; x: Expr }[] = [];
      while (!this.is(')')) {
        if (args.length) this.expect(',');
        if (this.peek()?.k === 'id' && this.is(':=', 1)) {
          const name = this.ident();
          this.next();
          args.push({ name, x: this.expr() });
        } else args.push({ x: this.expr() });
      }
      this.next();
      return { e: 'call', name: t.s, args };
    }
    if (this.is('[')) {
      this.next();
      const index = this.expr();
      this.expect(']');
      return { e: 'idx', name: t.s, index };
    }
    return { e: 'var', name: t.s };
  }
}

export function parsePou(src: string): Pou {
  return new Parser(tokenize(src)).pou();
}

// ---------------------------------------------------------------- running

class Return {}

export interface RunResult {
  /** FUNCTION result (a STRING as a string of byte-valued characters). */
  result?: string;
  outputs: Record<string, number | string | boolean | number[]>;
}

function fit(t: Ty, v: number, what: string): number {
  const r = RANGE[t];
  if (r && (v < r[0] || v > r[1] || !Number.isInteger(v))) throw new StError(`${what}: ${v} does not fit ${t}`);
  return v;
}

/** The common type of two operands: equal types, or a literal taking the other's. */
function unify(a: Val, b: Val, op: string): Ty {
  if (a.t === 'LIT') return b.t;
  if (b.t === 'LIT' || a.t === b.t) return a.t;
  throw new StError(`${op} mixes ${a.t} and ${b.t}`);
}

export class Machine {
  private readonly vars = new Map<string, { type: VarType; value: number | string | boolean | number[]; constant: boolean }>();
  private steps = 0;
  private readonly loopVars = new Set<string>();
  constructor(private readonly pou: Pou, private readonly budget = 5_000_000) {
    for (const d of pou.decls) {
      if (this.vars.has(d.name)) throw new StError(`${d.name} declared twice`);
      const zero = d.type.kind === 'array' ? new Array(d.type.hi - d.type.lo + 1).fill(0) : d.type.t === 'STRING' ? '' : d.type.t === 'BOOL' ? false : 0;
      this.vars.set(d.name, { type: d.type, value: zero, constant: d.section === 'VAR_CONSTANT' });
      if (d.init) this.store({ name: d.name }, this.eval(d.init), true);
    }
    if (pou.result) this.vars.set(pou.name, { type: pou.result, value: '', constant: false });
  }

  run(inputs: Record<string, number | string | boolean>): RunResult {
    for (const [k, v] of Object.entries(inputs)) {
      const d = this.pou.decls.find((x) => x.name === k.toUpperCase());
      if (!d || d.section !== 'VAR_INPUT') throw new StError(`${k} is not an input`);
      const t = d.type.kind === 'scalar' ? d.type.t : 'BYTE';
      this.store({ name: d.name }, { t, v }, true);
    }
    try {
      this.block(this.pou.body);
    } catch (e) {
      if (!(e instanceof Return)) throw e;
    }
    const outputs: RunResult['outputs'] = {};
    for (const d of this.pou.decls) if (d.section === 'VAR_OUTPUT') outputs[d.name] = this.vars.get(d.name)!.value;
    return { ...(this.pou.result ? { result: this.vars.get(this.pou.name)!.value as string } : {}), outputs };
  }

  private tick() {
    if (++this.steps > this.budget) throw new StError('step budget exceeded (endless loop?)');
  }

  private block(list: Stmt[]) {
    for (const s of list) this.stmt(s);
  }

  private stmt(s: Stmt) {
    this.tick();
    switch (s.s) {
      case 'empty':
        return;
      case 'return':
        throw new Return();
      case 'assign':
        if (this.loopVars.has(s.to.name)) throw new StError(`${s.to.name} is assigned inside its own FOR loop`);
        this.store(s.to, this.eval(s.x));
        return;
      case 'if':
        for (const b of s.branches) {
          if (b.cond === null || this.bool(this.eval(b.cond))) {
            this.block(b.body);
            return;
          }
        }
        return;
      case 'while':
        while (this.bool(this.eval(s.cond))) {
          this.tick();
          this.block(s.body);
        }
        return;
      case 'case': {
        const sel = this.eval(s.sel);
        if (!INTS.has(sel.t)) throw new StError('CASE selector must be INT or DINT');
        const arm = s.arms.find((a) => a.labels.includes(sel.v as number));
        if (arm) this.block(arm.body);
        else if (s.other) this.block(s.other);
        return;
      }
      case 'for': {
        const v = this.vars.get(s.v);
        if (!v || v.type.kind !== 'scalar' || !INTS.has(v.type.t)) throw new StError(`FOR variable ${s.v} must be INT or DINT`);
        const t = v.type.t;
        const from = this.intOf(this.eval(s.from), t);
        const to = this.intOf(this.eval(s.to), t);
        const by = s.by ? this.intOf(this.eval(s.by), t) : 1;
        if (by === 0) throw new StError('FOR with BY 0');
        this.loopVars.add(s.v);
        try {
          for (let i = from; by > 0 ? i <= to : i >= to; i += by) {
            this.tick();
            v.value = fit(t, i, `FOR ${s.v}`);
            this.block(s.body);
          }
        } finally {
          this.loopVars.delete(s.v);
        }
        return;
      }
    }
  }

  private intOf(x: Val, t: Ty): number {
    if (x.t !== 'LIT' && x.t !== t) throw new StError(`expected ${t}, found ${x.t}`);
    return fit(t, x.v as number, 'value');
  }

  private bool(x: Val): boolean {
    if (x.t !== 'BOOL') throw new StError(`expected BOOL, found ${x.t}`);
    return x.v as boolean;
  }

  private store(to: Target, x: Val, init = false) {
    const slot = this.vars.get(to.name);
    if (!slot) throw new StError(`unknown variable ${to.name}`);
    if (slot.constant && !init) throw new StError(`${to.name} is a constant`);
    const section = this.pou.decls.find((d) => d.name === to.name)?.section;
    if (section === 'VAR_INPUT' && !init) throw new StError(`input ${to.name} is assigned`);
    if (slot.type.kind === 'array') {
      if (!to.index) throw new StError(`array ${to.name} needs an index`);
      const i = this.index(slot.type, this.eval(to.index), to.name);
      if (x.t !== 'BYTE' && x.t !== 'LIT') throw new StError(`${to.name}[] takes BYTE, not ${x.t}`);
      (slot.value as number[])[i] = fit('BYTE', x.v as number, to.name);
      return;
    }
    if (to.index) throw new StError(`${to.name} is not an array`);
    const t = slot.type.t;
    if (t === 'STRING') {
      if (x.t !== 'STRING') throw new StError(`${to.name} takes STRING, not ${x.t}`);
      if ((x.v as string).length > slot.type.len!) throw new StError(`${to.name} is STRING(${slot.type.len}); ${(x.v as string).length} characters do not fit`);
      slot.value = x.v;
      return;
    }
    if (x.t !== t && !(x.t === 'LIT' && t !== 'BOOL')) throw new StError(`${to.name} is ${t}, the value is ${x.t}`);
    slot.value = t === 'BOOL' ? x.v : fit(t, x.v as number, to.name);
  }

  private index(type: { lo: number; hi: number }, x: Val, name: string): number {
    if (!INTS.has(x.t) && x.t !== 'LIT') throw new StError(`index of ${name} must be an integer`);
    const i = x.v as number;
    if (i < type.lo || i > type.hi) throw new StError(`${name}[${i}] is outside [${type.lo}..${type.hi}]`);
    return i - type.lo;
  }

  private eval(x: Expr): Val {
    switch (x.e) {
      case 'lit':
        return x.v;
      case 'var': {
        const slot = this.vars.get(x.name);
        if (!slot || slot.type.kind === 'array') throw new StError(`unknown variable ${x.name}`);
        return { t: slot.type.t, v: slot.value as number | string | boolean };
      }
      case 'idx': {
        const slot = this.vars.get(x.name);
        if (!slot || slot.type.kind !== 'array') throw new StError(`${x.name} is not an array`);
        return { t: 'BYTE', v: (slot.value as number[])[this.index(slot.type, this.eval(x.index), x.name)]! };
      }
      case 'un': {
        const v = this.eval(x.x);
        if (x.op === '-') {
          if (!INTS.has(v.t) && v.t !== 'LIT') throw new StError(`unary minus on ${v.t}`);
          return { t: v.t, v: v.t === 'LIT' ? -(v.v as number) : fit(v.t, -(v.v as number), 'negation') };
        }
        if (v.t === 'BOOL') return { t: 'BOOL', v: !v.v };
        if (!BITS.has(v.t)) throw new StError(`NOT on ${v.t}`);
        return { t: v.t, v: ~(v.v as number) & RANGE[v.t]![1] };
      }
      case 'bin':
        return this.binary(x.op, this.eval(x.a), this.eval(x.b));
      case 'call':
        return this.call(x.name, x.args.map((a) => ({ ...(a.name ? { name: a.name } : {}), v: this.eval(a.x) })));
    }
  }

  private binary(op: string, a: Val, b: Val): Val {
    const t = unify(a, b, op);
    if (op === '=' || op === '<>') {
      const eq = a.v === b.v;
      return { t: 'BOOL', v: op === '=' ? eq : !eq };
    }
    if (['<', '>', '<=', '>='].includes(op)) {
      if (!INTS.has(t) && !BITS.has(t) && t !== 'LIT') throw new StError(`${op} on ${t}`);
      const p = a.v as number;
      const q = b.v as number;
      return { t: 'BOOL', v: op === '<' ? p < q : op === '>' ? p > q : op === '<=' ? p <= q : p >= q };
    }
    if (op === 'AND' || op === 'OR' || op === 'XOR') {
      if (t === 'BOOL') return { t, v: op === 'AND' ? (a.v && b.v) as boolean : op === 'OR' ? (a.v || b.v) as boolean : a.v !== b.v };
      if (!BITS.has(t)) throw new StError(`${op} on ${t} (bit operations take BYTE, WORD or DWORD)`);
      const p = fit(t, a.v as number, op);
      const q = fit(t, b.v as number, op);
      const r = op === 'AND' ? p & q : op === 'OR' ? p | q : p ^ q;
      return { t, v: r >>> 0 };
    }
    if (!INTS.has(t) && t !== 'LIT') throw new StError(`${op} on ${t} (arithmetic takes INT or DINT)`);
    const p = a.v as number;
    const q = b.v as number;
    let r: number;
    if (op === '+') r = p + q;
    else if (op === '-') r = p - q;
    else if (op === '*') r = p * q;
    else {
      if (p < 0 || q <= 0) throw new StError(`${p} ${op} ${q}: the subset divides non-negative numbers by positive ones only`);
      r = op === '/' ? Math.floor(p / q) : p % q;
    }
    return { t, v: t === 'LIT' ? r : fit(t, r, `${p} ${op} ${q}`) };
  }

  private call(name: string, args: { name?: string; v: Val }[]): Val {
    const arg = (k: number, formal: string): Val => {
      const named = args.find((a) => a.name === formal);
      const a = named ?? (args.every((x) => !x.name) ? args[k] : undefined);
      if (!a) throw new StError(`${name} needs ${formal}`);
      return a.v;
    };
    const str = (v: Val) => {
      if (v.t !== 'STRING') throw new StError(`${name} takes STRING, not ${v.t}`);
      return v.v as string;
    };
    const int = (v: Val) => {
      if (!INTS.has(v.t) && v.t !== 'LIT') throw new StError(`${name} takes an integer, not ${v.t}`);
      return v.v as number;
    };
    switch (name) {
      case 'CONCAT':
        if (args.length !== 2) throw new StError('CONCAT takes two inputs here');
        return { t: 'STRING', v: str(arg(0, 'IN1')) + str(arg(1, 'IN2')) };
      case 'LEN':
        return { t: 'INT', v: str(arg(0, 'IN')).length };
      case 'MID': {
        const s = str(arg(0, 'IN'));
        const l = int(arg(1, 'L'));
        const p = int(arg(2, 'P'));
        if (l < 0 || p < 1 || p + l - 1 > s.length) throw new StError(`MID(L := ${l}, P := ${p}) outside a string of ${s.length}`);
        return { t: 'STRING', v: s.slice(p - 1, p - 1 + l) };
      }
      case 'FIND': {
        const hay = str(arg(0, 'IN1'));
        const needle = str(arg(1, 'IN2'));
        if (!needle.length) throw new StError('FIND of an empty string');
        return { t: 'INT', v: hay.indexOf(needle) + 1 };
      }
      case 'SHL':
      case 'SHR': {
        const v = arg(0, 'IN');
        const n = int(arg(1, 'N'));
        if (!BITS.has(v.t)) throw new StError(`${name} on ${v.t}`);
        const width = BIT_WIDTH[v.t]!;
        if (n < 0 || n > width) throw new StError(`${name} by ${n}`);
        const x = BigInt(v.v as number);
        const r = name === 'SHL' ? (x << BigInt(n)) & ((1n << BigInt(width)) - 1n) : x >> BigInt(n);
        return { t: v.t, v: Number(r) };
      }
    }
    const conv = /^(INT|DINT|BYTE|WORD|DWORD)_TO_(INT|DINT|BYTE|WORD|DWORD)$/.exec(name);
    if (conv) {
      if (args.length !== 1) throw new StError(`${name} takes one input`);
      const v = args[0]!.v;
      if (v.t !== conv[1] && v.t !== 'LIT') throw new StError(`${name} given ${v.t}`);
      return { t: conv[2] as Ty, v: fit(conv[2] as Ty, v.v as number, name) };
    }
    throw new StError(`function ${name} is not in the subset`);
  }
}

/** Parses and runs a POU once with the given inputs. */
export function runSt(src: string, inputs: Record<string, number | string | boolean>): RunResult {
  return new Machine(parsePou(src)).run(inputs);
}
