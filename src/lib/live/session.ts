/**
 * One open live link: the port opened with the stored settings, a read loop that survives framing and parity
 * errors (Web Serial replaces `readable` after them), exchanges of one request and its reply, control lines, and
 * the exchange log of everything in both directions with millisecond timestamps. Works with a real Web Serial
 * port or the fake one; the clock is passed in so tests can use their own.
 */
import type { PortSettings } from '../frame/port-settings';
import type { Template } from '../frame/template';
import { lineTiming } from '../frame/timing';
import { replyComplete, replySilenceMs, stepsReplyProgress, type ReplyEnd } from './reply-end';
import { type InputSignals, type LinkOpenOptions, type OutputSignals, type SerialPortLike, isRecoverableReadError, openPlan } from './serial';

export type ExchangeLogEntry =
  | { kind: 'sent'; atMs: number; bytes: Uint8Array; label: string }
  | { kind: 'received'; atMs: number; bytes: Uint8Array }
  | { kind: 'line-error'; atMs: number; error: string }
  | { kind: 'note'; atMs: number; text: string };

export interface Exchange {
  label: string;
  request: Uint8Array;
  reply: Uint8Array;
  endedBy: ReplyEnd;
  /** Milliseconds from handing the request to the port to the reply's last byte (null without a reply). */
  roundTripMs: number | null;
  /** Request and reply time on the wire at the port's settings (what the line alone takes). */
  wireMs: number;
  /** Framing, parity, break or overrun errors while the reply arrived. */
  lineErrors: string[];
}

/** The replies of a sequence sent as one string: each step's reply template in step order, null for a step that expects none. */
export interface StepReplies {
  steps: readonly (Template | null)[];
}

export interface ExchangeOptions {
  /** Milliseconds to wait for the first byte after the request's own time on the wire (default: the port's response timeout). */
  timeoutMs?: number;
  /**
   * False: no reply is expected (a sequence step without a reply template). The exchange then waits only for the
   * request's time on the wire and a silence, keeps whatever arrives meanwhile, and ends `none-expected` when nothing did.
   */
  expectReply?: boolean;
}

interface Pending {
  label: string;
  request: Uint8Array;
  template: Template | null;
  steps: StepReplies | null;
  timeoutMs: number;
  startMs: number;
  chunks: number[];
  lastMs: number | null;
  lineErrors: string[];
  timer: ReturnType<typeof setTimeout> | null;
  done: (e: Exchange) => void;
}

/** The one wording of a line error, everywhere it is shown. */
export const LINE_ERROR_TEXT = 'Bytes arrived with framing errors: check baud and parity.';

export class LiveLink {
  readonly exchangeLog: ExchangeLogEntry[] = [];
  readonly openedAt: Date;
  readonly options: LinkOpenOptions;
  readonly warnings: string[];
  private reading = true;
  private pending: Pending | null = null;
  private listeners = new Set<() => void>();
  private reader: ReadableStreamDefaultReader<Uint8Array> | null = null;
  private loop: Promise<void> = Promise.resolve();

  private constructor(
    private readonly port: SerialPortLike,
    readonly settings: PortSettings,
    private readonly now: () => number,
    plan: { options: LinkOpenOptions; warnings: string[] },
    private readonly startMs: number,
  ) {
    this.options = plan.options;
    this.warnings = plan.warnings;
    this.openedAt = new Date();
  }

  /** Opens `port` with the settings, or throws an Error whose message lists why they cannot be opened. */
  static async open(port: SerialPortLike, settings: PortSettings, now: () => number = () => performance.now()): Promise<LiveLink> {
    const plan = openPlan(settings);
    if (!plan.ok) throw new Error(plan.problems.join(' '));
    await port.open(plan.options);
    const link = new LiveLink(port, settings, now, plan, now());
    link.loop = link.readLoop();
    return link;
  }

  /** Milliseconds since the link opened. */
  elapsed(): number {
    return this.now() - this.startMs;
  }

  subscribe(fn: () => void): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  private changed() {
    for (const fn of this.listeners) fn();
  }

  note(text: string) {
    this.exchangeLog.push({ kind: 'note', atMs: this.elapsed(), text });
    this.changed();
  }

  private async readLoop(): Promise<void> {
    while (this.reading && this.port.readable) {
      const reader = this.port.readable.getReader();
      this.reader = reader;
      try {
        for (;;) {
          const { value, done } = await reader.read();
          if (done) return;
          if (value?.length) this.received(value);
        }
      } catch (e) {
        if (!this.reading) return;
        if (isRecoverableReadError(e)) this.lineError(e.name);
        else {
          this.note(`The port stopped: ${e instanceof Error ? e.message : String(e)}`);
          return;
        }
      } finally {
        reader.releaseLock();
        this.reader = null;
      }
    }
  }

  private received(bytes: Uint8Array) {
    const atMs = this.elapsed();
    this.exchangeLog.push({ kind: 'received', atMs, bytes: Uint8Array.from(bytes) });
    const p = this.pending;
    if (p) {
      p.chunks.push(...bytes);
      p.lastMs = atMs;
      const got = Uint8Array.from(p.chunks);
      if (p.steps) {
        const progress = stepsReplyProgress(p.steps.steps, got);
        const last = [...p.steps.steps].reverse().find((t) => t) ?? null;
        if (progress.whole !== null) this.finish(p, last?.segments.some((s) => s.type === 'terminator') ? 'terminator' : 'length');
        // One step's reply is whole and the device is working on the next: wait for it as for a first byte.
        else if (progress.between) this.arm(p, p.timeoutMs, 'silence');
        else this.arm(p, replySilenceMs(this.settings), 'silence');
      } else {
        const whole = replyComplete(p.template, this.settings, got);
        if (whole !== null) this.finish(p, p.template?.segments.some((s) => s.type === 'terminator') || (!p.template && this.settings.frameRules.terminator) ? 'terminator' : 'length');
        else this.arm(p, replySilenceMs(this.settings), 'silence');
      }
    }
    this.changed();
  }

  private lineError(name: string) {
    const error = name === 'ParityError' || name === 'FramingError' ? LINE_ERROR_TEXT : name === 'BreakError' ? 'The line was held at space (a break).' : 'The receive buffer overflowed; bytes were lost.';
    this.exchangeLog.push({ kind: 'line-error', atMs: this.elapsed(), error: `${name}: ${error}` });
    this.pending?.lineErrors.push(name);
    this.changed();
  }

  private arm(p: Pending, ms: number, endedBy: ReplyEnd) {
    if (p.timer) clearTimeout(p.timer);
    p.timer = setTimeout(() => this.finish(p, endedBy), ms);
  }

  private finish(p: Pending, endedBy: ReplyEnd) {
    if (this.pending !== p) return;
    if (p.timer) clearTimeout(p.timer);
    this.pending = null;
    const reply = Uint8Array.from(p.chunks);
    const t = lineTiming(this.settings, p.request.length, reply.length);
    p.done({
      label: p.label, request: p.request, reply, endedBy: reply.length || endedBy === 'none-expected' ? endedBy : 'timeout',
      roundTripMs: p.lastMs === null ? null : p.lastMs - p.startMs, wireMs: t.frameTimeMs + t.replyTimeMs, lineErrors: p.lineErrors,
    });
    this.changed();
  }

  get busy(): boolean {
    return this.pending !== null;
  }

  /**
   * Sends `request` and waits for its reply: until the reply is whole (terminator or length), until a silence
   * after its last byte, or until the response timeout passes without a byte (after the request's own time on
   * the wire). `reply` is the reply template, or for a sequence sent as one string each step's (`StepReplies`):
   * the reply is whole when every step that expects one has its whole reply, in order.
   */
  async exchange(request: Uint8Array, label: string, reply: Template | StepReplies | null, options: ExchangeOptions = {}): Promise<Exchange> {
    if (this.pending) throw new Error('Wait for the reply to the last request first.');
    const writable = this.port.writable;
    if (!writable) throw new Error('The port is closed.');
    const steps = reply && 'steps' in reply ? reply : null;
    const template = reply && !('steps' in reply) ? reply : null;
    const expectReply = options.expectReply !== false && (!steps || steps.steps.some((t) => t));
    const timeoutMs = options.timeoutMs ?? this.settings.responseTimeoutMs;
    const bytes = Uint8Array.from(request);
    const startMs = this.elapsed();
    let done: (e: Exchange) => void = () => undefined;
    const result = new Promise<Exchange>((resolve) => { done = resolve; });
    const p: Pending = { label, request: bytes, template, steps: expectReply ? steps : null, timeoutMs, startMs, chunks: [], lastMs: null, lineErrors: [], timer: null, done };
    this.pending = p;
    this.exchangeLog.push({ kind: 'sent', atMs: startMs, bytes, label });
    this.changed();
    const writer = writable.getWriter();
    try {
      await writer.write(bytes);
    } finally {
      writer.releaseLock();
    }
    if (this.pending === p && p.chunks.length === 0) {
      const onWire = lineTiming(this.settings, bytes.length).frameTimeMs;
      if (expectReply) this.arm(p, timeoutMs + onWire, 'timeout');
      else this.arm(p, onWire + replySilenceMs(this.settings), 'none-expected');
    }
    return result;
  }

  async setSignals(signals: OutputSignals): Promise<void> {
    await this.port.setSignals(signals);
    const said = Object.entries(signals).map(([k, v]) => `${k === 'dataTerminalReady' ? 'DTR' : k === 'requestToSend' ? 'RTS' : 'break'} ${v ? 'on' : 'off'}`).join(', ');
    this.note(`Set ${said}.`);
  }

  getSignals(): Promise<InputSignals> {
    return this.port.getSignals();
  }

  /** Closes the port once; later calls do nothing (the port may have been opened again by another link). */
  async close(): Promise<void> {
    if (!this.reading) return;
    this.reading = false;
    if (this.pending) this.finish(this.pending, 'timeout');
    try {
      await this.reader?.cancel();
    } catch { /* the stream had already ended */ }
    await this.loop.catch(() => undefined);
    await this.port.close();
    this.note('Closed the port.');
  }
}
