/**
 * A simulated device built from a command library: it recognises each request by decoding it against the
 * library's templates and answers with the command's reply template, assembled from values you set, after a
 * response delay. Faults on demand: no reply, a bad checksum, the wrong terminator. When the opener's framing
 * differs from the simulator's, what comes back is what a UART at the opener's framing reads from the reply's
 * bit stream (`receiveAs`): garbage with framing and parity errors, not silence. Pure; no timers (the fake
 * serial port schedules what this returns).
 */
import { assembleFrame } from '../frame/assemble';
import { decodeReply } from '../frame/decode-reply';
import type { LineSettings } from '../frame/port-settings';
import { isField, type FieldValues, type Template } from '../frame/template';
import { charTimeMs } from '../frame/timing';
import { templateFrameEnd } from './reply-end';
import { type ReceivedChar, receiveAs, sameFraming } from './uart';

export interface SimulatedCommand {
  id: string;
  name: string;
  template: Template;
  replyTemplate: Template | null;
  /**
   * A setup command: after answering it (or staying silent, without a reply template), the simulator takes on the
   * request's fields named `baud`, `dataBits`, `parity` and `stopBits` (those it has) as its own framing, as a
   * device does once its line settings are written.
   */
  setsUpDevice?: boolean;
}

export const SIMULATOR_FAULTS = ['none', 'no-reply', 'bad-checksum', 'wrong-terminator'] as const;
export type SimulatorFault = (typeof SIMULATOR_FAULTS)[number];

export const SIMULATOR_FAULT_LABELS: Record<SimulatorFault, string> = {
  none: 'Answers correctly',
  'no-reply': 'Never answers',
  'bad-checksum': 'Answers with a bad checksum',
  'wrong-terminator': 'Answers with the wrong terminator',
};

export interface SimulatorSettings {
  /** The simulator's own framing (the device's settings). */
  line: LineSettings;
  commands: readonly SimulatedCommand[];
  /** Reply field values per command id, laid over the reply template's defaults and the request's fields of the same name. */
  replyValues?: Record<string, FieldValues>;
  /** Milliseconds from the end of the request to the first byte of the reply (default 5). */
  responseDelayMs?: number;
  fault?: SimulatorFault;
  /**
   * When true (default), the simulator recognises a request whatever framing it came at, so a framing
   * mismatch shows as garbage coming back. When false it reads the request through its own UART first, and a
   * request garbled by a mismatch goes unanswered, as most real devices do.
   */
  hearsAnyFraming?: boolean;
}

export interface SimulatorAnswer {
  /** The library command the request was recognised as, or null. */
  command: { id: string; name: string } | null;
  /** Why there is no reply, in words (null when there is one). */
  silence: string | null;
  /** The reply as the simulator sends it, at its own framing (empty when silent). */
  sent: Uint8Array;
  /** What the opener's UART reads from it: bytes, errors, and when each byte completes (µs from the first bit). */
  received: ReceivedChar[];
  /** Milliseconds from the end of the request to the reply's first bit. */
  delayMs: number;
  /** Milliseconds the reply lasts on the wire at the simulator's framing. */
  replyWireMs: number;
  framingErrors: number;
  parityErrors: number;
  /** The simulator's framing from the next request on, when a setup command changed it; null otherwise. */
  lineAfter: LineSettings | null;
}

const PARITY_VALUES: readonly string[] = ['none', 'even', 'odd', 'mark', 'space'];

/** The framing a setup command's fields write over `line`, or null when it names none of them (or no valid value). */
export function lineFromSetup(line: LineSettings, values: FieldValues): LineSettings | null {
  const next = { ...line };
  const num = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN);
  const baud = num(values.baud);
  if (Number.isInteger(baud) && baud > 0) next.baud = baud;
  const dataBits = num(values.dataBits);
  if ([5, 6, 7, 8].includes(dataBits)) next.dataBits = dataBits as LineSettings['dataBits'];
  const stopBits = num(values.stopBits);
  if ([1, 1.5, 2].includes(stopBits)) next.stopBits = stopBits as LineSettings['stopBits'];
  if (typeof values.parity === 'string' && PARITY_VALUES.includes(values.parity)) next.parity = values.parity as LineSettings['parity'];
  return sameFraming(next, line) ? null : next;
}

/** Which library command `request` is: the first whose template decodes it without an error, with the request's field values. */
export function recognise(commands: readonly SimulatedCommand[], request: Uint8Array): { command: SimulatedCommand; values: FieldValues } | null {
  for (const command of commands) {
    const decoded = decodeReply(command.template, request);
    if (!decoded.ok) continue;
    const values: FieldValues = {};
    for (const [name, f] of Object.entries(decoded.fields)) if (f.value !== undefined) values[name] = f.value;
    return { command, values };
  }
  return null;
}

const HEX_NEXT: Record<number, number> = {};
for (const digits of ['0123456789', 'ABCDEF', 'abcdef']) {
  for (let i = 0; i < digits.length; i++) HEX_NEXT[digits.charCodeAt(i)] = digits.charCodeAt((i + 1) % digits.length);
}

/** The reply with its first checksum changed by one (a hex or decimal digit moved on, a binary byte's lowest bit flipped). */
function spoilChecksum(bytes: Uint8Array, template: Template, segments: ReturnType<typeof assembleFrame>['segments']): Uint8Array {
  const span = segments.find((s) => s.type === 'checksum' && s.end > s.start);
  if (!span) return bytes;
  const seg = template.segments[span.index];
  const out = bytes.slice();
  const at = span.end - 1;
  out[at] = seg?.type === 'checksum' && seg.encoding !== 'binary' ? (HEX_NEXT[out[at]!] ?? out[at]! ^ 1) : out[at]! ^ 1;
  return out;
}

/** The reply with another terminator: CR ↔ LF, anything else becomes CR. */
function swapTerminator(bytes: Uint8Array, segments: ReturnType<typeof assembleFrame>['segments']): Uint8Array {
  const span = segments.find((s) => s.type === 'terminator');
  if (!span) return bytes;
  const out = bytes.slice();
  for (let i = span.start; i < span.end; i++) out[i] = out[i] === 0x0d ? 0x0a : 0x0d;
  return out;
}

/**
 * The reply template's values: a field without a default starts at 0 (or its minimum above 0), its first choice,
 * or empty text, so the reply is always whole; then the template's defaults; then the request's fields of the
 * same name (the address); then the values set (an empty value leaves the one before).
 */
export function replyFieldValues(reply: Template, fromRequest: FieldValues, set: FieldValues | undefined): FieldValues {
  const values: FieldValues = {};
  for (const f of reply.segments.filter(isField)) {
    if (f.default !== undefined) continue;
    if (f.type === 'choice') values[f.name] = f.options[0]?.value ?? '';
    else if (f.type === 'text') values[f.name] = '';
    else values[f.name] = f.min !== undefined && f.min > 0 ? f.min : f.max !== undefined && f.max < 0 ? f.max : 0;
  }
  for (const [k, v] of Object.entries(fromRequest)) if (reply.segments.some((f) => isField(f) && f.name === k)) values[k] = v;
  for (const [k, v] of Object.entries(set ?? {})) if (v !== '' && v !== null && v !== undefined) values[k] = v;
  return values;
}

function silent(command: SimulatedCommand | null, reason: string, delayMs: number, lineAfter: LineSettings | null = null): SimulatorAnswer {
  return {
    command: command && { id: command.id, name: command.name }, silence: reason, sent: new Uint8Array(0), received: [],
    delayMs, replyWireMs: 0, framingErrors: 0, parityErrors: 0, lineAfter,
  };
}

/** What the simulator does with one request written at `opener`'s framing. */
export function answer(settings: SimulatorSettings, request: Uint8Array, opener: LineSettings): SimulatorAnswer {
  const delayMs = Math.max(0, settings.responseDelayMs ?? 5);
  let heard = request;
  if (settings.hearsAnyFraming === false && !sameFraming(opener, settings.line)) {
    const r = receiveAs(request, opener, settings.line);
    heard = r.ok ? r.value.bytes : new Uint8Array(0);
  }
  const match = recognise(settings.commands, heard);
  if (!match) return silent(null, 'The request matches no command of the library.', delayMs);
  const { command, values } = match;
  const fault = settings.fault ?? 'none';
  // A device that never answers may still have heard; one that did not recognise the request changes nothing.
  const lineAfter = command.setsUpDevice ? lineFromSetup(settings.line, values) : null;
  if (!command.replyTemplate) return silent(command, `"${command.name}" has no reply template, so the simulator does not answer it.`, delayMs, lineAfter);
  if (fault === 'no-reply') return silent(command, 'The simulator is set never to answer.', delayMs, lineAfter);
  const frame = assembleFrame(command.replyTemplate, replyFieldValues(command.replyTemplate, values, settings.replyValues?.[command.id]));
  let sent = frame.bytes;
  if (fault === 'bad-checksum') sent = spoilChecksum(sent, command.replyTemplate, frame.segments);
  if (fault === 'wrong-terminator') sent = swapTerminator(sent, frame.segments);
  const read = receiveAs(sent, settings.line, opener);
  if (!read.ok) return silent(command, read.error.message, delayMs, lineAfter);
  return {
    command: { id: command.id, name: command.name }, silence: null, sent, received: read.value.chars, delayMs,
    replyWireMs: sent.length * charTimeMs(settings.line), framingErrors: read.value.framingErrors, parityErrors: read.value.parityErrors, lineAfter,
  };
}

/**
 * The requests in one write, as a device that reads one command per terminator takes them (a sequence sent as
 * one string): from the start, the shortest frame a library template both completes (`templateFrameEnd`) and
 * recognises; failing that, the bytes up to the first terminator of any library template (a request the
 * device does not know); failing that, the rest as one request.
 */
export function splitRequests(commands: readonly SimulatedCommand[], bytes: Uint8Array): Uint8Array[] {
  const out: Uint8Array[] = [];
  let rest = bytes;
  while (rest.length) {
    let end: number | null = null;
    for (const c of commands) {
      const n = templateFrameEnd(c.template, rest);
      if (n !== null && n > 0 && (end === null || n < end) && decodeReply(c.template, rest.subarray(0, n)).ok) end = n;
    }
    if (end === null) {
      for (const c of commands) {
        if (!c.template.segments.some((s) => s.type === 'terminator')) continue;
        const n = templateFrameEnd(c.template, rest);
        if (n !== null && n > 0 && (end === null || n < end)) end = n;
      }
    }
    if (end === null || end >= rest.length) {
      out.push(rest);
      break;
    }
    out.push(rest.subarray(0, end));
    rest = rest.subarray(end);
  }
  return out;
}

/** One request of a write and the simulator's answer to it; `end` is where the request ends in the write (bytes). */
export interface WriteAnswer {
  request: Uint8Array;
  end: number;
  answer: SimulatorAnswer;
}

/**
 * What the simulator does with one write: each request in it (`splitRequests`) answered in turn, a setup
 * command's new framing applying to the requests after it. Garbled bytes (a framing mismatch with
 * `hearsAnyFraming: false`) are split as the simulator's own UART reads them.
 */
export function answerWrite(settings: SimulatorSettings, bytes: Uint8Array, opener: LineSettings): WriteAnswer[] {
  if (settings.hearsAnyFraming === false && !sameFraming(opener, settings.line)) {
    return [{ request: bytes, end: bytes.length, answer: answer(settings, bytes, opener) }];
  }
  let sim = settings;
  let end = 0;
  return splitRequests(settings.commands, bytes).map((request) => {
    const a = answer(sim, request, opener);
    if (a.lineAfter) sim = { ...sim, line: a.lineAfter };
    end += request.length;
    return { request, end, answer: a };
  });
}
