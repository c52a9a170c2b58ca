/** One entry point for the five text notations, so callers can pick one by name. */
import type { Result } from '../result';
import { parseEscaped, renderEscaped } from './escaped';
import { parseIec, renderIec, renderIecLiteral } from './iec';
import { parseMnemonic, renderMnemonic } from './mnemonic';
import { parseDecimal, parseHex, renderDecimal, renderHex } from './numeric';

export const NOTATIONS = ['escaped', 'iec', 'mnemonic', 'hex', 'decimal'] as const;
export type Notation = (typeof NOTATIONS)[number];

const PARSERS: Record<Notation, (text: string) => Result<Uint8Array>> = {
  escaped: parseEscaped,
  iec: parseIec,
  mnemonic: parseMnemonic,
  hex: parseHex,
  decimal: parseDecimal,
};

const RENDERERS: Record<Notation, (bytes: Uint8Array) => string> = {
  escaped: renderEscaped,
  iec: renderIec,
  mnemonic: renderMnemonic,
  hex: renderHex,
  decimal: renderDecimal,
};

export function parseNotation(notation: Notation, text: string): Result<Uint8Array> {
  return PARSERS[notation](text);
}

export function renderNotation(notation: Notation, bytes: Uint8Array): string {
  return RENDERERS[notation](bytes);
}

/** The same bytes in every notation; `iecLiteral` is the quoted PLC literal. */
export interface RenderedNotations {
  escaped: string;
  iec: string;
  iecLiteral: string;
  mnemonic: string;
  hex: string;
  decimal: string;
}

export function renderAllNotations(bytes: Uint8Array): RenderedNotations {
  const iec = renderIec(bytes);
  return {
    escaped: renderEscaped(bytes),
    iec,
    iecLiteral: "'" + iec + "'",
    mnemonic: renderMnemonic(bytes),
    hex: renderHex(bytes),
    decimal: renderDecimal(bytes),
  };
}

export { parseEscaped, renderEscaped, parseIec, renderIec, renderIecLiteral, parseMnemonic, renderMnemonic };
export { parseHex, renderHex, parseDecimal, renderDecimal };
