/**
 * IEC 61131-3 identifiers for generated Structured Text: letters, digits and single underscores, no leading
 * digit, no trailing underscore, not a keyword (compared without letter case, as identifiers are).
 */

/**
 * Words an identifier must not be: the keywords of IEC 61131-3 (2nd and 3rd editions, Annex B/C), the
 * elementary data type names, the standard function and function block names this or any program commonly
 * calls, and the instruction list operators (several controllers reserve them in Structured Text too).
 */
export const IEC_RESERVED_WORDS: readonly string[] = [
  // keywords
  'ACTION', 'END_ACTION', 'ARRAY', 'OF', 'AT', 'CASE', 'ELSE', 'END_CASE', 'CONFIGURATION', 'END_CONFIGURATION', 'CONSTANT',
  'EN', 'ENO', 'EXIT', 'FALSE', 'F_EDGE', 'FOR', 'TO', 'BY', 'DO', 'END_FOR', 'FUNCTION', 'END_FUNCTION', 'FUNCTION_BLOCK',
  'END_FUNCTION_BLOCK', 'IF', 'THEN', 'ELSIF', 'END_IF', 'INITIAL_STEP', 'END_STEP', 'NOT', 'MOD', 'AND', 'OR', 'XOR', 'PROGRAM',
  'WITH', 'END_PROGRAM', 'R_EDGE', 'READ_ONLY', 'READ_WRITE', 'REPEAT', 'UNTIL', 'END_REPEAT', 'RESOURCE', 'ON', 'END_RESOURCE',
  'RETAIN', 'NON_RETAIN', 'RETURN', 'STEP', 'STRUCT', 'END_STRUCT', 'TASK', 'TRANSITION', 'FROM', 'END_TRANSITION', 'TRUE',
  'TYPE', 'END_TYPE', 'VAR', 'END_VAR', 'VAR_INPUT', 'VAR_OUTPUT', 'VAR_IN_OUT', 'VAR_TEMP', 'VAR_EXTERNAL', 'VAR_ACCESS',
  'VAR_CONFIG', 'VAR_GLOBAL', 'WHILE', 'END_WHILE', 'CONTINUE', 'CLASS', 'END_CLASS', 'INTERFACE', 'END_INTERFACE', 'METHOD',
  'END_METHOD', 'NAMESPACE', 'END_NAMESPACE', 'USING', 'EXTENDS', 'IMPLEMENTS', 'FINAL', 'ABSTRACT', 'OVERRIDE', 'PUBLIC',
  'PRIVATE', 'PROTECTED', 'INTERNAL', 'THIS', 'SUPER', 'REF', 'REF_TO', 'NULL', 'OVERLAP', 'PRIORITY', 'SINGLE', 'INTERVAL',
  // elementary data types and generic types
  'BOOL', 'SINT', 'INT', 'DINT', 'LINT', 'USINT', 'UINT', 'UDINT', 'ULINT', 'REAL', 'LREAL', 'TIME', 'LTIME', 'DATE', 'LDATE',
  'TIME_OF_DAY', 'TOD', 'LTOD', 'LTIME_OF_DAY', 'DATE_AND_TIME', 'DT', 'LDT', 'LDATE_AND_TIME', 'STRING', 'WSTRING', 'CHAR', 'WCHAR',
  'BYTE', 'WORD', 'DWORD', 'LWORD', 'ANY', 'ANY_DERIVED', 'ANY_ELEMENTARY', 'ANY_MAGNITUDE', 'ANY_NUM', 'ANY_REAL', 'ANY_INT',
  'ANY_UNSIGNED', 'ANY_SIGNED', 'ANY_BIT', 'ANY_STRING', 'ANY_CHARS', 'ANY_CHAR', 'ANY_DATE', 'ANY_DURATION',
  // standard functions and function blocks
  'ABS', 'SQRT', 'LN', 'LOG', 'EXP', 'SIN', 'COS', 'TAN', 'ASIN', 'ACOS', 'ATAN', 'ATAN2', 'ADD', 'SUB', 'MUL', 'DIV', 'EXPT',
  'MOVE', 'SHL', 'SHR', 'ROL', 'ROR', 'SEL', 'MAX', 'MIN', 'LIMIT', 'MUX', 'GT', 'GE', 'EQ', 'LE', 'LT', 'NE', 'LEN', 'LEFT',
  'RIGHT', 'MID', 'CONCAT', 'INSERT', 'DELETE', 'REPLACE', 'FIND', 'TRUNC', 'ROUND', 'SR', 'RS', 'TP', 'TON', 'TOF', 'CTU', 'CTD',
  'CTUD', 'R_TRIG', 'F_TRIG', 'SEMA',
  // instruction list operators
  'LD', 'LDN', 'ST', 'STN', 'S', 'R', 'ANDN', 'ORN', 'XORN', 'JMP', 'JMPC', 'JMPCN', 'CAL', 'CALC', 'CALCN', 'RET', 'RETC', 'RETCN',
];

const RESERVED = new Set(IEC_RESERVED_WORDS);
/** Conversion functions (`DINT_TO_BYTE`, `TO_INT`, `TRUNC_DINT`, …) are reserved as a family. */
const CONVERSION = /^([A-Z]+_)?TO_[A-Z_]+$|^TRUNC_[A-Z]+$|^BCD_TO_|_TO_BCD$/;

/** True when `word` is reserved in IEC 61131-3 (compared without letter case). */
export function isReservedWord(word: string): boolean {
  const upper = word.toUpperCase();
  return RESERVED.has(upper) || CONVERSION.test(upper);
}

/** The shape of an identifier: letters, digits, single underscores between them; no leading digit. */
const SHAPE = /^(?:[A-Za-z]|_[A-Za-z0-9])(?:_?[A-Za-z0-9])*$/;
/** Longest identifier generated (IEC 61131-3 leaves the significant length to the implementation). */
export const MAX_IDENTIFIER = 60;

/** Why `text` is not a usable identifier, or null. */
export function identifierProblem(text: string): string | null {
  if (!SHAPE.test(text)) return `"${text}" is not an IEC 61131-3 identifier: use letters, digits and single underscores, start with a letter and do not end with an underscore`;
  if (text.startsWith('_')) return `"${text}" starts with an underscore; start it with a letter`;
  if (text.length > MAX_IDENTIFIER) return `"${text}" is longer than ${MAX_IDENTIFIER} characters`;
  if (isReservedWord(text)) return `"${text}" is a reserved word of IEC 61131-3`;
  return null;
}

/**
 * An identifier from a free name: a sign before a digit becomes `Plus`/`Minus` (`Jog −1°` → `Jog_Minus_1`),
 * every other run of characters outside ASCII letters and digits one underscore; `lead` goes in front of
 * a name that starts with a digit or is empty. Reserved words get `_1` appended. Not yet unique.
 */
export function toIdentifier(name: string, lead: string): string {
  const words = name
    .replace(/[+](?=\d)/g, ' Plus ')
    .replace(/[-\u2212](?=\d)/g, ' Minus ')
    .split(/[^A-Za-z0-9]+/)
    .filter(Boolean);
  let id = words.join('_');
  if (!id || /^\d/.test(id)) id = id ? `${lead}_${id}` : lead;
  if (id.length > MAX_IDENTIFIER) id = id.slice(0, MAX_IDENTIFIER).replace(/_+$/, '');
  return isReservedWord(id) ? `${id}_1` : id;
}

/** Hands out identifiers unique without letter case, appending `_2`, `_3`… to a repeat. */
export class IdentifierPool {
  private readonly used = new Set<string>();
  constructor(reserved: Iterable<string> = []) {
    for (const r of reserved) this.used.add(r.toUpperCase());
  }
  take(base: string): string {
    let id = base;
    for (let n = 2; this.used.has(id.toUpperCase()) || isReservedWord(id); n++) id = `${base}_${n}`;
    this.used.add(id.toUpperCase());
    return id;
  }
}
