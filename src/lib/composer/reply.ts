/** Reading a pasted reply in whichever notation it was written, for the reply decoder. */
import { NOTATIONS, parseNotation, type Notation } from '../frame/notations';
import type { ParseError } from '../frame/result';

export type ReplyNotation = Notation | 'auto';

export const NOTATION_LABELS: Record<Notation, string> = {
  escaped: 'Escaped (\\r \\x02)',
  iec: "PLC string ($0D, '…')",
  mnemonic: 'Control names (<CR>)',
  hex: 'Hex (31 21 0D)',
  decimal: 'Decimal (49 33 13)',
};

/**
 * Best guess at the notation of pasted text: a quoted or `$hh` text is a PLC string, `<NAME>` is
 * control names, a backslash is escaped, pairs of hex digits (also `0x0D`, `16#0D`, `0Dh`) are hex, else
 * escaped (plain text).
 */
export function guessNotation(text: string): Notation {
  const t = text.trim();
  if (/^'.*'$/s.test(t) || /\$[0-9A-Fa-f]{2}|\$[RLNPT$']/.test(t)) return 'iec';
  if (/<(?:[A-Z]{2,4}|x[0-9A-Fa-f]{2})>/i.test(t)) return 'mnemonic';
  if (t.includes('\\')) return 'escaped';
  const pair = '(?:(?:0x|16#)[0-9A-Fa-f]{2}|[0-9A-Fa-f]{2}[hH]?)';
  if (new RegExp(`^${pair}(?:[\\s,;:-]+${pair})*$`).test(t) && (/[\s,;:-]/.test(t) || /^(0x|16#)/i.test(t))) return 'hex';
  return 'escaped';
}

export type ReplyBytes = { ok: true; bytes: Uint8Array; notation: Notation } | { ok: false; notation: Notation; error: ParseError };

export function readReply(text: string, notation: ReplyNotation = 'auto'): ReplyBytes {
  const used = notation === 'auto' ? guessNotation(text) : notation;
  const r = parseNotation(used, text);
  return r.ok ? { ok: true, bytes: r.value, notation: used } : { ok: false, notation: used, error: r.error };
}

export const REPLY_NOTATIONS: ReplyNotation[] = ['auto', ...NOTATIONS];
