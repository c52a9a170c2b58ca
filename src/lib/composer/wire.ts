/** Geometry of the wire picture: the engine's bit cells laid out as an SVG step line with labels and time marks. */
import { bitSequence, type BitCell } from '../frame/timing';
import type { LineSettings } from '../frame/port-settings';
import { type Result, success } from '../frame/result';
import { byteGlyph } from './bytes-text';
import { us } from './format';

export interface WireCell extends BitCell {
  x: number;
  width: number;
  /** Short label inside the cell: "idle", "S", "1"/"0" with the bit number below, "P", "stop". */
  label: string;
  sub?: string;
}

export interface WireByte {
  index: number;
  x: number;
  width: number;
  label: string;
}

export interface WireMark {
  x: number;
  label: string;
}

export interface WireLayout {
  width: number;
  height: number;
  /** Waveform as an SVG path. */
  path: string;
  highY: number;
  lowY: number;
  cells: WireCell[];
  bytes: WireByte[];
  marks: WireMark[];
  truncated: boolean;
  shownBytes: number;
  totalUs: number;
}

export const WIRE = { bitWidth: 30, left: 44, right: 12, top: 44, level: 34, labelRow: 22, markRow: 22 };

/** The picture of the first `maxBytes` bytes, or the engine's error for settings it cannot draw. */
export function wireLayout(bytes: Uint8Array, settings: LineSettings, maxBytes = 8): Result<WireLayout> {
  const r = bitSequence(bytes, settings, maxBytes);
  if (!r.ok) return r;
  const seq = r.value;
  const bitUs = 1e6 / settings.baud;
  const px = WIRE.bitWidth / bitUs;
  const highY = WIRE.top;
  const lowY = WIRE.top + WIRE.level;
  const xOf = (t: number) => WIRE.left + t * px;
  const cells: WireCell[] = seq.cells.map((c) => {
    const label = c.kind === 'idle' ? 'idle' : c.kind === 'start' ? 'S' : c.kind === 'parity' ? 'P' : c.kind === 'stop' ? 'stop' : String(c.level);
    const cell: WireCell = { ...c, x: xOf(c.startUs), width: c.durationUs * px, label };
    if (c.kind === 'data') cell.sub = `D${c.bit}`;
    return cell;
  });
  let path = '';
  for (const c of cells) {
    const y = c.level ? highY : lowY;
    path += path ? ` V${y} H${(c.x + c.width).toFixed(1)}` : `M${c.x.toFixed(1)} ${y} H${(c.x + c.width).toFixed(1)}`;
  }
  const byteCells = new Map<number, WireCell[]>();
  for (const c of cells) if (c.byteIndex !== undefined) byteCells.set(c.byteIndex, [...(byteCells.get(c.byteIndex) ?? []), c]);
  const groups: WireByte[] = [...byteCells].map(([index, cs]) => {
    const first = cs[0]!;
    const last = cs[cs.length - 1]!;
    const b = bytes[index]!;
    return { index, x: first.x, width: last.x + last.width - first.x, label: `${b.toString(16).toUpperCase().padStart(2, '0')} ${byteGlyph(b)}` };
  });
  // Time marks count from the first start bit's falling edge (the idle bit before it is not part of the frame).
  const t0 = cells[1]?.startUs ?? 0;
  const marks: WireMark[] = groups.map((g) => ({ x: g.x, label: us(cells.find((c) => c.byteIndex === g.index)!.startUs - t0) }));
  const end = cells[cells.length - 1]!;
  marks.push({ x: end.x, label: us(end.startUs - t0) });
  return success({
    width: Math.ceil(end.x + end.width + WIRE.right),
    height: lowY + WIRE.labelRow + WIRE.markRow + 8,
    path,
    highY,
    lowY,
    cells,
    bytes: groups,
    marks,
    truncated: seq.truncated,
    shownBytes: groups.length,
    totalUs: seq.totalUs,
  });
}
