import { describe, expect, test } from 'vitest';
import { assembleFrame, checkFrame, frameRulesSchema, previewFrame } from '~/lib/frame';
import { ascii, hexOf, tpl } from './helpers';

const rules = (r: object) => frameRulesSchema.parse(r);
const codes = (f: { code: string }[]) => f.map((x) => x.code);
const b = (...x: number[]) => Uint8Array.from(x);

describe('checkFrame finding codes', () => {
  test('a clean frame has no findings', () => {
    // common practice: ASCII command delimited by carriage return
    expect(checkFrame(ascii('GO 10\r'), undefined, rules({ terminator: '0D', byteSet: 'printable', letterCase: 'upper' }))).toEqual([]);
  });
  test('empty-frame', () => {
    expect(codes(checkFrame(b(), undefined, {}))).toEqual(['empty-frame']);
  });
  test('missing-terminator', () => {
    const f = checkFrame(ascii('GO 10'), undefined, rules({ terminator: '0D' }));
    expect(f).toMatchObject([{ code: 'missing-terminator', severity: 'error' }]);
    expect(f[0]!.message).toContain('0D');
  });
  test('missing-terminator when the template terminator differs from the device rule', () => {
    const t = tpl([{ type: 'literal', id: 'a', bytes: hexOf('GO') }, { type: 'terminator', id: 'e', bytes: '0A' }]);
    const r = assembleFrame(t, {});
    expect(codes(checkFrame(r.bytes, r.segments, rules({ terminator: '0D' })))).toEqual(['missing-terminator']);
  });
  test('terminator-in-payload: the device would cut the frame early', () => {
    const f = checkFrame(b(0x41, 0x0d, 0x42, 0x0d), undefined, rules({ terminator: '0D' }));
    expect(f).toMatchObject([{ code: 'terminator-in-payload', severity: 'error', range: [1, 2] }]);
  });
  test('missing-start and start-in-payload', () => {
    expect(checkFrame(b(0x41, 0x03), undefined, rules({ start: '02' }))).toMatchObject([{ code: 'missing-start', range: [0, 1] }]);
    expect(checkFrame(b(0x02, 0x41, 0x02, 0x03), undefined, rules({ start: '02', terminator: '03' }))).toMatchObject([{ code: 'start-in-payload', range: [2, 3] }]);
  });
  test('forbidden-byte', () => {
    expect(checkFrame(b(0x41, 0x1b, 0x0d), undefined, rules({ terminator: '0D', forbidden: '1B' }))).toMatchObject([{ code: 'forbidden-byte', range: [1, 2] }]);
  });
  test('byte-outside-set: printable and 7-bit, 0x00/0x7F/0x80/0xFF', () => {
    // printable ASCII is 0x20-0x7E (RFC 20, section 4.1: 0x7F DEL is a control character)
    const frame = b(0x00, 0x41, 0x7f, 0x80, 0xff, 0x0d);
    expect(checkFrame(frame, undefined, rules({ terminator: '0D', byteSet: 'printable' })).map((f) => f.range)).toEqual([[0, 1], [2, 5]]);
    // RFC 20: ASCII is a 7-bit code, 0x00-0x7F
    expect(checkFrame(frame, undefined, rules({ terminator: '0D', byteSet: '7-bit' })).map((f) => [f.code, f.range])).toEqual([['byte-outside-set', [3, 5]]]);
    expect(checkFrame(frame, undefined, rules({ terminator: '0D', byteSet: '8-bit' }))).toEqual([]);
  });
  test('byte-exceeds-data-bits: > 0x7F on 7, > 0x3F on 6, > 0x1F on 5', () => {
    // common practice: a UART with n data bits carries values 0 to 2^n - 1; higher bits are not sent
    const frame = b(0x1f, 0x20, 0x3f, 0x40, 0x7f, 0x80, 0xff);
    const at = (bits: number) => checkFrame(frame, undefined, {}, { dataBits: bits }).map((f) => f.range![0]);
    expect(at(8)).toEqual([]);
    expect(at(7)).toEqual([5, 6]);
    expect(at(6)).toEqual([3, 4, 5, 6]);
    expect(at(5)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(checkFrame(frame, undefined, {}, { dataBits: 7 })[0]).toMatchObject({ code: 'byte-exceeds-data-bits', severity: 'error' });
  });
  test('frame-too-long', () => {
    expect(checkFrame(ascii('ABCDE'), undefined, rules({ maxLength: 4 }))).toMatchObject([{ code: 'frame-too-long', range: [4, 5] }]);
  });
  test('wrong-case', () => {
    expect(checkFrame(ascii('GOto 5\r'), undefined, rules({ terminator: '0D', letterCase: 'upper' }))).toMatchObject([{ code: 'wrong-case', severity: 'warning', range: [2, 4] }]);
    expect(checkFrame(ascii('go To\r'), undefined, rules({ terminator: '0D', letterCase: 'lower' }))).toMatchObject([{ code: 'wrong-case', range: [3, 4] }]);
  });
  test('address-out-of-range uses the address field from the segment map', () => {
    const t = tpl([{ type: 'integer', id: 'a', name: 'address', label: 'Address', width: 2 }, { type: 'literal', id: 'x', bytes: hexOf('RD') }]);
    const r = assembleFrame(t, { address: 40 });
    expect(checkFrame(r.bytes, r.segments, rules({ addressRange: { min: 1, max: 31 } }))).toMatchObject([{ code: 'address-out-of-range', range: [0, 2] }]);
    expect(checkFrame(assembleFrame(t, { address: 7 }).bytes, assembleFrame(t, { address: 7 }).segments, rules({ addressRange: { min: 1, max: 31 } }))).toEqual([]);
  });
  test('findings are capped per code', () => {
    expect(checkFrame(new Uint8Array(100).fill(0x0d), undefined, rules({ terminator: '0D' })).length).toBe(8);
  });
});

describe('previewFrame', () => {
  test('assembly findings, frame findings and notations together', () => {
    const t = tpl([
      { type: 'text', id: 't', name: 'cmd', label: 'Command' },
      { type: 'terminator', id: 'e', bytes: '0D' },
    ]);
    const p = previewFrame(t, { cmd: 'ab' }, { dataBits: 7, frameRules: rules({ terminator: '0D', letterCase: 'upper' }) });
    expect(p.notations.iecLiteral).toBe("'ab$0D'");
    expect(p.notations.hex).toBe('61 62 0D');
    expect(codes(p.findings)).toEqual(['wrong-case']);
    expect(p.ok).toBe(true);
  });
});
