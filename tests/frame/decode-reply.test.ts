import { describe, expect, test } from 'vitest';
import { assembleFrame, decodeReply, toHex } from '~/lib/frame';
import { ascii, hexOf, tpl } from './helpers';

// Invented reply syntax: "POS=" <signed steps> "," <state> "*" <XOR-8 as ascii hex over everything before "*"> CR
const reply = tpl([
  { type: 'literal', id: 'h', bytes: hexOf('POS=') },
  { type: 'integer', id: 'p', name: 'angle', label: 'Angle', unit: '°', scale: { factor: 100 }, sign: 'always' },
  { type: 'literal', id: 'c', bytes: hexOf(',') },
  { type: 'choice', id: 's', name: 'state', label: 'State', options: [{ value: 'idle', send: 'I' }, { value: 'moving', send: 'M' }] },
  { type: 'literal', id: 'star', bytes: hexOf('*') },
  { type: 'checksum', id: 'k', algorithm: 'XOR-8', range: { from: 0, to: 3 }, encoding: 'ascii-hex' },
  { type: 'terminator', id: 'e', bytes: '0D' },
]);

describe('decodeReply', () => {
  test('good reply: fields with scaling inverted, checksum ok', () => {
    const sent = assembleFrame(reply, { angle: -45, state: 'moving' });
    expect(sent.findings).toEqual([]);
    // XOR-8 of "POS=-4500,M" = 0x3C, computed separately from the definition (XOR of the character codes)
    expect(toHex(sent.bytes)).toBe(hexOf('POS=-4500,M*3C\r'));
    const d = decodeReply(reply, sent.bytes);
    expect(d.ok).toBe(true);
    expect(d.findings).toEqual([]);
    expect(d.fields.angle).toEqual({ text: '-4500', raw: -4500, value: -45, range: [4, 9] });
    expect(d.fields.state).toMatchObject({ raw: 'M', value: 'moving' });
    expect(d.checksums).toEqual([{ segmentId: 'k', algorithm: 'XOR-8', expected: 0x3c, received: 0x3c, ok: true, range: [12, 14] }]);
  });
  test('bad checksum: expected vs received', () => {
    const d = decodeReply(reply, ascii('POS=-4500,M*3D\r'));
    expect(d.ok).toBe(false);
    expect(d.checksums[0]).toMatchObject({ expected: 0x3c, received: 0x3d, ok: false });
    expect(d.findings).toMatchObject([{ code: 'checksum-mismatch', range: [12, 14], severity: 'error' }]);
    expect(d.findings[0]!.message).toContain('0x3C');
  });
  test('literal mismatch, unreadable field, extra bytes, short reply', () => {
    expect(decodeReply(reply, ascii('POZ=+100,I*5B\r')).findings.map((f) => [f.code, f.range])).toContainEqual(['reply-mismatch', [0, 4]]);
    const unreadable = decodeReply(reply, ascii('POS=+1A0,I*00\r'));
    expect(unreadable.findings.map((f) => f.code)).toContain('reply-field-unreadable');
    const good = assembleFrame(reply, { angle: 1, state: 'idle' }).bytes;
    const extra = decodeReply(reply, Uint8Array.from([...good, 0x00, 0xff]));
    expect(extra.findings).toMatchObject([{ code: 'reply-extra-bytes', severity: 'warning', range: [good.length, good.length + 2] }]);
    expect(decodeReply(reply, good.subarray(0, 9)).findings.map((f) => f.code)).toContain('reply-too-short');
    expect(decodeReply(reply, new Uint8Array(0)).findings[0]).toMatchObject({ code: 'reply-too-short' });
  });
  test('binary CRC-16/MODBUS reply, good and corrupted', () => {
    // Modbus guide V1.02, 6.2.2: CRC of 02 07 = 0x1241, transmitted low byte first (41 12)
    const t = tpl([{ type: 'literal', id: 'p', bytes: '02 07' }, { type: 'checksum', id: 'k', algorithm: 'CRC-16/MODBUS', byteOrder: 'low-first' }]);
    expect(decodeReply(t, Uint8Array.from([0x02, 0x07, 0x41, 0x12])).checksums[0]).toMatchObject({ expected: 0x1241, received: 0x1241, ok: true });
    expect(decodeReply(t, Uint8Array.from([0x02, 0x07, 0x12, 0x41])).checksums[0]).toMatchObject({ expected: 0x1241, received: 0x4112, ok: false });
  });
  test('fixed-width and text fields, with bytes 0x7F-0xFF in the text', () => {
    const t = tpl([
      { type: 'integer', id: 'a', name: 'addr', label: 'Address', width: 2 },
      { type: 'decimal', id: 'w', name: 'weight', label: 'Weight', unit: 'kg', decimals: 2, width: 7, pad: 'space' },
      { type: 'text', id: 'n', name: 'note', label: 'Note' },
      { type: 'terminator', id: 'e', bytes: '0D 0A' },
    ]);
    const d = decodeReply(t, Uint8Array.from([...ascii('07  12.50ok'), 0x7f, 0x80, 0xff, 0x0d, 0x0a]));
    expect(d.fields.addr).toMatchObject({ raw: 7, value: 7 });
    expect(d.fields.weight).toMatchObject({ text: '  12.50', raw: 12.5, value: 12.5 });
    expect(d.fields.note).toMatchObject({ text: 'ok\u007f\u0080\u00ff', range: [9, 14] });
    expect(d.findings).toEqual([]);
  });
  test('templates that can be split many ways still answer quickly, with findings', () => {
    const t = tpl([
      { type: 'text', id: 'a', name: 'a', label: 'A' },
      { type: 'text', id: 'b', name: 'b', label: 'B' },
      { type: 'integer', id: 'n', name: 'n', label: 'N' },
      { type: 'integer', id: 'm', name: 'm', label: 'M' },
      { type: 'terminator', id: 'e', bytes: '0D' },
    ]);
    const started = performance.now();
    const d = decodeReply(t, ascii('x'.repeat(20_000) + '1'.repeat(5_000)));
    expect(performance.now() - started).toBeLessThan(3000);
    expect(d.ok).toBe(false);
    expect(d.findings.map((f) => f.code)).toContain('reply-too-short');
  });
});
