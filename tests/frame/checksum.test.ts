import fc from 'fast-check';
import * as ref from 'js-crc/models';
import { describe, expect, test } from 'vitest';
import {
  CHECKSUM_ALGORITHMS, computeChecksum, findChecksumAlgorithm, formatChecksumValue, listChecksumAlgorithms, lrc8,
  nmeaChecksum, placeChecksum, sum8, xor8,
} from '~/lib/frame';

const ascii = (s: string) => new TextEncoder().encode(s);
const CHECK = ascii('123456789');

// Source for every check value and alias below: "Catalogue of parametrised CRC algorithms", CRC RevEng
// (entries CRC-8/SMBUS, CRC-8/MAXIM-DOW, CRC-16/MODBUS, CRC-16/ARC, CRC-16/XMODEM, CRC-16/IBM-3740,
// CRC-16/KERMIT, CRC-32/ISO-HDLC); "check" is the CRC of the ASCII string "123456789".
const CATALOGUE: [string, number, string][] = [
  ['CRC-8/SMBUS', 0xf4, 'crc_8_smbus'],
  ['CRC-8/MAXIM-DOW', 0xa1, 'crc_8_maxim_dow'],
  ['CRC-16/MODBUS', 0x4b37, 'crc_16_modbus'],
  ['CRC-16/ARC', 0xbb3d, 'crc_16_arc'],
  ['CRC-16/XMODEM', 0x31c3, 'crc_16_xmodem'],
  ['CRC-16/IBM-3740', 0x29b1, 'crc_16_ibm_3740'],
  ['CRC-16/KERMIT', 0x2189, 'crc_16_kermit'],
  ['CRC-32/ISO-HDLC', 0xcbf43926, 'crc_32_iso_hdlc'],
];

describe('CRC models', () => {
  for (const [name, check, refName] of CATALOGUE) {
    test(`${name} check value`, () => {
      // CRC RevEng catalogue, entry for this model: check over "123456789"
      expect(computeChecksum(name, CHECK)).toEqual({ ok: true, value: { algorithm: name, width: findChecksumAlgorithm(name)!.width, value: check } });
    });
    test(`${name} agrees with js-crc on random data`, () => {
      const model = (ref as unknown as Record<string, (m: Uint8Array) => string>)[refName]!;
      const alg = findChecksumAlgorithm(name)!;
      fc.assert(fc.property(fc.uint8Array({ maxLength: 200 }), (b) => {
        expect(alg.compute(b)).toBe(parseInt(model(b), 16));
      }), { numRuns: 200 });
    });
  }

  test('0x00, 0x7F, 0x80, 0xFF and empty input against js-crc', () => {
    for (const [name, , refName] of CATALOGUE) {
      const model = (ref as unknown as Record<string, (m: Uint8Array) => string>)[refName]!;
      for (const b of [[0x00], [0x7f], [0x80], [0xff], []]) {
        expect(findChecksumAlgorithm(name)!.compute(Uint8Array.from(b))).toBe(parseInt(model(Uint8Array.from(b)), 16));
      }
    }
    // CRC RevEng catalogue: CRC-16/MODBUS init 0xFFFF, so the CRC of no bytes is 0xFFFF; CRC-32/ISO-HDLC gives 0
    expect(findChecksumAlgorithm('CRC-16/MODBUS')!.compute(new Uint8Array(0))).toBe(0xffff);
    expect(findChecksumAlgorithm('CRC-32')!.compute(new Uint8Array(0))).toBe(0);
  });

  test('aliases, case-insensitive; CRC-16/CCITT is KERMIT', () => {
    // CRC RevEng catalogue alias lists
    expect(findChecksumAlgorithm('crc-8')!.name).toBe('CRC-8/SMBUS');
    expect(findChecksumAlgorithm('CRC-8/maxim')!.name).toBe('CRC-8/MAXIM-DOW');
    expect(findChecksumAlgorithm('crc-16')!.name).toBe('CRC-16/ARC');
    expect(findChecksumAlgorithm('CRC-IBM')!.name).toBe('CRC-16/ARC');
    expect(findChecksumAlgorithm('zmodem')!.name).toBe('CRC-16/XMODEM');
    expect(findChecksumAlgorithm('CRC-16/CCITT-FALSE')!.name).toBe('CRC-16/IBM-3740');
    expect(findChecksumAlgorithm('CRC-16/CCITT')!.name).toBe('CRC-16/KERMIT');
    expect(findChecksumAlgorithm('crc-ccitt')!.name).toBe('CRC-16/KERMIT');
    expect(findChecksumAlgorithm('CRC-32')!.name).toBe('CRC-32/ISO-HDLC');
    expect(findChecksumAlgorithm('bcc')!.name).toBe('XOR-8');
    expect(findChecksumAlgorithm('CRC-99')).toBeUndefined();
    expect(computeChecksum('CRC-99', CHECK)).toMatchObject({ ok: false });
  });

  test('catalogue list for pickers', () => {
    const list = listChecksumAlgorithms();
    expect(list.map((a) => a.name)).toEqual([...CATALOGUE.map((c) => c[0]), 'LRC', 'XOR-8', 'SUM-8']);
    expect(list.find((a) => a.name === 'CRC-16/KERMIT')).toMatchObject({ width: 16, kind: 'crc' });
    expect(list.find((a) => a.name === 'CRC-16/KERMIT')!.aliases).toContain('CRC-16/CCITT');
    for (const a of CHECKSUM_ALGORITHMS) expect(a.compute(CHECK)).toBe(a.check);
  });
});

describe('Modbus worked examples', () => {
  test('CRC of 02 07 is 0x1241, sent low byte first as 41 12', () => {
    // Modbus over Serial Line Specification and Implementation Guide V1.02, 6.2.2 (CRC generation example)
    const crc = findChecksumAlgorithm('CRC-16/MODBUS')!.compute(Uint8Array.from([0x02, 0x07]));
    expect(crc).toBe(0x1241);
    expect(Array.from(placeChecksum(crc, 16, { encoding: 'binary', byteOrder: 'low-first', case: 'upper' }))).toEqual([0x41, 0x12]);
  });
  test('LRC 0x61 is sent as the characters "6" "1"', () => {
    // Modbus over Serial Line guide V1.02, 2.5.2.2 (LRC sent as two ASCII hex characters, high first) and
    // 6.2.1 (LRC = two's complement of the 8-bit sum). Vector 01 03 00 9B: sum 0x9F, computed from that definition.
    const lrc = lrc8(Uint8Array.from([0x01, 0x03, 0x00, 0x9b]));
    expect(lrc).toBe(0x61);
    expect(Array.from(placeChecksum(lrc, 8, { encoding: 'ascii-hex', byteOrder: 'high-first', case: 'upper' }))).toEqual([0x36, 0x31]);
  });
});

describe('LRC, XOR-8, SUM-8', () => {
  test('vectors computed from the definitions', () => {
    // definitions: SUM-8 = sum mod 256; LRC = two's complement of SUM-8 (Modbus guide V1.02, 6.2.1); XOR-8 = XOR of all bytes
    const b = Uint8Array.from([0x10, 0x20, 0xf0]);
    expect(sum8(b)).toBe(0x20);
    expect(lrc8(b)).toBe(0xe0);
    expect(xor8(b)).toBe(0xc0);
    expect([sum8(CHECK), lrc8(CHECK), xor8(CHECK)]).toEqual([0xdd, 0x23, 0x31]);
    expect([sum8(new Uint8Array(0)), lrc8(new Uint8Array(0)), xor8(new Uint8Array(0))]).toEqual([0, 0, 0]);
    const edge = Uint8Array.from([0x00, 0x7f, 0x80, 0xff]); // sum 0x1FE, xor 0x00
    expect([sum8(edge), lrc8(edge), xor8(edge)]).toEqual([0xfe, 0x02, 0x00]);
  });
  test('NMEA 0183 sentence checksum', () => {
    // NMEA 0183 (sentence checksum: XOR of characters between $ and *, two hex digits, high nibble first).
    // Sentence made up for this test; 0x0C and 0x74 computed from the definition.
    expect(nmeaChecksum('$IIXDR,C,21.5,C,AIR*0C')).toEqual({ ok: true, value: { value: 0x0c, text: '0C' } });
    expect(nmeaChecksum('$GPTST,12,A,3.5,Z')).toEqual({ ok: true, value: { value: 0x74, text: '74' } });
    expect(nmeaChecksum('no sentence')).toMatchObject({ ok: false });
  });
});

describe('placement', () => {
  test('binary, ascii-hex upper/lower, ascii-decimal', () => {
    const p = (encoding: 'binary' | 'ascii-hex' | 'ascii-decimal', byteOrder: 'low-first' | 'high-first', c: 'upper' | 'lower' = 'upper') =>
      Array.from(placeChecksum(0x4b37, 16, { encoding, byteOrder, case: c }));
    expect(p('binary', 'high-first')).toEqual([0x4b, 0x37]);
    expect(p('binary', 'low-first')).toEqual([0x37, 0x4b]);
    expect(p('ascii-hex', 'high-first')).toEqual([0x34, 0x42, 0x33, 0x37]); // "4B37"
    expect(p('ascii-hex', 'high-first', 'lower')).toEqual([0x34, 0x62, 0x33, 0x37]); // "4b37"
    expect(p('ascii-decimal', 'high-first')).toEqual([0x31, 0x39, 0x32, 0x35, 0x35]); // 19255
    expect(Array.from(placeChecksum(0x0f, 8, { encoding: 'ascii-decimal', byteOrder: 'high-first', case: 'upper' }))).toEqual([0x30, 0x31, 0x35]); // "015"
    expect(formatChecksumValue(0x4b37, 16)).toBe('0x4B37');
    expect(formatChecksumValue(0x0f, 8)).toBe('0x0F');
    expect(formatChecksumValue(0xcbf43926, 32)).toBe('0xCBF43926');
  });
});
