/** Where a reply ends while its bytes arrive: at its terminator, at the reply template's length, or after a silence. */
import { segmentBytes } from '../frame/assemble';
import { indexOfBytes } from '../frame/bytes';
import { hexBytes } from '../frame/schema-common';
import type { PortSettings } from '../frame/port-settings';
import { fixedLength } from '../frame/reply-split';
import type { Template } from '../frame/template';
import { silentIntervals } from '../frame/timing';

export type ReplyEnd = 'terminator' | 'length' | 'silence' | 'timeout' | 'none-expected';

/**
 * Bytes that make one whole frame of `template` when `bytes` starts with it, else null: its terminator (and the
 * fixed-length segments after it, such as a checksum after ETX), or, without a terminator, its length when every
 * segment has a fixed length. Null also when the template cannot tell (a variable-length segment and no terminator).
 */
export function templateFrameEnd(template: Template, bytes: Uint8Array): number | null {
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

/**
 * Bytes that make the whole reply when `bytes` holds it, else null. With a reply template: `templateFrameEnd`.
 * Without a template: the port's frame-rules terminator. Otherwise the reply ends only at a silence
 * (`replySilenceMs`).
 */
export function replyComplete(template: Template | null, settings: PortSettings, bytes: Uint8Array): number | null {
  if (template) return templateFrameEnd(template, bytes);
  const rule = settings.frameRules.terminator ? hexBytes(settings.frameRules.terminator) : new Uint8Array(0);
  if (!rule.length) return null;
  const at = indexOfBytes(bytes, rule);
  return at >= 0 ? at + rule.length : null;
}

/**
 * The replies to a sequence sent as one string, arriving back to back: `whole` is where the last expected reply
 * ends once every step that expects one (`replies[i]` not null) has its whole reply, in step order; else null,
 * with `between` true when the bytes so far end exactly where one step's reply ends and the next has not begun
 * (the device is working on the next step: wait for it as for a first byte, not for a silence).
 */
export function stepsReplyProgress(replies: readonly (Template | null)[], bytes: Uint8Array): { whole: number | null; between: boolean } {
  let at = 0;
  for (const t of replies) {
    if (!t) continue;
    const n = templateFrameEnd(t, bytes.subarray(at));
    if (n === null) return { whole: null, between: at > 0 && at === bytes.length };
    at += n;
  }
  return { whole: at, between: false };
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
