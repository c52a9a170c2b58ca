/** Every notation the preview lists for one frame, each ready to copy. */
import { renderAllNotations } from '../frame/notations';
import { packRegisterWords, type WordByteOrder } from '../frame/notations/register-words';

export interface NotationRow {
  id: 'escaped' | 'iec' | 'iecLiteral' | 'mnemonic' | 'hex' | 'decimal' | 'wordsHex' | 'wordsDecimal';
  label: string;
  /** One line on what the notation is for. */
  hint: string;
  text: string;
}

export function notationRows(bytes: Uint8Array, wordOrder: WordByteOrder = 'high-first'): NotationRow[] {
  const n = renderAllNotations(bytes);
  const words = packRegisterWords(bytes, wordOrder);
  const order = wordOrder === 'high-first' ? 'first byte in the high half' : 'first byte in the low half';
  const wordNote = `${words.wordCount} word${words.wordCount === 1 ? '' : 's'}, ${order}${words.padded ? ', last word padded with 00' : ''}`;
  return [
    { id: 'iecLiteral', label: 'PLC string literal', hint: 'IEC 61131-3, quoted, ready to paste into structured text', text: n.iecLiteral },
    { id: 'iec', label: 'PLC string, bare', hint: 'IEC 61131-3 escapes without the quotes', text: n.iec },
    { id: 'escaped', label: 'Escaped', hint: 'C-style backslash escapes', text: n.escaped },
    { id: 'mnemonic', label: 'Control names', hint: 'RFC 20 names for control characters', text: n.mnemonic },
    { id: 'hex', label: 'Hex', hint: 'one pair per byte', text: n.hex },
    { id: 'decimal', label: 'Decimal', hint: 'one number per byte', text: n.decimal },
    { id: 'wordsHex', label: 'Register words (hex)', hint: wordNote, text: words.hex },
    { id: 'wordsDecimal', label: 'Register words (decimal)', hint: wordNote, text: words.decimal },
  ];
}
