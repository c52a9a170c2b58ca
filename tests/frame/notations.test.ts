import { describe, expect, test } from 'vitest';
import {
  parseDecimal, parseEscaped, parseHex, parseIec, parseMnemonic, parseNotation, renderAllNotations, renderDecimal,
  renderEscaped, renderHex, renderIec, renderIecLiteral, renderMnemonic, toHex,
} from '~/lib/frame';

const b = (...x: number[]) => Uint8Array.from(x);
const hex = (r: { ok: boolean; value?: Uint8Array }) => (r.ok ? toHex(r.value!) : 'ERROR');
const EDGE = b(0x00, 0x7f, 0x80, 0xff);

describe('escaped notation', () => {
  test('named C escapes', () => {
    // ISO/IEC 9899:2018, 6.4.4.4 Character constants (simple escape sequences \r \n \t \\ and octal \0)
    expect(hex(parseEscaped('A\\r\\n\\t\\\\\\0'))).toBe('41 0D 0A 09 5C 00');
    expect(renderEscaped(b(0x41, 0x0d, 0x0a, 0x09, 0x5c, 0x00))).toBe('A\\r\\n\\t\\\\\\0');
  });
  test('0x00, 0x7F, 0x80, 0xFF and empty', () => {
    // ISO/IEC 9899:2018, 6.4.4.4 (hexadecimal escape sequence); uppercase rendering is this notation's rule
    expect(renderEscaped(EDGE)).toBe('\\0\\x7F\\x80\\xFF');
    expect(hex(parseEscaped('\\0\\x7f\\x80\\xFF'))).toBe('00 7F 80 FF');
    expect(renderEscaped(b())).toBe('');
    expect(hex(parseEscaped(''))).toBe('');
  });
  test('NUL followed by an octal digit renders as \\000 and reads back', () => {
    // ISO/IEC 9899:2018, 6.4.4.4: an octal escape takes at most three octal digits, so \0001 is NUL then "1"
    expect(renderEscaped(b(0x00, 0x31))).toBe('\\0001');
    expect(hex(parseEscaped('\\0001'))).toBe('00 31');
    // 6.4.4.4: \01 is one octal escape (value 1), as a C compiler reads it
    expect(hex(parseEscaped('\\01'))).toBe('01');
    // 8 is not an octal digit, so \08 is NUL then "8"; rendering keeps the short form
    expect(renderEscaped(b(0x00, 0x38))).toBe('\\08');
    expect(hex(parseEscaped('\\08'))).toBe('00 38');
  });
  test('renders so that a C compiler reads the same bytes: octal before a hex digit, \\" and no trigraphs', () => {
    // ISO/IEC 9899:2018, 6.4.4.4: a hex escape takes every hex digit after \x, so \x01A would be one byte 0x1A;
    // an octal escape stops after three digits, so \001A is 01 then "A"
    expect(renderEscaped(b(0x01, 0x41))).toBe('\\001A');
    expect(renderEscaped(b(0x1b, 0x46))).toBe('\\033F');
    expect(renderEscaped(b(0xff, 0x30, 0x7f, 0x66))).toBe('\\3770\\177f');
    expect(renderEscaped(b(0x01, 0x47, 0x80))).toBe('\\x01G\\x80');
    // 6.4.5: a bare " ends the string literal; 5.2.1.1: ??= ??/ etc. are trigraphs in strict ISO modes
    expect(renderEscaped(b(0x22))).toBe('\\"');
    expect(renderEscaped(b(0x3f, 0x3f, 0x3d))).toBe('?\\?=');
    expect(renderEscaped(b(0x3f, 0x3f, 0x3f, 0x2f))).toBe('?\\?\\?/');
    for (const text of ['\\001A', '\\033F', '\\"', '?\\?=', '\\3770\\177f']) {
      const r = parseEscaped(text);
      expect(r.ok && renderEscaped(r.value)).toBe(text);
    }
  });
  test('\\e is ESC (0x1B) on input', () => {
    // common practice: \e for ESC is a widespread C compiler extension (not in ISO/IEC 9899)
    expect(hex(parseEscaped('\\e[2J'))).toBe('1B 5B 32 4A');
    expect(renderEscaped(b(0x1b, 0x5b))).toBe('\\x1B[');
  });
  test('other simple escapes are accepted on input', () => {
    // ISO/IEC 9899:2018, 6.4.4.4: \a \b \f \v \' \" \?
    expect(hex(parseEscaped('\\a\\b\\f\\v\\\'\\"\\?'))).toBe('07 08 0C 0B 27 22 3F');
  });
  test('errors give the escape position and a message', () => {
    // error shape from the issue: "\x needs two hex digits", 0-based offset of the backslash
    expect(parseEscaped('ABC\\x4G')).toEqual({ ok: false, error: { position: 3, message: '\\x needs two hex digits' } });
    expect(parseEscaped('AB\\x')).toMatchObject({ ok: false, error: { position: 2 } });
    expect(parseEscaped('A\\q')).toMatchObject({ ok: false, error: { position: 1 } });
    expect(parseEscaped('\\')).toMatchObject({ ok: false, error: { position: 0 } });
    // ISO/IEC 9899:2018, 6.4.4.4 constraint: the value must fit the character type; \400 = 256 does not fit a byte
    expect(parseEscaped('x\\400')).toMatchObject({ ok: false, error: { position: 1 } });
    expect(parseEscaped('ok\u00e9')).toMatchObject({ ok: false, error: { position: 2 } });
    expect(parseEscaped('a\nb')).toMatchObject({ ok: false, error: { position: 1 } });
  });
});

describe('IEC 61131-3 PLC string notation', () => {
  test('dollar escapes, any case', () => {
    // IEC 61131-3 ed. 3 (2013), Annex B, single_byte_character_string productions (clause 6.3.3 number recalled from memory): $$ $' $L $N $P $R $T and $hh
    expect(hex(parseIec("$$$'$L$N$P$R$T"))).toBe("24 27 0A 0A 0C 0D 09");
    expect(hex(parseIec("$l$n$p$r$t$0d$0A"))).toBe('0A 0A 0C 0D 09 0D 0A');
  });
  test('CR renders as $0D; $ and quote keep their two-character escapes', () => {
    // common practice: ASCII commands delimited by carriage return, written $0D in a PLC string
    expect(renderIec(b(0x4d, 0x31, 0x0d))).toBe('M1$0D');
    expect(renderIecLiteral(b(0x4d, 0x31, 0x0d))).toBe("'M1$0D'");
    // IEC 61131-3 ed. 3, Annex B single_byte_character_string (clause 6.3.3, recalled from memory): $$ and $' inside a single-byte string
    expect(renderIec(b(0x24, 0x27))).toBe("$$$'");
  });
  test('0x00, 0x7F, 0x80, 0xFF and empty', () => {
    // IEC 61131-3 ed. 3, Annex B single_byte_character_string (clause 6.3.3, recalled from memory): $ followed by two hex digits
    expect(renderIec(EDGE)).toBe('$00$7F$80$FF');
    expect(hex(parseIec('$00$7f$80$ff'))).toBe('00 7F 80 FF');
    expect(renderIec(b())).toBe('');
    expect(renderIecLiteral(b())).toBe("''");
    expect(hex(parseIec(''))).toBe('');
    expect(hex(parseIec("''"))).toBe('');
  });
  test('quoted literal is accepted; positions count the quote', () => {
    expect(hex(parseIec("'A$0D'"))).toBe('41 0D');
    expect(parseIec("'A$0G'")).toMatchObject({ ok: false, error: { position: 2, message: '$ needs two hex digits (for example $0D)' } });
  });
  test('errors', () => {
    // IEC 61131-3 ed. 3, Annex B single_byte_character_string (clause 6.3.3, recalled from memory): a single quote inside a single-byte string must be written $'
    expect(parseIec("it's")).toMatchObject({ ok: false, error: { position: 2 } });
    expect(parseIec('A$')).toMatchObject({ ok: false, error: { position: 1 } });
    expect(parseIec('A$Q')).toMatchObject({ ok: false, error: { position: 1 } });
  });
});

describe('mnemonic notation', () => {
  test('RFC 20 names', () => {
    // RFC 20 (ASCII format for network interchange), section 4.1: STX 0x02, ETX 0x03, CR 0x0D, LF 0x0A, DEL 0x7F
    expect(renderMnemonic(b(0x02, 0x41, 0x03, 0x0d, 0x0a))).toBe('<STX>A<ETX><CR><LF>');
    expect(hex(parseMnemonic('<stx>A<Etx><CR><LF>'))).toBe('02 41 03 0D 0A');
    // RFC 20 section 4.1: US is 0x1F, ESC 0x1B, SP 0x20
    expect(hex(parseMnemonic('<US><ESC><SP>'))).toBe('1F 1B 20');
  });
  test('0x00, 0x7F, 0x80, 0xFF and empty', () => {
    // RFC 20 section 4.1: NUL 0x00, DEL 0x7F; bytes above 0x7F are outside ASCII and use <xHH>
    expect(renderMnemonic(EDGE)).toBe('<NUL><DEL><x80><xFF>');
    expect(hex(parseMnemonic('<NUL><DEL><x80><xff>'))).toBe('00 7F 80 FF');
    expect(renderMnemonic(b())).toBe('');
    expect(hex(parseMnemonic(''))).toBe('');
  });
  test('names are ASCII only: no Unicode case folding', () => {
    // 'ſ' (U+017F) upper-cases to S, 'ﬅ' (U+FB05) to ST, 'ﬀ' (U+FB00) to FF, 'ı' (U+0131) to I
    for (const text of ['<ſTX>', '<ﬅX>', '<ﬀ>', '<ſP>', '<\u0131>', '<\u212Aa>']) {
      expect(parseMnemonic('A' + text)).toMatchObject({ ok: false, error: { position: 1 } });
    }
    expect(hex(parseMnemonic('<sTx><Sp>'))).toBe('02 20');
  });
  test('XON and XOFF are accepted as DC1 and DC3', () => {
    // common practice: software flow control sends XON as DC1 (0x11) and XOFF as DC3 (0x13); RFC 20 section 4.1 names DC1, DC3
    expect(hex(parseMnemonic('<XON><xoff><DC1><DC3>'))).toBe('11 13 11 13');
    expect(renderMnemonic(b(0x11, 0x13))).toBe('<DC1><DC3>');
  });
  test('a literal < round-trips as <x3C>', () => {
    expect(renderMnemonic(b(0x3c, 0x3e))).toBe('<x3C>>');
    expect(hex(parseMnemonic('<x3C>>'))).toBe('3C 3E');
  });
  test('errors', () => {
    expect(parseMnemonic('AB<CR')).toMatchObject({ ok: false, error: { position: 2 } });
    expect(parseMnemonic('A<FOO>')).toMatchObject({ ok: false, error: { position: 1 } });
    expect(parseMnemonic('A<x4G>')).toMatchObject({ ok: false, error: { position: 1 } });
  });
});

describe('hex and decimal notations', () => {
  test('hex separators and prefixes', () => {
    expect(hex(parseHex('0D 0A'))).toBe('0D 0A');
    expect(hex(parseHex('0x0D,0x0A'))).toBe('0D 0A');
    expect(hex(parseHex('0d0a'))).toBe('0D 0A');
    expect(hex(parseHex(' 0D:0a-0x7f;\t80\nff ,'))).toBe('0D 0A 7F 80 FF');
    expect(hex(parseHex('D A'))).toBe('0D 0A');
    expect(renderHex(EDGE)).toBe('00 7F 80 FF');
    expect(renderHex(b())).toBe('');
    expect(hex(parseHex(''))).toBe('');
  });
  test('hex takes the PLC forms 16#0D and 2#00001101 and the suffix form 0Dh', () => {
    // IEC 61131-3 ed. 3, Annex B integer literals (recalled from memory): base 16#, 8#, 2# with optional _ between digits
    expect(hex(parseHex('16#0D 16#0a'))).toBe('0D 0A');
    expect(hex(parseHex('16#0D0A,16#FF_FE'))).toBe('0D 0A FF FE');
    expect(hex(parseHex('2#00001101 2#1010 2#0000_1101_0000_1010'))).toBe('0D 0A 0D 0A');
    // common practice: assembler-style hex with an h suffix (0Dh)
    expect(hex(parseHex('0Dh 0ah 7FH 80h FFh'))).toBe('0D 0A 7F 80 FF');
    expect(hex(parseHex('0D0Ah Dh'))).toBe('0D 0A 0D');
    expect(hex(parseHex('02 16#41 42h 2#01000011 0x44'))).toBe('02 41 42 43 44');
  });
  test('errors in the PLC and suffix forms', () => {
    expect(parseHex('0D 16#')).toMatchObject({ ok: false, error: { position: 3 } });
    expect(parseHex('16#0G')).toMatchObject({ ok: false, error: { position: 4 } });
    expect(parseHex('16#ABC')).toMatchObject({ ok: false, error: { position: 0 } });
    expect(parseHex('2#102')).toMatchObject({ ok: false, error: { position: 4 } });
    expect(parseHex('2#101010101')).toMatchObject({ ok: false, error: { position: 0 } });
    expect(parseHex('16#_0D')).toMatchObject({ ok: false, error: { position: 3 } });
    expect(parseHex('0Dhh')).toMatchObject({ ok: false, error: { position: 3 } });
    expect(parseHex('h')).toMatchObject({ ok: false, error: { position: 0 } });
    expect(parseHex('8#15')).toMatchObject({ ok: false, error: { position: 0 } });
  });
  test('hex errors', () => {
    expect(parseHex('0D 0G')).toMatchObject({ ok: false, error: { position: 4 } });
    expect(parseHex('0D ABC')).toMatchObject({ ok: false, error: { position: 3 } });
    expect(parseHex('0x')).toMatchObject({ ok: false, error: { position: 0 } });
  });
  test('decimal', () => {
    expect(hex(parseDecimal('13 10'))).toBe('0D 0A');
    expect(hex(parseDecimal('0,127;128 255'))).toBe('00 7F 80 FF');
    expect(renderDecimal(EDGE)).toBe('0 127 128 255');
    expect(renderDecimal(b())).toBe('');
    expect(hex(parseDecimal(''))).toBe('');
    expect(parseDecimal('13 256')).toMatchObject({ ok: false, error: { position: 3 } });
    expect(parseDecimal('13 -1')).toMatchObject({ ok: false, error: { position: 3 } });
  });
  test('decimal also takes bytes written in another base, marked: 16#0D, 0x0D, 0Dh, 8#15, 2#1101, 0b1101', () => {
    // IEC 61131-3 ed. 3, Annex B integer literals (recalled from memory): 16#, 8#, 2#; common practice: 0x, 0b and the h suffix
    expect(hex(parseDecimal('16#0D 0x0A 0Dh 8#15 2#1101 0b1101 2#0000_1101 255'))).toBe('0D 0A 0D 0D 0D 0D 0D FF');
    expect(hex(parseDecimal('16#FF 0x80 7Fh 0b0 2#11111111'))).toBe('FF 80 7F 00 FF');
    expect(parseDecimal('16#100')).toMatchObject({ ok: false, error: { position: 0 } });
    expect(parseDecimal('1 0b2')).toMatchObject({ ok: false, error: { position: 4 } });
    expect(parseDecimal('8#9')).toMatchObject({ ok: false, error: { position: 2 } });
    expect(parseDecimal('1 0x')).toMatchObject({ ok: false, error: { position: 2 } });
  });
});

test('renderAllNotations and parseNotation agree', () => {
  const bytes = b(0x02, 0x4d, 0x24, 0x27, 0x3c, 0x5c, 0x0d);
  const all = renderAllNotations(bytes);
  expect(all).toEqual({
    escaped: "\\x02M$'<\\\\\\r",
    iec: "$02M$$$'<\\$0D",
    iecLiteral: "'$02M$$$'<\\$0D'",
    mnemonic: "<STX>M$'<x3C>\\<CR>",
    hex: '02 4D 24 27 3C 5C 0D',
    decimal: '2 77 36 39 60 92 13',
  });
  for (const n of ['escaped', 'iec', 'mnemonic', 'hex', 'decimal'] as const) expect(hex(parseNotation(n, all[n]))).toBe('02 4D 24 27 3C 5C 0D');
});
