/** Checks a built frame against a device's frame rules and the line's data bits. */
import { HEX_PAIR, bytesAt, indexOfBytes, toHex } from './bytes';
import type { SegmentSpan } from './assemble';
import type { Finding, FindingCode, Severity } from './findings';
import type { FrameRulesInput } from './frame-rules';
import { hexBytes } from './schema-common';

/** At most this many findings per code; a frame full of one mistake needs one message, not hundreds. */
const MAX_PER_CODE = 8;

const FORBIDDEN = 1;
const OUTSIDE_SET = 2;
const WRONG_CASE = 4;
const FLAGS = [FORBIDDEN, OUTSIDE_SET, WRONG_CASE] as const;

interface Compiled {
  table: Uint8Array;
  start: Uint8Array;
  terminator: Uint8Array | undefined;
}

const compiledCache = new WeakMap<object, Compiled>();

function compile(rules: FrameRulesInput): Compiled {
  const cached = compiledCache.get(rules);
  if (cached) return cached;
  const table = new Uint8Array(256);
  for (const b of hexBytes(rules.forbidden)) table[b]! |= FORBIDDEN;
  const set = rules.byteSet ?? '8-bit';
  for (let b = 0; b < 256; b++) {
    if ((set === 'printable' && (b < 0x20 || b > 0x7e)) || (set === '7-bit' && b > 0x7f)) table[b]! |= OUTSIDE_SET;
    if (rules.letterCase === 'upper' && b >= 0x61 && b <= 0x7a) table[b]! |= WRONG_CASE;
    if (rules.letterCase === 'lower' && b >= 0x41 && b <= 0x5a) table[b]! |= WRONG_CASE;
  }
  const compiled = { table, start: hexBytes(rules.start), terminator: rules.terminator ? hexBytes(rules.terminator) : undefined };
  compiledCache.set(rules, compiled);
  return compiled;
}

const where = (s: number, e: number) => (e - s === 1 ? `position ${s}` : `positions ${s}-${e - 1}`);

/**
 * Findings for one frame. `segments` (from `assembleFrame`) locates the terminator segment and the
 * address field; `port.dataBits` enables the data-bits check. Payload = after the start bytes, before the terminator.
 */
export function checkFrame(
  bytes: Uint8Array,
  segments: readonly SegmentSpan[] | undefined,
  rules: FrameRulesInput = {},
  port?: { dataBits: number },
): Finding[] {
  const findings: Finding[] = [];
  let counts: Partial<Record<FindingCode, number>> | undefined;
  const add = (severity: Severity, code: FindingCode, message: string, range?: [number, number]) => {
    counts ??= {};
    const n = counts[code] ?? 0;
    if (n >= MAX_PER_CODE) return;
    counts[code] = n + 1;
    findings.push(range ? { severity, code, message, range } : { severity, code, message });
  };
  const len = bytes.length;
  if (len === 0) add('warning', 'empty-frame', 'The frame is empty; add the command text.');
  const c = compile(rules);

  let payloadStart = 0;
  if (c.start.length) {
    if (bytesAt(bytes, c.start, 0)) payloadStart = c.start.length;
    else add('error', 'missing-start', `The frame must begin with ${toHex(c.start)}; add it as the first segment.`, [0, Math.min(len, c.start.length)]);
  }

  let payloadEnd = len;
  const termSpan = segments?.find((s) => s.type === 'terminator');
  const terminator = c.terminator ?? (termSpan ? bytes.subarray(termSpan.start, termSpan.end) : undefined);
  if (terminator && terminator.length) {
    const at = termSpan ? termSpan.start : len - terminator.length;
    if (bytesAt(bytes, terminator, at)) payloadEnd = at;
    else add('error', 'missing-terminator', `The frame does not end with the terminator ${toHex(terminator)}; add a terminator segment with ${toHex(terminator)} so the device knows the command is complete.`);
  }
  payloadEnd = Math.max(payloadEnd, payloadStart);

  if (terminator && terminator.length) {
    for (let i = indexOfBytes(bytes, terminator, payloadStart, payloadEnd); i >= 0; i = indexOfBytes(bytes, terminator, i + terminator.length, payloadEnd)) {
      add('error', 'terminator-in-payload', `Bytes ${toHex(terminator)} at ${where(i, i + terminator.length)} are the terminator; the device will cut the frame there. Remove them from the payload or send that value as ASCII hex.`, [i, i + terminator.length]);
    }
  }
  if (c.start.length) {
    for (let i = indexOfBytes(bytes, c.start, payloadStart, payloadEnd); i >= 0; i = indexOfBytes(bytes, c.start, i + c.start.length, payloadEnd)) {
      add('error', 'start-in-payload', `Bytes ${toHex(c.start)} at ${where(i, i + c.start.length)} are the start sequence; the device will restart the frame there. Remove them from the payload.`, [i, i + c.start.length]);
    }
  }

  const table = c.table;
  let any = 0;
  for (let i = payloadStart; i < payloadEnd; i++) any |= table[bytes[i]!]!;
  for (const flag of FLAGS) {
    if ((any & flag) === 0) continue;
    let run = -1;
    for (let i = payloadStart; i <= payloadEnd; i++) {
      const hit = i < payloadEnd && (table[bytes[i]!]! & flag) !== 0;
      if (hit && run < 0) run = i;
      if (!hit && run >= 0) {
        const r: [number, number] = [run, i];
        const first = HEX_PAIR[bytes[run]!];
        if (flag === FORBIDDEN) add('error', 'forbidden-byte', `Byte ${first} at ${where(run, i)} is not allowed inside this device's frames; remove it.`, r);
        else if (flag === OUTSIDE_SET) {
          const set = rules.byteSet === 'printable' ? 'printable ASCII (20-7E)' : '7-bit ASCII (00-7F)';
          add('error', 'byte-outside-set', `Byte ${first} at ${where(run, i)} is outside ${set}, which this device accepts; send binary values as ASCII hex or decimal instead.`, r);
        } else {
          const want = rules.letterCase === 'upper' ? 'uppercase' : 'lowercase';
          add('warning', 'wrong-case', `Letters at ${where(run, i)} are not ${want}; this device expects ${want} commands. Change the text or set the field's case to ${rules.letterCase}.`, r);
        }
        run = -1;
      }
    }
  }

  if (port && port.dataBits < 8) {
    const max = (1 << port.dataBits) - 1;
    for (let i = 0; i < len; i++) {
      if (bytes[i]! > max) {
        add('error', 'byte-exceeds-data-bits', `Byte ${HEX_PAIR[bytes[i]!]} at position ${i} needs more than ${port.dataBits} data bits; the top bits will be lost on the line. Use 8 data bits or keep bytes at ${HEX_PAIR[max]} and below.`, [i, i + 1]);
      }
    }
  }

  if (rules.maxLength !== undefined && len > rules.maxLength) {
    add('error', 'frame-too-long', `The frame is ${len} bytes; this device accepts at most ${rules.maxLength}. Shorten the text fields or split the command.`, [rules.maxLength, len]);
  }

  if (rules.addressRange && segments) {
    const name = rules.addressField ?? 'address';
    const span = segments.find((s) => s.name === name);
    if (span && typeof span.value === 'number') {
      const { min, max } = rules.addressRange;
      if (span.value < min || span.value > max) {
        add('error', 'address-out-of-range', `Address ${span.value} is outside ${min}-${max}; set the device address within that range.`, [span.start, span.end]);
      }
    }
  }
  return findings;
}
