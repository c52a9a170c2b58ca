/**
 * Table-driven CRC engine over the parametrised model of the "Catalogue of parametrised CRC
 * algorithms" (CRC RevEng): width, poly, init, refin, refout, xorout; `check` is the CRC of the
 * ASCII string "123456789".
 *
 * The engine is written here rather than taken from a package because the only CRC package in the
 * project is a development dependency; the tests cross-check every model against it.
 */

export interface CrcParams {
  width: 8 | 16 | 32;
  poly: number;
  init: number;
  refin: boolean;
  refout: boolean;
  xorout: number;
}

export interface CrcModel extends CrcParams {
  /** Catalogue name, e.g. `CRC-16/MODBUS`. */
  name: string;
  aliases: readonly string[];
  check: number;
}

/** The supported models, parameters as listed in the catalogue. */
export const CRC_MODELS: readonly CrcModel[] = [
  { name: 'CRC-8/SMBUS', aliases: ['CRC-8'], width: 8, poly: 0x07, init: 0x00, refin: false, refout: false, xorout: 0x00, check: 0xf4 },
  { name: 'CRC-8/MAXIM-DOW', aliases: ['CRC-8/MAXIM'], width: 8, poly: 0x31, init: 0x00, refin: true, refout: true, xorout: 0x00, check: 0xa1 },
  { name: 'CRC-16/MODBUS', aliases: ['MODBUS'], width: 16, poly: 0x8005, init: 0xffff, refin: true, refout: true, xorout: 0x0000, check: 0x4b37 },
  { name: 'CRC-16/ARC', aliases: ['CRC-16', 'CRC-IBM', 'ARC'], width: 16, poly: 0x8005, init: 0x0000, refin: true, refout: true, xorout: 0x0000, check: 0xbb3d },
  { name: 'CRC-16/XMODEM', aliases: ['XMODEM', 'ZMODEM', 'CRC-16/V-41-MSB'], width: 16, poly: 0x1021, init: 0x0000, refin: false, refout: false, xorout: 0x0000, check: 0x31c3 },
  { name: 'CRC-16/IBM-3740', aliases: ['CRC-16/CCITT-FALSE'], width: 16, poly: 0x1021, init: 0xffff, refin: false, refout: false, xorout: 0x0000, check: 0x29b1 },
  { name: 'CRC-16/KERMIT', aliases: ['CRC-16/CCITT', 'CRC-CCITT', 'CRC-16/CCITT-TRUE', 'CRC-16/V-41-LSB', 'KERMIT'], width: 16, poly: 0x1021, init: 0x0000, refin: true, refout: true, xorout: 0x0000, check: 0x2189 },
  { name: 'CRC-32/ISO-HDLC', aliases: ['CRC-32', 'CRC-32/ADCCP', 'CRC-32/V-42'], width: 32, poly: 0x04c11db7, init: 0xffffffff, refin: true, refout: true, xorout: 0xffffffff, check: 0xcbf43926 },
];

function reflect(value: number, bits: number): number {
  let out = 0;
  for (let i = 0; i < bits; i++) if (value & (2 ** i)) out += 2 ** (bits - 1 - i);
  return out;
}

/** Returns `(bytes, start, end) => crc` for one parameter set; the 256-entry table is built once. */
export function createCrc(params: CrcParams): (bytes: Uint8Array, start?: number, end?: number) => number {
  const { width, refin, refout } = params;
  const mask = width === 32 ? 0xffffffff : (1 << width) - 1;
  const table = new Uint32Array(256);
  if (refin) {
    const rpoly = reflect(params.poly, width);
    for (let i = 0; i < 256; i++) {
      let t = i;
      for (let k = 0; k < 8; k++) t = t & 1 ? (t >>> 1) ^ rpoly : t >>> 1;
      table[i] = t >>> 0;
    }
    const init = reflect(params.init, width);
    const fixOut = refout ? (c: number) => c : (c: number) => reflect(c, width);
    const xorout = params.xorout;
    return (bytes, start = 0, end = bytes.length) => {
      let crc = init;
      for (let i = start; i < end; i++) crc = table[(crc ^ bytes[i]!) & 0xff]! ^ (crc >>> 8);
      return ((fixOut(crc >>> 0) ^ xorout) & mask) >>> 0;
    };
  }
  const shift = width - 8;
  const top = 2 ** (width - 1);
  for (let i = 0; i < 256; i++) {
    let t = i * 2 ** shift;
    for (let k = 0; k < 8; k++) t = t >= top ? (((t - top) * 2) ^ params.poly) >>> 0 : t * 2;
    table[i] = (t & mask) >>> 0;
  }
  const fixOut = refout ? (c: number) => reflect(c, width) : (c: number) => c;
  const init = params.init;
  const xorout = params.xorout;
  if (width === 8) {
    return (bytes, start = 0, end = bytes.length) => {
      let crc = init;
      for (let i = start; i < end; i++) crc = table[crc ^ bytes[i]!]!;
      return (fixOut(crc) ^ xorout) & mask;
    };
  }
  return (bytes, start = 0, end = bytes.length) => {
    let crc = init;
    for (let i = start; i < end; i++) crc = (table[((crc >>> shift) ^ bytes[i]!) & 0xff]! ^ (crc << 8)) & mask;
    return ((fixOut(crc >>> 0) ^ xorout) & mask) >>> 0;
  };
}
