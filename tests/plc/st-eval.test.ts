/**
 * The test evaluator itself: its IEC 61131-3 string literal reader (checked as the engine's notation tests
 * check the notation, and against the engine's rendering of every byte) and the strictness the PLC code
 * tests rely on (each of these must fail, or a generated-code test could pass on code a controller rejects).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { renderIec } from '~/lib/frame';
import { StError, readStringLiteral, runSt } from './st-eval';

const codes = (s: string) => Array.from(s, (c) => c.charCodeAt(0));

describe('string literals ($ escapes, IEC 61131-3 character string literals)', () => {
  it.each([
    ['$0D', [0x0d]], ['$0d', [0x0d]], ['$R', [0x0d]], ['$r', [0x0d]], ['$L', [0x0a]], ['$N', [0x0a]], ['$P', [0x0c]], ['$T', [0x09]],
    ['$$', [0x24]], ["$'", [0x27]], ['$00', [0x00]], ['$7F', [0x7f]], ['$80', [0x80]], ['$FF', [0xff]], ['', []], ['A$0D', [0x41, 0x0d]],
  ])('%j reads as %j', (text, bytes) => {
    expect(codes(readStringLiteral(text))).toEqual(bytes);
  });

  it.each(["'", '$', '$G', '$0', '$0G', 'é', '\t'])('%j is refused', (text) => {
    expect(() => readStringLiteral(text)).toThrow(StError);
  });

  it("reads back the engine's rendering of any bytes", () => {
    const all = Uint8Array.from({ length: 256 }, (_, b) => b);
    expect(codes(readStringLiteral(renderIec(all)))).toEqual([...all]);
    fc.assert(fc.property(fc.uint8Array({ maxLength: 64 }), (b) => {
      expect(codes(readStringLiteral(renderIec(b)))).toEqual([...b]);
    }));
  });
});

const fn = (decl: string, body: string) => `FUNCTION F : STRING(10)\nVAR_OUTPUT\n  Error : INT;\nEND_VAR\nVAR\n${decl}\nEND_VAR\n${body}\nEND_FUNCTION`;

describe('strictness', () => {
  it.each([
    ['DINT overflow', 'A : DINT;', 'A := 2147483647; A := A + 1;'],
    ['INT overflow in an expression', 'A : INT; B : BOOL;', 'A := 32767; B := A * 2 > 0;'],
    ['INT mixed with DINT', 'A : INT; B : DINT;', 'B := A + B;'],
    ['arithmetic on a BYTE', 'A : BYTE;', 'A := A + 1;'],
    ['bit operation on a DINT', 'A : DINT;', 'A := A AND 255;'],
    ['division of a negative number', 'A : DINT;', 'A := -7; A := A / 2;'],
    ['a conversion out of range', 'A : BYTE;', 'A := DINT_TO_BYTE(256);'],
    ['a STRING too long', 'S : STRING(2);', "S := 'abc';"],
    ['MID beyond the string', 'S : STRING(2);', "S := MID(IN := 'ab', L := 1, P := 3);"],
    ['an index out of bounds', 'A : ARRAY [1..2] OF BYTE;', 'A[3] := 0;'],
    ['assigning the FOR variable', 'I : INT;', 'FOR I := 1 TO 3 DO I := 5; END_FOR;'],
    ['an endless loop', 'A : DINT;', 'WHILE A = 0 DO A := 0; END_WHILE;'],
    ['an unknown function', 'A : DINT;', 'A := ABS(-1);'],
    ['a double underscore', 'A__B : DINT;', 'A__B := 1;'],
  ])('%s is an error', (_what, decl, body) => {
    expect(() => runSt(fn(decl, body), {})).toThrow(StError);
  });

  it('runs what the subset allows', () => {
    const src = fn('A : DINT; B : BYTE; W : DWORD; S : STRING(10); I : INT; N : INT;', [
      "A := 17 / 5 + 17 MOD 5; B := 16#F0; B := B XOR 16#FF; W := SHL(DINT_TO_DWORD(1), 31); S := CONCAT('a$$', MID(IN := 'xyz', L := 2, P := 2));",
      'N := 0; FOR I := 3 TO 1 BY -1 DO N := N * 10 + I; END_FOR;',
      "CASE N OF 1, 2: S := 'no'; 321: S := CONCAT(S, '!'); ELSE S := ''; END_CASE;",
      "IF A = 5 AND B = 16#0F AND W = 16#80000000 AND FIND(IN1 := S, IN2 := 'z') = 4 THEN F := S; ELSE F := 'bad'; END_IF;",
    ].join('\n'));
    expect(runSt(src, {}).result).toBe('a$yz!');
  });
});
