/**
 * Table-driven CRC engine over the parametrised model of the "Catalogue of parametrised CRC
 * algorithms" (CRC RevEng): width (1-32 bits), poly, init, refin, refout, xorout; `check` is the CRC of
 * the ASCII string "123456789", `residue` the register after an error-free codeword, before xorout.
 *
 * The engine is written here rather than taken from a package because the only CRC package in the
 * project is a development dependency; the tests cross-check every model against it.
 */

export interface CrcParams {
  /** Register width in bits, 1-32. */
  width: number;
  /** Generator polynomial in normal (MSB-first) form without the top term, e.g. 0x8005. */
  poly: number;
  init: number;
  refin: boolean;
  refout: boolean;
  xorout: number;
}

export interface CrcModel extends CrcParams {
  /** Catalogue name, e.g. `CRC-16/MODBUS`. */
  name: string;
  /** The catalogue's aliases; a name shared by several widths (AUTOSAR, LTE, XZ) only with its width prefix. */
  aliases: readonly string[];
  check: number;
  residue: number;
}

const m = (name: string, aliases: string[], width: number, poly: number, init: number, reflected: boolean, xorout: number, check: number, residue: number): CrcModel =>
  ({ name, aliases, width, poly, init, refin: reflected, refout: reflected, xorout, check, residue });

/** The supported models in picker order, parameters, check and residue as listed in the catalogue. */
export const CRC_MODELS: readonly CrcModel[] = [
  m('CRC-8/SMBUS', ['CRC-8'], 8, 0x07, 0x00, false, 0x00, 0xf4, 0x00),
  m('CRC-8/MAXIM-DOW', ['CRC-8/MAXIM', 'DOW-CRC'], 8, 0x31, 0x00, true, 0x00, 0xa1, 0x00),
  m('CRC-8/AUTOSAR', [], 8, 0x2f, 0xff, false, 0xff, 0xdf, 0x42),
  m('CRC-8/ROHC', [], 8, 0x07, 0xff, true, 0x00, 0xd0, 0x00),
  m('CRC-16/MODBUS', ['MODBUS'], 16, 0x8005, 0xffff, true, 0x0000, 0x4b37, 0x0000),
  m('CRC-16/ARC', ['ARC', 'CRC-16', 'CRC-16/LHA', 'CRC-IBM'], 16, 0x8005, 0x0000, true, 0x0000, 0xbb3d, 0x0000),
  m('CRC-16/XMODEM', ['CRC-16/ACORN', 'CRC-16/LTE', 'CRC-16/V-41-MSB', 'XMODEM', 'ZMODEM'], 16, 0x1021, 0x0000, false, 0x0000, 0x31c3, 0x0000),
  m('CRC-16/IBM-3740', ['CRC-16/AUTOSAR', 'CRC-16/CCITT-FALSE'], 16, 0x1021, 0xffff, false, 0x0000, 0x29b1, 0x0000),
  m('CRC-16/KERMIT', ['CRC-16/BLUETOOTH', 'CRC-16/CCITT', 'CRC-16/CCITT-TRUE', 'CRC-16/V-41-LSB', 'CRC-CCITT', 'KERMIT'], 16, 0x1021, 0x0000, true, 0x0000, 0x2189, 0x0000),
  m('CRC-16/DNP', [], 16, 0x3d65, 0x0000, true, 0xffff, 0xea82, 0x66c5),
  m('CRC-16/IBM-SDLC', ['CRC-16/ISO-HDLC', 'CRC-16/ISO-IEC-14443-3-B', 'CRC-16/X-25', 'CRC-B', 'X-25'], 16, 0x1021, 0xffff, true, 0xffff, 0x906e, 0xf0b8),
  m('CRC-16/MCRF4XX', [], 16, 0x1021, 0xffff, true, 0x0000, 0x6f91, 0x0000),
  m('CRC-16/USB', [], 16, 0x8005, 0xffff, true, 0xffff, 0xb4c8, 0xb001),
  m('CRC-16/MAXIM-DOW', ['CRC-16/MAXIM'], 16, 0x8005, 0x0000, true, 0xffff, 0x44c2, 0xb001),
  m('CRC-16/GENIBUS', ['CRC-16/DARC', 'CRC-16/EPC', 'CRC-16/EPC-C1G2', 'CRC-16/I-CODE'], 16, 0x1021, 0xffff, false, 0xffff, 0xd64e, 0x1d0f),
  m('CRC-16/PROFIBUS', ['CRC-16/IEC-61158-2'], 16, 0x1dcf, 0xffff, false, 0xffff, 0xa819, 0xe394),
  m('CRC-16/EN-13757', [], 16, 0x3d65, 0x0000, false, 0xffff, 0xc2b7, 0xa366),
  m('CRC-16/SPI-FUJITSU', ['CRC-16/AUG-CCITT'], 16, 0x1021, 0x1d0f, false, 0x0000, 0xe5cc, 0x0000),
  m('CRC-32/ISO-HDLC', ['CRC-32', 'CRC-32/ADCCP', 'CRC-32/V-42', 'CRC-32/XZ', 'PKZIP'], 32, 0x04c11db7, 0xffffffff, true, 0xffffffff, 0xcbf43926, 0xdebb20e3),
  m('CRC-32/ISCSI', ['CRC-32/BASE91-C', 'CRC-32/CASTAGNOLI', 'CRC-32/INTERLAKEN', 'CRC-32C'], 32, 0x1edc6f41, 0xffffffff, true, 0xffffffff, 0xe3069283, 0xb798b438),
  m('CRC-32/MPEG-2', [], 32, 0x04c11db7, 0xffffffff, false, 0x00000000, 0x0376e6e7, 0x00000000),
  m('CRC-32/BZIP2', ['CRC-32/AAL5', 'CRC-32/DECT-B', 'B-CRC-32'], 32, 0x04c11db7, 0xffffffff, false, 0xffffffff, 0xfc891918, 0xc704dd7b),
];

/** Largest value of a `width`-bit register. */
export const crcMask = (width: number): number => (width === 32 ? 0xffffffff : 2 ** width - 1);

/** Why a parameter set is not a CRC (and which parameter), or null when it is one. */
export function crcParamsProblem(p: CrcParams): { key: keyof CrcParams; message: string } | null {
  if (!Number.isInteger(p.width) || p.width < 1 || p.width > 32) return { key: 'width', message: 'The width must be a whole number of bits from 1 to 32' };
  const max = crcMask(p.width);
  const hex = (v: number) => '0x' + v.toString(16).toUpperCase();
  for (const key of ['poly', 'init', 'xorout'] as const) {
    const v = p[key];
    if (!Number.isInteger(v) || v < 0 || v > max) return { key, message: `${key} must be between 0 and ${hex(max)} for a ${p.width}-bit CRC` };
  }
  if ((p.poly & 1) === 0) {
    return { key: 'poly', message: `The polynomial ${hex(p.poly)} lacks its +1 term (lowest bit); write it in normal form without the top bit (e.g. 0x1021, not the reversed 0x8408)` };
  }
  return null;
}

function reflect(value: number, bits: number): number {
  let out = 0;
  for (let i = 0; i < bits; i++) if (value & (2 ** i)) out += 2 ** (bits - 1 - i);
  return out;
}

/** Returns `(bytes, start, end) => crc` for one valid parameter set; the 256-entry table is built once. */
export function createCrc(params: CrcParams): (bytes: Uint8Array, start?: number, end?: number) => number {
  const { width, refin, refout } = params;
  const mask = crcMask(width);
  const xorout = params.xorout;
  const table = new Uint32Array(256);
  if (refin) {
    // Reflected register, right-aligned: works for any width, the byte is XORed into the low end.
    const rpoly = reflect(params.poly, width);
    for (let i = 0; i < 256; i++) {
      let t = i;
      for (let k = 0; k < 8; k++) t = t & 1 ? (t >>> 1) ^ rpoly : t >>> 1;
      table[i] = t >>> 0;
    }
    const init = reflect(params.init, width);
    const fixOut = refout ? (c: number) => c : (c: number) => reflect(c, width);
    return (bytes, start = 0, end = bytes.length) => {
      let crc = init;
      for (let i = start; i < end; i++) crc = table[(crc ^ bytes[i]!) & 0xff]! ^ (crc >>> 8);
      return ((fixOut(crc >>> 0) ^ xorout) & mask) >>> 0;
    };
  }
  if (width === 8) {
    for (let i = 0; i < 256; i++) {
      let t = i;
      for (let k = 0; k < 8; k++) t = t & 0x80 ? ((t << 1) ^ params.poly) & 0xff : t << 1;
      table[i] = t;
    }
    const fixOut = refout ? (c: number) => reflect(c, 8) : (c: number) => c;
    const init = params.init;
    return (bytes, start = 0, end = bytes.length) => {
      let crc = init;
      for (let i = start; i < end; i++) crc = table[crc ^ bytes[i]!]!;
      return (fixOut(crc) ^ xorout) & mask;
    };
  }
  // Normal register, left-aligned in 32 bits so one loop serves every width from 1 to 32.
  const align = 32 - width;
  const poly = (params.poly << align) >>> 0;
  for (let i = 0; i < 256; i++) {
    let t = (i << 24) >>> 0;
    for (let k = 0; k < 8; k++) t = t & 0x80000000 ? ((t << 1) ^ poly) >>> 0 : (t << 1) >>> 0;
    table[i] = t;
  }
  const init = (params.init << align) >>> 0;
  const fixOut = refout ? (c: number) => reflect(c, width) : (c: number) => c;
  return (bytes, start = 0, end = bytes.length) => {
    let crc = init;
    for (let i = start; i < end; i++) crc = (table[((crc >>> 24) ^ bytes[i]!) & 0xff]! ^ (crc << 8)) >>> 0;
    return ((fixOut(crc >>> align) ^ xorout) & mask) >>> 0;
  };
}
