/**
 * decodeReply(t, assembleFrame(t, values)) gives back the values, for random templates the decoder can
 * read unambiguously: every field whose length varies is followed directly by a literal or terminator
 * whose first byte cannot occur in the field, or only by segments of fixed length up to the end.
 * (Two variable fields side by side, such as text then text, can be split more than one way; no decoder
 * can read those, so the generator does not make them.)
 */
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { type TemplateInput, assembleFrame, decodeReply, templateSchema, toHex } from '~/lib/frame';
import { ascii, hexOf, tpl } from './helpers';

type SegIn = TemplateInput['segments'][number];

const hex = (bytes: number[]) => bytes.map((b) => b.toString(16).padStart(2, '0')).join(' ');
const NUMBER_CHARS = '0123456789+-. ';
const ALGORITHMS = ['XOR-8', 'LRC', 'SUM-8', 'CRC-8/SMBUS', 'CRC-16/MODBUS', 'CRC-16/XMODEM', 'CRC-32/ISO-HDLC'];
const SCALES = [undefined, { factor: 100 }, { factor: 0.1 }, { factor: 10, offset: 400 }, { factor: 1000, divisor: 360 }, { factor: -2, offset: 0.5 }];
const TEXT_SETS = [undefined, 'ABCDEF0123456789', 'abc xyz', '0123456789'];
const CHOICE_LETTERS = 'ABCDEFGH';

/** One generated piece: a segment plus how to make a value for it. */
interface Piece {
  seg: SegIn;
  value?: fc.Arbitrary<string>;
}

const literal = fc.uint8Array({ minLength: 1, maxLength: 4 }).map((b): Piece => ({ seg: { type: 'literal', id: '', bytes: hex([...b]) } }));

const digitsText = (maxInt: number, maxFrac: number) =>
  fc.tuple(fc.boolean(), fc.nat({ max: maxInt }), fc.nat({ max: 10 ** maxFrac - 1 }), fc.nat({ max: maxFrac })).map(([neg, i, f, places]) =>
    `${neg ? '-' : ''}${i}${places ? `.${String(f).padStart(maxFrac, '0').slice(0, places)}` : ''}`);

const numberPiece = fc
  .record({
    decimal: fc.boolean(),
    decimals: fc.nat({ max: 4 }),
    width: fc.option(fc.integer({ min: 10, max: 20 }), { nil: undefined }),
    pad: fc.constantFrom('zero' as const, 'space' as const),
    sign: fc.constantFrom('always' as const, 'negative' as const),
    scale: fc.constantFrom(...SCALES),
  })
  .map(({ decimal, decimals, width, pad, sign, scale }): Piece => ({
    seg: { type: decimal ? 'decimal' : 'integer', id: '', name: '', label: 'N', width, pad, sign, ...(scale ? { scale } : {}), ...(decimal ? { decimals } : {}) } as SegIn,
    value: digitsText(99999, 4),
  }));

const textPiece = fc
  .record({ allowed: fc.constantFrom(...TEXT_SETS), maxLength: fc.option(fc.integer({ min: 0, max: 12 }), { nil: undefined }), case: fc.constantFrom('upper' as const, 'lower' as const, 'as-is' as const) })
  .map(({ allowed, maxLength, case: c }): Piece => {
    const chars = allowed ?? Array.from({ length: 95 }, (_, i) => String.fromCharCode(0x20 + i)).join('');
    return {
      seg: { type: 'text', id: '', name: '', label: 'T', default: '', ...(allowed ? { allowed } : {}), ...(maxLength !== undefined ? { maxLength } : {}), case: allowed ? 'as-is' : c },
      value: fc.array(fc.constantFrom(...chars), { maxLength: maxLength ?? 12 }).map((a) => a.join('')),
    };
  });

const choicePiece = fc
  .uniqueArray(fc.stringMatching(new RegExp(`^[${CHOICE_LETTERS}]{1,3}$`)), { minLength: 1, maxLength: 4 })
  .map((sends): Piece => {
    const options = sends.map((send, i) => ({ value: `opt${i}`, send }));
    return { seg: { type: 'choice', id: '', name: '', label: 'C', options }, value: fc.constantFrom(...options.map((o) => o.value)) };
  });

const checksumPiece = fc
  .record({
    algorithm: fc.constantFrom(...ALGORITHMS),
    encoding: fc.constantFrom('binary' as const, 'ascii-hex' as const, 'ascii-decimal' as const),
    byteOrder: fc.constantFrom('low-first' as const, 'high-first' as const),
    case: fc.constantFrom('upper' as const, 'lower' as const),
    from: fc.nat(),
    to: fc.nat(),
  })
  .map(({ from, to, ...rest }): Piece => ({ seg: { type: 'checksum', id: '', ...rest, range: { from: from as never, to: to as never } } }));

/** Characters a field can put on the wire (undefined: any byte, as the decoder reads text fields). */
function fieldChars(s: SegIn): string | undefined {
  if (s.type === 'integer' || s.type === 'decimal') return NUMBER_CHARS;
  if (s.type === 'text') return s.allowed;
  if (s.type === 'choice') return CHOICE_LETTERS;
  return '';
}

function fixedLength(s: SegIn): boolean {
  if (s.type === 'literal' || s.type === 'terminator' || s.type === 'checksum') return true;
  if (s.type === 'integer' || s.type === 'decimal') return s.width !== undefined;
  if (s.type === 'choice') return s.options.every((o) => o.send.length === s.options[0]!.send.length);
  return false;
}

/** A byte outside `chars` to delimit a field with: a control byte for free text, else a printable one. */
const delimiterFor = (chars: string | undefined, pickByte: number) =>
  chars === undefined ? [0x00, 0x03, 0x0d, 0x0a, 0xff][pickByte % 5]! : [0x2c, 0x3b, 0x2a, 0x0d, 0x3d, 0x7f].find((b) => !chars.includes(String.fromCharCode(b)))!;

const template = fc
  .tuple(
    fc.array(fc.oneof(literal, numberPiece, textPiece, choicePiece, checksumPiece), { minLength: 1, maxLength: 9 }),
    fc.option(fc.constantFrom('0D', '0D 0A', '03'), { nil: undefined }),
    fc.boolean(),
    fc.array(fc.nat({ max: 255 }), { minLength: 12, maxLength: 12 }),
  )
  .map(([pieces, terminator, checksumAfter, picks]) => {
    // a checksum needs something before it to cover
    const list: Piece[] = pieces[0]!.seg.type === 'checksum' ? [{ seg: { type: 'literal', id: '', bytes: '41' } }, ...pieces] : [...pieces];
    if (terminator) list.push({ seg: { type: 'terminator', id: '', bytes: terminator } });
    if (terminator && checksumAfter) list.push({ seg: { type: 'checksum', id: '', algorithm: 'XOR-8', range: { from: 'start', to: 'checksum' } } });
    // Make every variable-length field readable: a delimiter right after it, unless only fixed-length segments follow.
    for (let i = 0; i < list.length; i++) {
      const s = list[i]!.seg;
      if (fixedLength(s) || s.type === 'literal' || s.type === 'terminator' || s.type === 'checksum') continue;
      if (list.slice(i + 1).every((p) => fixedLength(p.seg))) continue;
      const chars = fieldChars(s);
      const next = list[i + 1]?.seg;
      const first = next && (next.type === 'literal' || next.type === 'terminator') ? parseInt(next.bytes.slice(0, 2), 16) : -1;
      if (first >= 0 && (chars === undefined ? first < 0x20 || first > 0x7e : !chars.includes(String.fromCharCode(first)))) continue;
      list.splice(i + 1, 0, { seg: { type: 'literal', id: '', bytes: hex([delimiterFor(chars, picks[i % 12]!)]) } });
    }
    const segments = list.map((p, i) => {
      const seg = { ...p.seg, id: `s${i}` } as SegIn;
      if ('name' in seg) seg.name = `f${i}`;
      if (seg.type === 'checksum' && typeof seg.range?.from === 'number') {
        // from the start or a segment before the checksum, to the checksum or a segment at or after `from`
        const a = seg.range.from;
        const b = seg.range.to as number;
        const from = a % 3 === 0 ? 'start' : a % i;
        const lo = from === 'start' ? 0 : from;
        seg.range = { from, to: b % 2 === 0 ? 'checksum' : lo + (b % (i - lo)) } as never;
      }
      return seg;
    });
    return { template: templateSchema.parse({ version: 1, segments }), pieces: list };
  })
  .chain(({ template, pieces }) => {
    const values: Record<string, fc.Arbitrary<string>> = {};
    template.segments.forEach((s, i) => {
      if ('name' in s && pieces[i]!.value) values[s.name] = pieces[i]!.value!;
    });
    return fc.record(values).map((v) => ({ template, values: v as Record<string, string> }));
  });

describe('decodeReply(assembleFrame(template, values)) gives back the values', () => {
  test('the issue case: ">" integer, XOR-8 as ASCII hex, CR', () => {
    const t = tpl([
      { type: 'literal', id: 'gt', bytes: hexOf('>') },
      { type: 'integer', id: 'n', name: 'n', label: 'N' },
      { type: 'checksum', id: 'k', algorithm: 'XOR-8', encoding: 'ascii-hex' },
      { type: 'terminator', id: 'e', bytes: '0D' },
    ]);
    const sent = assembleFrame(t, { n: '12' });
    // XOR-8 of ">12" = 0x3E ^ 0x31 ^ 0x32 = 0x3D, computed by hand from the definition (XOR of the bytes)
    expect(toHex(sent.bytes)).toBe(hexOf('>123D\r'));
    const d = decodeReply(t, sent.bytes);
    expect(d.findings).toEqual([]);
    expect(d.fields.n).toMatchObject({ text: '12', raw: 12, value: 12 });
    expect(d.checksums).toMatchObject([{ ok: true, expected: 0x3d, received: 0x3d }]);
  });

  test('a number followed by a fixed-length choice and a binary CRC', () => {
    const t = tpl([
      { type: 'integer', id: 'n', name: 'n', label: 'N', sign: 'always' },
      { type: 'choice', id: 'c', name: 'c', label: 'C', options: [{ value: 'one', send: '1' }, { value: 'two', send: '2' }] },
      { type: 'checksum', id: 'k', algorithm: 'CRC-16/MODBUS', byteOrder: 'low-first' },
    ]);
    const sent = assembleFrame(t, { n: '-45', c: 'two' });
    const d = decodeReply(t, sent.bytes);
    expect(d.findings).toEqual([]);
    expect(d.fields.n).toMatchObject({ raw: -45 });
    expect(d.fields.c).toMatchObject({ value: 'two' });
  });

  test('corrupted checksum is still reported as a mismatch, with the fields read', () => {
    const t = tpl([
      { type: 'literal', id: 'gt', bytes: hexOf('>') },
      { type: 'integer', id: 'n', name: 'n', label: 'N' },
      { type: 'checksum', id: 'k', algorithm: 'XOR-8', encoding: 'ascii-hex' },
      { type: 'terminator', id: 'e', bytes: '0D' },
    ]);
    const d = decodeReply(t, ascii('>1240\r'));
    expect(d.fields.n).toMatchObject({ text: '12', raw: 12 });
    expect(d.findings).toMatchObject([{ code: 'checksum-mismatch', range: [3, 5] }]);
  });

  test('random decodable templates (fast-check)', () => {
    fc.assert(
      fc.property(template, ({ template: t, values }) => {
        const sent = assembleFrame(t, values);
        fc.pre(sent.ok);
        const d = decodeReply(t, sent.bytes);
        expect(d.findings).toEqual([]);
        expect(d.checksums.every((c) => c.ok)).toBe(true);
        for (const s of t.segments) {
          if (!('name' in s)) continue;
          const span = sent.segments.find((x) => x.id === s.id)!;
          const got = d.fields[s.name];
          expect(got, s.name).toBeDefined();
          expect(got!.range).toEqual([span.start, span.end]);
          if (s.type === 'integer' || s.type === 'decimal') {
            expect(got!.raw).toBe(span.raw);
            const rounded = sent.findings.some((f) => f.segmentId === s.id && (f.code === 'field-not-integer' || f.code === 'field-rounded'));
            if (!rounded) expect(got!.value).toBe(Number(values[s.name]) + 0); // + 0: typed "-0" is the number 0
          } else if (s.type === 'text') {
            expect(got!.value).toBe(span.raw);
            if (s.case === 'as-is') expect(got!.value).toBe(values[s.name]);
          } else {
            expect(got!.value).toBe(values[s.name]);
          }
        }
      }),
      { numRuns: 3000 },
    );
  });
});
