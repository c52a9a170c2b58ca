import { expect, test } from 'vitest';
import { packRegisterWords, parseRegisterWords, unpackRegisterWords } from '~/lib/frame';

const enc = (s: string) => new TextEncoder().encode(s);

// common practice: PLC serial send instructions that take a word array pack two characters per register;
// which character goes in the high byte differs between controllers, hence both orders.
test('high byte first, odd length padded with 0x00', () => {
  const w = packRegisterWords(enc('ABC'), 'high-first');
  expect(w).toMatchObject({ words: [0x4142, 0x4300], wordCount: 2, padded: true, hex: '4142 4300', decimal: '16706 17152' });
});

test('low byte first', () => {
  const w = packRegisterWords(enc('ABC'), 'low-first');
  expect(w).toMatchObject({ words: [0x4241, 0x0043], wordCount: 2, padded: true, hex: '4241 0043', decimal: '16961 67' });
});

test('0x00, 0x7F, 0x80, 0xFF, signed view, even length not padded', () => {
  const w = packRegisterWords(Uint8Array.from([0x00, 0x7f, 0x80, 0xff]), 'high-first');
  expect(w).toMatchObject({ words: [0x007f, 0x80ff], padded: false, hex: '007F 80FF', decimal: '127 33023', signedDecimal: '127 -32513' });
});

test('empty', () => {
  expect(packRegisterWords(new Uint8Array(0))).toMatchObject({ words: [], wordCount: 0, padded: false, hex: '', decimal: '' });
  expect(unpackRegisterWords([], 'high-first')).toEqual({ ok: true, value: new Uint8Array(0) });
});

test('unpack drops the padding when given the byte count', () => {
  expect(unpackRegisterWords([0x4142, 0x4300], 'high-first', 3)).toEqual({ ok: true, value: Uint8Array.from([0x41, 0x42, 0x43]) });
  expect(unpackRegisterWords([0x4241, 0x0043], 'low-first')).toEqual({ ok: true, value: Uint8Array.from([0x41, 0x42, 0x43, 0x00]) });
});

test('word text errors carry positions', () => {
  expect(parseRegisterWords('4142 12345', 'hex')).toMatchObject({ ok: false, error: { position: 5 } });
  expect(parseRegisterWords('1 65536', 'decimal')).toMatchObject({ ok: false, error: { position: 2 } });
  expect(parseRegisterWords('0x4142, 16#4300', 'hex')).toEqual({ ok: true, value: [0x4142, 0x4300] });
});
