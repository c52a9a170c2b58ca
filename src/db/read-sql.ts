/**
 * Which SQL text only reads: the rule the write gate goes by (reads skip it). The statement cache once
 * used it too; it now keeps every statement prepared (src/db/statement-cache.ts).
 *
 * A read is a single `SELECT` (or `VALUES`), possibly behind `WITH [RECURSIVE]` common table
 * expressions, after any leading whitespace and comments. `WITH … INSERT/UPDATE/DELETE/REPLACE` is a
 * write, and so is anything else, including text the scanner cannot follow or a second statement
 * after a `;`: when in doubt, a statement queues behind the writes like before.
 */
export function isReadSql(sql: string): boolean {
  let known = verdicts.get(sql);
  if (known === undefined) {
    known = classify(sql);
    if (verdicts.size >= REMEMBERED) verdicts.clear();
    verdicts.set(sql, known);
  }
  return known;
}

// Most statements are the same few texts again and again; the scan is not repeated for those.
const REMEMBERED = 512;
const verdicts = new Map<string, boolean>();

const READ_VERBS = new Set(['select', 'values']);

function classify(sql: string): boolean {
  const tokens = topLevelTokens(sql);
  if (!tokens) return false;
  let i = 0;
  if (tokens[i] === 'with') {
    i++;
    if (tokens[i] === 'recursive') i++;
    // name [ (columns) ] AS [ NOT ] [ MATERIALIZED ] ( body ), …
    for (;;) {
      if (!tokens[i] || tokens[i] === '(' || tokens[i] === ',' || tokens[i] === ';') return false;
      i++;
      if (tokens[i] === '(') i++;
      if (tokens[i] !== 'as') return false;
      i++;
      if (tokens[i] === 'not') i++;
      if (tokens[i] === 'materialized') i++;
      if (tokens[i] !== '(') return false;
      i++;
      if (tokens[i] !== ',') break;
      i++;
    }
  }
  if (!READ_VERBS.has(tokens[i] ?? '')) return false;
  // Nothing but a final `;` may follow at the top level after another statement's end.
  const end = tokens.indexOf(';', i);
  return end === -1 || end === tokens.length - 1;
}

/**
 * The statement's tokens outside parentheses, lower-cased: words, `(` for a whole parenthesised group,
 * `,` and `;`. Strings, quoted names and comments are skipped. Null for text that does not scan
 * (an unclosed quote, comment or parenthesis).
 */
function topLevelTokens(sql: string): string[] | null {
  const out: string[] = [];
  let depth = 0;
  let i = 0;
  const n = sql.length;
  while (i < n) {
    const c = sql[i]!;
    if (c === '-' && sql[i + 1] === '-') {
      const nl = sql.indexOf('\n', i);
      i = nl === -1 ? n : nl + 1;
    } else if (c === '/' && sql[i + 1] === '*') {
      const close = sql.indexOf('*/', i + 2);
      if (close === -1) return null;
      i = close + 2;
    } else if (c === "'" || c === '"' || c === '`' || c === '[') {
      const closer = c === '[' ? ']' : c;
      let j = i + 1;
      for (;;) {
        j = sql.indexOf(closer, j);
        if (j === -1) return null;
        if (closer !== ']' && sql[j + 1] === closer) j += 2; // a doubled quote stands for itself
        else break;
      }
      if (depth === 0) out.push('name');
      i = j + 1;
    } else if (c === '(') {
      if (depth === 0) out.push('(');
      depth++;
      i++;
    } else if (c === ')') {
      if (depth === 0) return null;
      depth--;
      i++;
    } else if (/[A-Za-z_]/.test(c)) {
      let j = i + 1;
      while (j < n && /[A-Za-z0-9_$]/.test(sql[j]!)) j++;
      if (depth === 0) out.push(sql.slice(i, j).toLowerCase());
      i = j;
    } else {
      if (depth === 0 && (c === ',' || c === ';')) out.push(c);
      i++;
    }
  }
  return depth === 0 ? out : null;
}
