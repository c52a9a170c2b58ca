import * as ref from 'js-crc/models';
import { describe, expect, test } from 'vitest';
import { assembleFrame, decodeReply, portSettingsSchema, previewFrame, serializeTemplate, templateSchema, toHex } from '~/lib/frame';
import { ascii, hexOf, tpl } from './helpers';

const text = (b: Uint8Array) => new TextDecoder('latin1').decode(b);
const codes = (fs: { code: string }[]) => fs.map((f) => f.code);

/** Modbus ASCII request ":" + "010300000001" + LRC + CR LF: read one holding register at 0 of device 1. */
const modbusAscii = (over?: 'bytes' | 'decoded-hex', from: 'start' | number = 1) => tpl([
  { type: 'literal', id: 'colon', bytes: '3A' },
  { type: 'literal', id: 'pdu', bytes: hexOf('010300000001') },
  { type: 'checksum', id: 'lrc', algorithm: 'LRC', range: { from, to: 'checksum' }, encoding: 'ascii-hex', ...(over ? { over } : {}) },
  { type: 'terminator', id: 'end', bytes: '0D 0A' },
]);

describe('checksum over the decoded hex (Modbus ASCII)', () => {
  test('":" 010300000001 LRC CR LF gives LRC FB', () => {
    // Modbus over Serial Line V1.02, 2.5.2.2 and 6.2.1: the LRC is the two's complement of the 8-bit sum of the
    // message bytes (01 03 00 00 00 01 sum to 0x05, so the LRC is 0xFB), not of their hex characters
    const r = assembleFrame(modbusAscii('decoded-hex'), {});
    expect(r.findings).toEqual([]);
    expect(text(r.bytes)).toBe(':010300000001FB\r\n');
    expect(r.segments[2]).toMatchObject({ start: 13, end: 15, raw: 0xfb });
  });
  test('over the characters, as before, the same template gives BB', () => {
    // the characters "010300000001" sum to 9 × 0x30 + 2 × 0x31 + 0x33 = 0x245; two's complement of 0x45 is 0xBB
    expect(text(assembleFrame(modbusAscii(), {}).bytes)).toBe(':010300000001BB\r\n');
    expect(text(assembleFrame(modbusAscii('bytes'), {}).bytes)).toBe(':010300000001BB\r\n');
  });
  test('non-hex characters or an odd count in the covered range are findings', () => {
    const withColon = assembleFrame(modbusAscii('decoded-hex', 'start'), {});
    expect(withColon.findings).toMatchObject([{ severity: 'error', code: 'checksum-not-hex', segmentId: 'lrc', range: [0, 1] }]);
    expect(withColon.findings[0]!.message).toContain('":" (3A) at position 0');
    const odd = tpl([
      { type: 'literal', id: 'colon', bytes: '3A' },
      { type: 'literal', id: 'pdu', bytes: hexOf('01030') },
      { type: 'checksum', id: 'lrc', algorithm: 'LRC', range: { from: 1, to: 'checksum' }, encoding: 'ascii-hex', over: 'decoded-hex' },
    ]);
    expect(assembleFrame(odd, {}).findings).toMatchObject([{ code: 'checksum-not-hex', range: [5, 6] }]);
    // 0x00, 0x7F, 0x80, 0xFF are not hex digits; lower-case hex is
    for (const b of ['00', '7F', '80', 'FF']) {
      const t = tpl([{ type: 'literal', id: 'p', bytes: `30 ${b}` }, { type: 'checksum', id: 'k', algorithm: 'LRC', encoding: 'ascii-hex', over: 'decoded-hex' }]);
      expect(assembleFrame(t, {}).findings).toMatchObject([{ code: 'checksum-not-hex', range: [1, 2] }]);
    }
    const lower = tpl([{ type: 'literal', id: 'p', bytes: hexOf('0a0B') }, { type: 'checksum', id: 'k', algorithm: 'SUM-8', encoding: 'ascii-hex', over: 'decoded-hex' }]);
    expect(text(assembleFrame(lower, {}).bytes)).toBe('0a0B15'); // 0x0A + 0x0B = 0x15
    const empty = tpl([{ type: 'literal', id: 'p', bytes: '3A' }, { type: 'checksum', id: 'k', algorithm: 'CRC-16/MODBUS', range: { from: 0, to: 'checksum' }, encoding: 'ascii-hex', over: 'decoded-hex' }]);
    expect(assembleFrame(empty, {}).findings).toMatchObject([{ code: 'checksum-not-hex' }]);
  });
  test('a Modbus ASCII reply is verified over its decoded hex', () => {
    // Modbus over Serial Line V1.02, 2.5.2.2: reply 01 03 02 00 01 sums to 0x07, LRC 0xF9 (computed from the definition)
    const t = tpl([
      { type: 'literal', id: 'colon', bytes: '3A' },
      { type: 'literal', id: 'head', bytes: hexOf('010302') },
      { type: 'text', id: 'v', name: 'value', label: 'Register' },
      { type: 'checksum', id: 'lrc', algorithm: 'LRC', range: { from: 1, to: 'checksum' }, encoding: 'ascii-hex', over: 'decoded-hex' },
      { type: 'terminator', id: 'end', bytes: '0D 0A' },
    ]);
    const good = decodeReply(t, ascii(':0103020001F9\r\n'));
    expect(good.findings).toEqual([]);
    expect(good.checksums).toEqual([{ segmentId: 'lrc', algorithm: 'LRC', expected: 0xf9, received: 0xf9, ok: true, range: [11, 13] }]);
    const bad = decodeReply(t, ascii(':0103020001BF\r\n')); // BF: the LRC over the characters
    expect(bad.checksums[0]).toMatchObject({ expected: 0xf9, received: 0xbf, ok: false });
    expect(codes(bad.findings)).toEqual(['checksum-mismatch']);
    const garbled = decodeReply(t, ascii(':01030200G1F9\r\n'));
    expect(codes(garbled.findings)).toContain('checksum-not-hex');
    expect(garbled.ok).toBe(false);
  });
});

describe('byte order from the model', () => {
  test('CRC-16/MODBUS without a byte order is sent low byte first', () => {
    // Modbus over Serial Line V1.02, 6.2.2: CRC of 02 07 is 0x1241, low-order byte appended first
    const t = tpl([{ type: 'literal', id: 'p', bytes: '02 07' }, { type: 'checksum', id: 'k', algorithm: 'CRC-16/MODBUS' }]);
    expect(t.segments[1]).toMatchObject({ byteOrder: 'low-first' });
    expect(toHex(assembleFrame(t, {}).bytes)).toBe('02 07 41 12');
    const saved = serializeTemplate({ version: 1, segments: [{ type: 'literal', id: 'p', bytes: '02 07' }, { type: 'checksum', id: 'k', algorithm: 'modbus' }] });
    expect(saved.ok && JSON.parse(saved.value).segments[1]).toMatchObject({ byteOrder: 'low-first', over: 'bytes', encoding: 'binary' });
    expect(decodeReply(t, Uint8Array.from([0x02, 0x07, 0x41, 0x12])).ok).toBe(true);
  });
  test('non-reflected models high byte first; hex characters as the number is written; an explicit order is kept', () => {
    // CRC RevEng catalogue: CRC-16/XMODEM check 0x31C3, CRC-16/MODBUS check 0x4B37 over "123456789"
    const nine = hexOf('123456789');
    const at = (seg: object) => toHex(assembleFrame(tpl([{ type: 'literal', id: 'p', bytes: nine }, { type: 'checksum', id: 'k', ...seg } as never]), {}).bytes).slice(nine.length + 1);
    expect(at({ algorithm: 'CRC-16/XMODEM' })).toBe('31 C3');
    expect(at({ algorithm: 'CRC-16/MODBUS', encoding: 'ascii-hex' })).toBe(hexOf('4B37'));
    expect(at({ algorithm: 'CRC-16/MODBUS', byteOrder: 'high-first' })).toBe('4B 37');
    expect(at({ algorithm: 'CRC-32/ISO-HDLC' })).toBe('26 39 F4 CB'); // check 0xCBF43926, reflected: low byte first
    expect(at({ algorithm: 'SUM-16' })).toBe('01 DD'); // common practice: high byte first; "123456789" sums to 0x01DD
  });
});

describe('custom CRC parameters in a template', () => {
  const custom = (crc: object, extra: object = {}) => ({ type: 'checksum', id: 'k', algorithm: 'custom', crc, ...extra });
  test('registers as hex text or numbers, saved as hex text; catalogue parameters behave as the model', () => {
    // CRC RevEng catalogue: CRC-16/IBM-3740 (width 16, poly 0x1021, init 0xFFFF, not reflected, xorout 0) check 0x29B1
    const t = tpl([{ type: 'literal', id: 'p', bytes: hexOf('123456789') }, custom({ width: 16, poly: '0x1021', init: 0xffff, refin: false, refout: false, xorout: 0 }) as never]);
    expect(t.segments[1]).toMatchObject({ crc: { width: 16, poly: '0x1021', init: '0xFFFF', refin: false, refout: false, xorout: '0x0000' }, byteOrder: 'high-first' });
    const r = assembleFrame(t, {});
    expect(toHex(r.bytes).endsWith('29 B1')).toBe(true);
    expect(r.segments[1]!.raw).toBe(0x29b1);
    expect(templateSchema.parse(JSON.parse(JSON.stringify(t)))).toEqual(t);
  });
  test('a width that is not whole bytes: CRC-12/UMTS', () => {
    // CRC RevEng catalogue: CRC-12/UMTS width 12 poly 0x80F init 0 refin false refout true xorout 0, check 0xDAF
    const t = tpl([
      { type: 'literal', id: 'p', bytes: hexOf('123456789') },
      custom({ width: 12, poly: '80f', init: '0', refin: false, refout: true, xorout: '000' }, { byteOrder: 'high-first' }) as never,
      custom({ width: 12, poly: '80f', init: '0', refin: false, refout: true, xorout: '000' }, { id: 'h', range: { from: 0, to: 0 }, encoding: 'ascii-hex' }) as never,
    ]);
    expect(t.segments[1]).toMatchObject({ crc: { poly: '0x80F', init: '0x000' } });
    expect(toHex(assembleFrame(t, {}).bytes)).toBe(`${hexOf('123456789')} 0D AF ${hexOf('0DAF')}`);
    const d = decodeReply(t, assembleFrame(t, {}).bytes);
    expect(d.ok).toBe(true);
    expect(d.checksums.map((c) => c.expected)).toEqual([0xdaf, 0xdaf]);
  });
  test('refused: custom without parameters, parameters with a named model, bad parameters, non-ASCII names', () => {
    const ok = (seg: object) => templateSchema.safeParse({ version: 1, segments: [{ type: 'literal', id: 'p', bytes: '01' }, { id: 'k', type: 'checksum', ...seg }] });
    const base = { width: 16, poly: '0x1021', init: '0x0000', refin: false, refout: false, xorout: '0x0000' };
    expect(ok({ algorithm: 'custom', crc: base }).success).toBe(true);
    expect(ok({ algorithm: 'CUSTOM', crc: base }).success).toBe(true);
    const issue = (seg: object) => { const r = ok(seg); return r.success ? 'accepted' : `${r.error.issues[0]!.path.join('.')}: ${r.error.issues[0]!.message}`; };
    expect(issue({ algorithm: 'custom' })).toMatch(/^segments\.1\.crc: /);
    expect(issue({ algorithm: 'CRC-16/MODBUS', crc: base })).toMatch(/^segments\.1\.crc: /);
    expect(issue({ algorithm: 'custom', crc: { ...base, poly: '0x8408' } })).toMatch(/^segments\.1\.crc\.poly: .*\+1 term/);
    expect(issue({ algorithm: 'custom', crc: { ...base, width: 8, poly: '0x07', init: '0x100' } })).toMatch(/^segments\.1\.crc\.init: /);
    expect(issue({ algorithm: 'custom', crc: { ...base, width: 33 } })).toMatch(/^segments\.1\.crc\.width/);
    expect(issue({ algorithm: 'custom', crc: { ...base, poly: 'G1' } })).toMatch(/^segments\.1\.crc\.poly/);
    expect(issue({ algorithm: 'crc-16/modbuſ' })).toMatch(/^segments\.1\.algorithm: Unknown checksum/);
    expect(issue({ algorithm: 'AUTOSAR' })).toMatch(/^segments\.1\.algorithm: Unknown checksum/);
  });
});

describe('findings from the port protocol', () => {
  const rtu = portSettingsSchema.parse({ protocol: 'modbus-rtu', parity: 'even' });
  const rtuRequest = (byteOrder?: 'low-first' | 'high-first') => tpl([
    { type: 'literal', id: 'pdu', bytes: '01 03 00 00 00 01' },
    { type: 'checksum', id: 'crc', algorithm: 'CRC-16/MODBUS', ...(byteOrder ? { byteOrder } : {}) },
  ]);
  test('Modbus RTU: CRC-16/MODBUS sent high byte first is an error', () => {
    // Modbus over Serial Line V1.02, 2.5.1.2 and 6.2.2: the CRC's low-order byte is appended first.
    // CRC of 01 03 00 00 00 01 cross-checked with js-crc's crc_16_modbus.
    const crc = parseInt(ref.crc_16_modbus(Uint8Array.from([1, 3, 0, 0, 0, 1])), 16);
    const low = `${(crc & 0xff).toString(16).toUpperCase().padStart(2, '0')} ${(crc >> 8).toString(16).toUpperCase().padStart(2, '0')}`;
    const good = previewFrame(rtuRequest(), {}, rtu);
    expect(good.findings).toEqual([]);
    expect(toHex(good.bytes)).toBe(`01 03 00 00 00 01 ${low}`);
    const wrong = previewFrame(rtuRequest('high-first'), {}, rtu);
    expect(wrong.ok).toBe(false);
    expect(wrong.findings).toMatchObject([{ severity: 'error', code: 'checksum-byte-order', segmentId: 'crc', range: [6, 8] }]);
    expect(wrong.findings[0]!.message).toMatch(/low byte first/);
    // the same template on a port of another protocol: no opinion on the byte order
    expect(previewFrame(rtuRequest('high-first'), {}, portSettingsSchema.parse({ protocol: 'other' })).findings).toEqual([]);
    expect(previewFrame(rtuRequest('high-first'), {}, { dataBits: 8 }).findings).toEqual([]);
  });
  test('Modbus ASCII: an LRC over the characters is an error', () => {
    const port = portSettingsSchema.parse({ protocol: 'modbus-ascii', dataBits: 7, parity: 'even' });
    const wrong = previewFrame(modbusAscii('bytes'), {}, port);
    expect(wrong.findings).toMatchObject([{ severity: 'error', code: 'checksum-over-characters', segmentId: 'lrc', range: [13, 15] }]);
    const right = previewFrame(modbusAscii('decoded-hex'), {}, port);
    expect(right.findings).toEqual([]);
    expect(text(right.bytes)).toBe(':010300000001FB\r\n');
  });
});
