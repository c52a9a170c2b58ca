/**
 * A stand-in for a serial adapter with a device on the other end, as a fake SMTP server stands in for mail:
 * it implements the part of the Web Serial API the live link uses (`requestPort`, `open(options)`, the
 * `readable`/`writable` streams, `setSignals`, `getSignals`, `close`) and its far end is the simulated device.
 * Used by "try it without hardware" and by the browser tests; it keeps what was opened and written as evidence.
 *
 * A write may hold several requests (a sequence sent as one string): the device reads them one per terminator
 * (`answerWrite`) and answers each in turn, each reply after its request has arrived, the reply before it has
 * gone out, and the response delay. A reply arrives in one chunk when its last byte would have. At a character read with a
 * framing or parity error, the bytes before it are delivered, then the readable stream errors with a
 * `FramingError` / `ParityError` DOMException and `readable` is replaced by a new stream that carries on with
 * the bad character and the rest, as Web Serial does (the character itself is passed on, as most drivers do). Control lines behave like a
 * null-modem cable's loops: CTS follows RTS, DSR and DCD follow DTR, RI stays off.
 */
import type { LineSettings } from '../frame/port-settings';
import { charTimeMs } from '../frame/timing';
import type { InputSignals, LinkOpenOptions, OutputSignals, SerialLike, SerialPortLike } from './serial';
import { answerWrite, type SimulatorAnswer, type SimulatorSettings } from './simulator';

export interface FakeSerialEvidence {
  opened: LinkOpenOptions[];
  written: number[][];
  signals: OutputSignals[];
  answers: Pick<SimulatorAnswer, 'command' | 'silence' | 'framingErrors' | 'parityErrors'>[];
}

export interface FakeSerial extends SerialLike {
  evidence: FakeSerialEvidence;
  /** Changes the simulated device (fault, delay, values, framing) while a port is open. */
  configure(change: Partial<SimulatorSettings>): void;
  settings(): SimulatorSettings;
}

const lineOf = (o: LinkOpenOptions): LineSettings => ({ baud: o.baudRate, dataBits: o.dataBits, parity: o.parity, stopBits: o.stopBits });

class FakePort implements SerialPortLike {
  readable: ReadableStream<Uint8Array> | null = null;
  writable: WritableStream<Uint8Array> | null = null;
  private controller: ReadableStreamDefaultController<Uint8Array> | null = null;
  private options: LinkOpenOptions | null = null;
  private out: Required<OutputSignals> = { dataTerminalReady: false, requestToSend: false, break: false };
  private timers = new Set<ReturnType<typeof setTimeout>>();

  constructor(private readonly owner: { evidence: FakeSerialEvidence; sim: () => SimulatorSettings; configure: (c: Partial<SimulatorSettings>) => void }) {}

  async open(options: LinkOpenOptions): Promise<void> {
    if (this.options) throw new DOMException('The port is already open.', 'InvalidStateError');
    this.owner.evidence.opened.push({ ...options });
    this.options = { ...options };
    // Web Serial raises DTR and RTS on open.
    this.out = { dataTerminalReady: true, requestToSend: true, break: false };
    this.newReadable();
    this.writable = new WritableStream<Uint8Array>({ write: (chunk) => this.request(chunk) });
  }

  private newReadable() {
    this.readable = new ReadableStream<Uint8Array>({ start: (c) => { this.controller = c; } });
  }

  private later(ms: number, fn: () => void) {
    const t = setTimeout(() => { this.timers.delete(t); fn(); }, ms);
    this.timers.add(t);
  }

  private request(chunk: Uint8Array) {
    if (!this.options) return;
    const bytes = Uint8Array.from(chunk);
    this.owner.evidence.written.push([...bytes]);
    const opener = lineOf(this.options);
    const answers = answerWrite(this.owner.sim(), bytes, opener);
    // The device's line is free again (ms from the write) once its last reply has gone out.
    let free = 0;
    for (const { end, answer: a } of answers) {
      this.owner.evidence.answers.push({ command: a.command, silence: a.silence, framingErrors: a.framingErrors, parityErrors: a.parityErrors });
      // The reply above went out at the old framing; the next request meets the new one.
      if (a.lineAfter) this.owner.configure({ line: a.lineAfter });
      if (this.out.break || !a.received.length) continue;
      const start = Math.max(end * charTimeMs(opener), free) + a.delayMs;
      free = start + a.replyWireMs;
      this.deliver(a, start);
    }
  }

  /** Delivers a reply whose first bit leaves `startMs` after the write. */
  private deliver(a: SimulatorAnswer, startMs: number) {
    const last = a.received[a.received.length - 1]!;
    const at = startMs + last.atUs / 1000;
    // Web Serial delivers what arrived before a bad character, then errors the stream; reading goes on in a new one.
    const parts: { bytes: number[]; error: string | null }[] = [{ bytes: [], error: null }];
    for (const c of a.received) {
      if (c.framingError || c.parityError) {
        parts[parts.length - 1]!.error = c.framingError ? 'FramingError' : 'ParityError';
        parts.push({ bytes: [], error: null });
      }
      parts[parts.length - 1]!.bytes.push(c.byte);
    }
    parts.forEach((part, i) => {
      // 2 ms apart, so the reader has taken each part (and found the new stream) before the next step.
      this.later(at + 2 * i, () => {
        if (!this.controller) return;
        if (part.bytes.length) this.controller.enqueue(Uint8Array.from(part.bytes));
        if (!part.error) return;
        const error = part.error;
        this.later(1, () => {
          this.controller?.error(new DOMException('A character arrived with a framing or parity error.', error));
          this.newReadable();
        });
      });
    });
  }

  async setSignals(signals: OutputSignals): Promise<void> {
    if (!this.options) throw new DOMException('The port is not open.', 'InvalidStateError');
    this.owner.evidence.signals.push({ ...signals });
    this.out = { ...this.out, ...Object.fromEntries(Object.entries(signals).filter(([, v]) => v !== undefined)) };
  }

  async getSignals(): Promise<InputSignals> {
    if (!this.options) throw new DOMException('The port is not open.', 'InvalidStateError');
    return { clearToSend: this.out.requestToSend, dataSetReady: this.out.dataTerminalReady, dataCarrierDetect: this.out.dataTerminalReady, ringIndicator: false };
  }

  async close(): Promise<void> {
    for (const t of this.timers) clearTimeout(t);
    this.timers.clear();
    try { this.controller?.close(); } catch { /* already errored or closed */ }
    this.controller = null;
    this.readable = null;
    this.writable = null;
    this.options = null;
  }
}

/** A fake `navigator.serial` whose one port leads to a simulated device with these settings. */
export function createFakeSerial(initial: SimulatorSettings): FakeSerial {
  let sim = { ...initial };
  const evidence: FakeSerialEvidence = { opened: [], written: [], signals: [], answers: [] };
  const configure = (change: Partial<SimulatorSettings>) => { sim = { ...sim, ...change }; };
  const port = new FakePort({ evidence, sim: () => sim, configure });
  return {
    evidence,
    configure,
    settings: () => sim,
    async requestPort() { return port; },
  };
}
