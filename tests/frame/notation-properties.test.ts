import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { NOTATIONS, packRegisterWords, parseNotation, parseRegisterWords, renderIecLiteral, renderNotation, parseIec, unpackRegisterWords } from '~/lib/frame';

const bytes = fc.uint8Array({ minLength: 0, maxLength: 300 });
// Byte arrays rich in the characters each notation treats specially: NUL and controls before digits, \ " ? $ ' < and 0x7F-0xFF.
const tricky = fc.array(fc.constantFrom(0x00, 0x01, 0x1b, 0x30, 0x37, 0x38, 0x41, 0x66, 0x22, 0x3f, 0x5c, 0x24, 0x27, 0x3c, 0x3e, 0x78, 0x0d, 0x7f, 0x80, 0xff), { maxLength: 60 }).map((a) => Uint8Array.from(a));

describe('render then parse returns the same bytes', () => {
  for (const n of NOTATIONS) {
    test(n, () => {
      fc.assert(
        fc.property(fc.oneof(bytes, tricky), (b) => {
          const r = parseNotation(n, renderNotation(n, b));
          expect(r.ok).toBe(true);
          if (r.ok) expect(Array.from(r.value)).toEqual(Array.from(b));
        }),
        { numRuns: 400 },
      );
    });
  }
  test('iec quoted literal', () => {
    fc.assert(fc.property(fc.oneof(bytes, tricky), (b) => {
      const r = parseIec(renderIecLiteral(b));
      expect(r.ok && Array.from(r.value)).toEqual(Array.from(b));
    }));
  });
  test('register words, both byte orders, hex and decimal', () => {
    fc.assert(fc.property(bytes, fc.constantFrom('high-first' as const, 'low-first' as const), (b, order) => {
      const packed = packRegisterWords(b, order);
      for (const text of [packed.hex, packed.decimal, packed.signedDecimal]) {
        const words = parseRegisterWords(text, text === packed.hex ? 'hex' : 'decimal');
        expect(words.ok).toBe(true);
        if (words.ok) expect(unpackRegisterWords(words.value, order, b.length)).toEqual({ ok: true, value: b });
      }
    }));
  });
});

describe('arbitrary text never makes a parser throw', () => {
  const text = fc.oneof(fc.string({ maxLength: 80 }), fc.string({ unit: 'binary', maxLength: 80 }), fc.stringMatching(/^[\\$<>'x0-9a-fA-F ,:;-]{0,40}$/));
  for (const n of NOTATIONS) {
    test(n, () => {
      fc.assert(
        fc.property(text, (t) => {
          const r = parseNotation(n, t);
          if (!r.ok) {
            expect(Number.isInteger(r.error.position)).toBe(true);
            expect(r.error.position).toBeGreaterThanOrEqual(0);
            expect(r.error.position).toBeLessThanOrEqual(t.length);
            expect(r.error.message.length).toBeGreaterThan(0);
          }
        }),
        { numRuns: 600 },
      );
    });
  }
  test('register words', () => {
    fc.assert(fc.property(text, (t) => {
      expect(() => parseRegisterWords(t, 'hex')).not.toThrow();
      expect(() => parseRegisterWords(t, 'decimal')).not.toThrow();
    }));
  });
});
