/** Where a reply ends while its bytes arrive: at its terminator, at the reply template's length, or after a silence. */
import { segmentBytes } from '../frame/assemble';
import { indexOfBytes } from '../frame/bytes';
import { hexBytes } from '../frame/schema-common';
import type { PortSettings } from '../frame/port-settings';
import { fixedLength } from '../frame/reply-split';
import type { Template } from '../frame/template';
import { silentIntervals } from '../frame/timing';

export type ReplyEnd = 'terminator' | 'length' | 'silence' | 'timeout';

/**
 * Bytes that make the whole reply when `bytes` holds it, else null. With a reply template: its terminator
 * (and the fixed-length segments after it, such as a checksum after ETX), or, without a terminator, its length
 * when every segment has a fixed length. Without a template: the port's frame-rules terminator. Otherwise the
 * reply ends only at a silence (`replySilenceMs`).
 */
export function replyComplete(template: Template | null, settings: PortSettings, bytes: Uint8Array): number | null {
  if (template) {
    const segs = template.segments;
    const t = segs.findIndex((s) => s.type === 'terminator');
    if (t >= 0) {
      let after = 0;
      for (const s of segs.slice(t + 1)) {
        const n = fixedLength(s);
        if (n === undefined) return null;
        after += n;
      }
      const term = segmentBytes(segs[t] as { bytes: string });
      const at = term.length ? indexOfBytes(bytes, term) : -1;
      return at >= 0 && bytes.length >= at + term.length + after ? at + term.length + after : null;
    }
    let total = 0;
    for (const s of segs) {
      const n = fixedLength(s);
      if (n === undefined) return null;
      total += n;
    }
    return total > 0 && bytes.length >= total ? total : null;
  }
  const rule = settings.frameRules.terminator ? hexBytes(settings.frameRules.terminator) : new Uint8Array(0);
  if (!rule.length) return null;
  const at = indexOfBytes(bytes, rule);
  return at >= 0 ? at + rule.length : null;
}

/** A browser receives a USB adapter's bytes in chunks a few milliseconds apart, so no gap shorter than this is timed. */
export const MIN_BROWSER_SILENCE_MS = 20;

/**
 * Milliseconds of silence after the last byte that end a reply: the port's inter-character timeout when set,
 * else the silent interval between frames (3.5 character times, Modbus serial line guide 2.5.1.1), never less
 * than MIN_BROWSER_SILENCE_MS.
 */
export function replySilenceMs(settings: PortSettings): number {
  const gap = settings.interCharTimeoutMs > 0 ? settings.interCharTimeoutMs : silentIntervals(settings).interFrameGapMs;
  return Math.max(MIN_BROWSER_SILENCE_MS, gap);
}
