/**
 * Checksums in generated Structured Text: computed over the bytes the code itself wrote into its byte
 * buffer (reading a character's code back from a STRING is not portable), with bit operations on
 * BYTE/DWORD and sums in DINT, leaving the value in the DWORD `Cv`.
 */
import type { ChecksumAlgorithm } from '../checksum';
import { crcMask } from '../checksum/crc';

/** 16#00A0 style literal of `width` bits (whole nibbles). */
export const hexLiteral = (v: number, digits: number) => '16#' + v.toString(16).toUpperCase().padStart(digits, '0');
const dw = (v: number) => hexLiteral(v >>> 0, 8);

function reflect(value: number, bits: number): number {
  let out = 0;
  for (let i = 0; i < bits; i++) if (value & (2 ** i)) out += 2 ** (bits - 1 - i);
  return out;
}

/** Block checks by catalogue name: how the value follows from the XOR (`X`) or the DINT sum (`Acc`). */
const BLOCK: Record<string, { kind: 'xor' | 'sum'; final: string }> = {
  'XOR-8': { kind: 'xor', final: 'BYTE_TO_DINT(X)' },
  'XOR-8/INVERTED': { kind: 'xor', final: '255 - BYTE_TO_DINT(X)' },
  'XOR-8/TWOS-COMPLEMENT': { kind: 'xor', final: '(256 - BYTE_TO_DINT(X)) MOD 256' },
  'SUM-8': { kind: 'sum', final: 'Acc MOD 256' },
  LRC: { kind: 'sum', final: '(256 - Acc MOD 256) MOD 256' },
  'SUM-8/INVERTED': { kind: 'sum', final: '255 - Acc MOD 256' },
  'SUM-16': { kind: 'sum', final: 'Acc MOD 65536' },
  'SUM-16/TWOS-COMPLEMENT': { kind: 'sum', final: '(65536 - Acc MOD 65536) MOD 65536' },
  'SUM-16/INVERTED': { kind: 'sum', final: '65535 - Acc MOD 65536' },
};

export interface ChecksumCode {
  /** Statements before the byte loop. */
  init: string[];
  /** Statements that take the byte in `Bt` into the checksum. */
  update: string[];
  /** Statements after the loop that leave the value in `Cv` (DWORD). */
  final: string[];
  /** Local variables used: name → type. */
  vars: Record<string, string>;
}

/** The code of one algorithm, or why it is not generated. */
export function checksumCode(a: ChecksumAlgorithm): ChecksumCode | string {
  const block = BLOCK[a.name];
  if (block?.kind === 'xor') {
    return { init: ['X := 16#00;'], update: ['X := X XOR Bt;'], final: [`Cv := DINT_TO_DWORD(${block.final});`], vars: { X: 'BYTE' } };
  }
  if (block?.kind === 'sum') {
    return { init: ['Acc := 0;'], update: ['Acc := Acc + BYTE_TO_DINT(Bt);'], final: [`Cv := DINT_TO_DWORD(${block.final});`], vars: { Acc: 'DINT' } };
  }
  const p = a.params;
  if (a.kind !== 'crc' || !p) return `The checksum ${a.name} has no generated code`;
  const w = p.width;
  const mask = crcMask(w);
  const reflectLoop = [
    'Rf := 16#00000000;',
    `FOR K := 1 TO ${w} DO`,
    '    Rf := SHL(Rf, 1) OR (Crc AND 16#00000001);',
    '    Crc := SHR(Crc, 1);',
    'END_FOR;',
    'Crc := Rf;',
  ];
  const vars: Record<string, string> = { Crc: 'DWORD' };
  if (p.refin) {
    // reflected register, right-aligned: the byte goes into the low end
    const final = [...(p.refout ? [] : (vars.Rf = 'DWORD', reflectLoop)), `Cv := (Crc XOR ${dw(p.xorout)}) AND ${dw(mask)};`];
    return {
      init: [`Crc := ${dw(reflect(p.init, w))};`],
      update: [
        'Crc := Crc XOR BYTE_TO_DWORD(Bt);',
        'FOR K := 1 TO 8 DO',
        '    IF (Crc AND 16#00000001) <> 16#00000000 THEN',
        `        Crc := SHR(Crc, 1) XOR ${dw(reflect(p.poly, w))};`,
        '    ELSE',
        '        Crc := SHR(Crc, 1);',
        '    END_IF;',
        'END_FOR;',
      ],
      final,
      vars,
    };
  }
  // normal register, left-aligned in 32 bits so one loop serves every width
  const align = 32 - w;
  const final = [
    ...(align ? [`Crc := SHR(Crc, ${align});`] : []),
    ...(p.refout ? (vars.Rf = 'DWORD', reflectLoop) : []),
    `Cv := (Crc XOR ${dw(p.xorout)}) AND ${dw(mask)};`,
  ];
  return {
    init: [`Crc := ${dw((p.init * 2 ** align) >>> 0)};`],
    update: [
      'Crc := Crc XOR SHL(BYTE_TO_DWORD(Bt), 24);',
      'FOR K := 1 TO 8 DO',
      '    IF (Crc AND 16#80000000) <> 16#00000000 THEN',
      `        Crc := SHL(Crc, 1) XOR ${dw((p.poly * 2 ** align) >>> 0)};`,
      '    ELSE',
      '        Crc := SHL(Crc, 1);',
      '    END_IF;',
      'END_FOR;',
    ],
    final,
    vars,
  };
}
