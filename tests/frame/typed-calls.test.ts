/**
 * Library calls made from code (not through a schema) with out-of-range arguments return an error like
 * every parser does; none throws or hangs.
 */
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { type Template, assembleFrame, bitSequence, checkFrame, decodeReply, moveSegment, previewFrame, unpackRegisterWords } from '~/lib/frame';
import { tpl } from './helpers';

const line = { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 } as const;
const failed = { ok: false, error: { position: 0 } };

describe('unpackRegisterWords', () => {
  test('a negative, fractional or too large byte count is an error', () => {
    for (const n of [-1, 1.5, Number.NaN, 5, Infinity]) expect(unpackRegisterWords([0x4142, 0x4300], 'high-first', n)).toMatchObject(failed);
    expect(unpackRegisterWords([0x4142, 0x4300], 'high-first', 3)).toEqual({ ok: true, value: Uint8Array.from([0x41, 0x42, 0x43]) });
  });
  test('a word outside -32768..65535 or not whole is an error', () => {
    for (const w of [65536, -32769, 1.5, Number.NaN]) expect(unpackRegisterWords([w], 'low-first')).toMatchObject(failed);
    expect(unpackRegisterWords([-1], 'low-first')).toEqual({ ok: true, value: Uint8Array.from([0xff, 0xff]) });
  });
});

describe('moveSegment', () => {
  const t = tpl([{ type: 'literal', id: 'a', bytes: '01' }, { type: 'literal', id: 'b', bytes: '02' }]);
  test('positions outside the template are an error', () => {
    for (const [from, to] of [[-1, 0], [0, 2], [2, 0], [0.5, 1], [Number.NaN, 0], [0, Infinity]]) expect(moveSegment(t, from!, to!)).toMatchObject(failed);
    const moved = moveSegment(t, 1, 0);
    expect(moved.ok && moved.value.segments.map((s) => s.id)).toEqual(['b', 'a']);
  });
});

describe('bitSequence', () => {
  test('data bits, stop bits, baud and byte limit outside their ranges are an error, at once', () => {
    for (const bad of [{ dataBits: Infinity }, { dataBits: 1e9 }, { dataBits: 4 }, { dataBits: 7.5 }, { stopBits: 3 }, { baud: 0 }, { baud: Number.NaN }, { parity: 'weird' }]) {
      const started = performance.now();
      expect(bitSequence(Uint8Array.of(0x41), { ...line, ...bad } as never)).toMatchObject(failed);
      expect(performance.now() - started).toBeLessThan(100);
    }
    expect(bitSequence(Uint8Array.of(0x41), line, -1)).toMatchObject(failed);
    expect(bitSequence(Uint8Array.of(0x41), line, Number.NaN)).toMatchObject(failed);
    expect(bitSequence(Uint8Array.of(0x41), line)).toMatchObject({ ok: true, value: { truncated: false } });
  });
});

// Templates as code might build them, bypassing the schema: any number where the schema wants a range.
const anyNumber = fc.oneof(fc.integer({ min: -5, max: 40 }), fc.constantFrom(Number.NaN, Infinity, -Infinity, 1e9, 0.5, -0));
const rawSegment = fc.oneof(
  fc.record({ type: fc.constant('integer'), width: anyNumber, scale: fc.record({ factor: anyNumber, divisor: anyNumber, offset: anyNumber }), min: anyNumber, max: anyNumber, default: anyNumber }),
  fc.record({ type: fc.constant('decimal'), decimals: anyNumber, width: anyNumber, default: anyNumber }),
  fc.record({ type: fc.constant('text'), maxLength: anyNumber, default: fc.string() }),
  fc.record({ type: fc.constant('choice'), options: fc.array(fc.record({ value: fc.string(), send: fc.string() }), { maxLength: 2 }) }),
  fc.record({ type: fc.constant('checksum'), algorithm: fc.constantFrom('XOR-8', 'CRC-16/MODBUS', 'NOPE'), range: fc.record({ from: anyNumber, to: anyNumber }), encoding: fc.constantFrom('binary', 'ascii-hex', 'ascii-decimal'), byteOrder: fc.constant('high-first'), case: fc.constant('upper') }),
  fc.record({ type: fc.constant('literal'), bytes: fc.constantFrom('', '0D', 'zz') }),
);

test('assembling, previewing, checking and decoding never throw on templates built in code', () => {
  fc.assert(
    fc.property(fc.array(rawSegment, { maxLength: 6 }), fc.uint8Array({ maxLength: 24 }), anyNumber, (segs, reply, value) => {
      const template = { version: 1, segments: segs.map((s, i) => ({ pad: 'zero', sign: 'negative', case: 'as-is', label: 'F', ...s, id: `s${i}`, name: `f${i}` })) } as unknown as Template;
      const values = Object.fromEntries(segs.map((_, i) => [`f${i}`, i % 2 ? value : String(value)]));
      expect(() => {
        const frame = assembleFrame(template, values);
        previewFrame(template, values, { dataBits: 7 } as never);
        checkFrame(frame.bytes, frame.segments, {}, { dataBits: value });
        decodeReply(template, reply);
      }).not.toThrow();
    }),
    { numRuns: 1500 },
  );
});
