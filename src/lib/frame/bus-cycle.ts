/**
 * The poll cycle of a multidrop bus: what the master asks each member, how long each transaction holds the line,
 * how long a whole round takes, and how much longer it takes when one device stops answering. All times are
 * milliseconds.
 *
 * One transaction, in order: the request on the wire, the silent interval that ends it, the device's own response
 * time (`responseMs`, from the end of the request to the start of its reply), the reply on the wire and the silent
 * interval that ends it.
 * - Modbus RTU: each silent interval is 3.5 character times, fixed at 1.75 ms above 19,200 bit/s (Modbus over
 *   Serial Line V1.02 §2.5.1.1).
 * - Other protocols: no interval after the request beyond the device's response time; after the reply the port's
 *   turnaround delay (`turnaroundDelayMs`, the master's wait before it sends again).
 * A poll without a reply (`replyBytes` 0: a broadcast, or a write the device does not answer) is the request, the
 * interval after it (Modbus RTU) and the port's turnaround delay (Modbus over Serial Line V1.02 §2.4.1).
 */
import { type BusLayout, type BusLayoutFinding, type BusLayoutMember, checkBusLayout } from './bus-layout';
import type { Severity } from './findings';
import type { PortSettings } from './port-settings';
import { lineShorthand } from './port-text';
import { charTimeMs, roundMs, silentIntervals } from './timing';

/** What the master asks one device, and how often in one cycle. */
export interface BusPoll {
  label?: string;
  /** Which device answers; polls of one device go silent together (worst case). Absent: the label, else the poll alone. */
  device?: string;
  requestBytes: number;
  /** 0 = no reply (a broadcast). */
  replyBytes: number;
  /** The device's own delay from the end of the request to the start of its reply; 0 when left out. */
  responseMs?: number;
  /** Times this poll is sent per cycle; 1 when left out. */
  perCycle?: number;
}

export interface BusCycleOptions {
  /** Tries after the first when a reply does not come (default: the port's `retries`). */
  retries?: number;
  /** The master's wait for the start of a reply (default: the port's `responseTimeoutMs`). */
  responseTimeoutMs?: number;
  /** The cycle the application needs, ms; a longer cycle is a finding. */
  targetCycleMs?: number;
}

export interface PollTiming {
  label: string;
  device: string;
  perCycle: number;
  requestMs: number;
  /** The silent interval after the request (Modbus RTU), else 0. */
  requestGapMs: number;
  /** The device's response time (0 for a poll without a reply). */
  responseMs: number;
  replyMs: number;
  /** After the reply: the silent interval (Modbus RTU) or the turnaround delay; after a broadcast, both. */
  replyGapMs: number;
  /** requestGapMs + replyGapMs: the line's silent time that is not the device's. */
  gapMs: number;
  /** From the end of the request to the first character of the reply: requestGapMs + responseMs (null without a reply). */
  replyStartMs: number | null;
  /** One transaction: requestMs + requestGapMs + responseMs + replyMs + replyGapMs. */
  totalMs: number;
  /** One poll that gets no answer: (1 + retries) × (requestMs + responseTimeoutMs); a broadcast is unchanged. */
  silentMs: number;
}

export const BUS_CYCLE_CODES = ['response-timeout-too-short', 'cycle-over-target', 'broadcast-turnaround-missing'] as const;
export type BusCycleCode = (typeof BUS_CYCLE_CODES)[number];

export interface BusCycleFinding {
  severity: Severity;
  code: BusCycleCode;
  /** The poll the finding is about (index into `polls`). */
  poll?: number;
  message: string;
}

export interface BusCycle {
  charTimeMs: number;
  /** The Modbus RTU silent interval (3.5 characters) when the protocol is Modbus RTU, else 0. */
  interFrameGapMs: number;
  retries: number;
  responseTimeoutMs: number;
  turnaroundDelayMs: number;
  polls: PollTiming[];
  /** Σ totalMs × perCycle. */
  cycleMs: number;
  /** Transactions per second: Σ perCycle ÷ cycleMs. */
  pollsPerSecond: number;
  /**
   * The cycle when the device whose silence costs most misses every poll (its polls take `silentMs` each); the
   * cycle itself when no device's silence makes it longer (a timeout shorter than the transaction it replaces).
   */
  worstCaseMs: number;
  /** The device of `worstCaseMs` (null when no silence makes the cycle longer, or no poll expects a reply). */
  worstCaseDevice: string | null;
  findings: BusCycleFinding[];
}

/** Modbus over Serial Line V1.02 §2.4.1: the broadcast turnaround delay is typically 100 to 200 ms (at 9600 bit/s). */
export const BROADCAST_TURNAROUND_TYPICAL_MS = [100, 200] as const;

type CycleSettings = Pick<PortSettings, 'baud' | 'dataBits' | 'parity' | 'stopBits' | 'protocol' | 'responseTimeoutMs' | 'turnaroundDelayMs' | 'retries'>;

const ms = (x: number) => `${roundMs(Math.round(x * 1000) / 1000)} ms`;

/** One transaction of `poll` on a port with `s` (see the module comment for the model). */
export function pollTiming(s: CycleSettings, poll: BusPoll, index: number, responseTimeoutMs = s.responseTimeoutMs, retries = s.retries): PollTiming {
  const t = charTimeMs(s);
  const rtu = s.protocol === 'modbus-rtu';
  const gap = rtu ? silentIntervals(s).interFrameGapMs : 0;
  const label = poll.label?.trim() || `Poll ${index + 1}`;
  const requestMs = poll.requestBytes * t;
  const hasReply = poll.replyBytes > 0;
  const responseMs = hasReply ? (poll.responseMs ?? 0) : 0;
  const replyMs = poll.replyBytes * t;
  const replyGapMs = hasReply ? (rtu ? gap : s.turnaroundDelayMs) : s.turnaroundDelayMs;
  const totalMs = requestMs + gap + responseMs + replyMs + replyGapMs;
  return {
    label,
    device: poll.device?.trim() || poll.label?.trim() || `#${index + 1}`,
    perCycle: poll.perCycle ?? 1,
    requestMs,
    requestGapMs: gap,
    responseMs,
    replyMs,
    replyGapMs,
    gapMs: gap + replyGapMs,
    replyStartMs: hasReply ? gap + responseMs : null,
    totalMs,
    silentMs: hasReply ? (1 + retries) * (requestMs + responseTimeoutMs) : totalMs,
  };
}

/** The poll cycle of one master over `polls`, in the order given, with its findings. */
export function busCycle(s: CycleSettings, polls: readonly BusPoll[], opts: BusCycleOptions = {}): BusCycle {
  const retries = opts.retries ?? s.retries;
  const responseTimeoutMs = opts.responseTimeoutMs ?? s.responseTimeoutMs;
  const timings = polls.map((p, i) => pollTiming(s, p, i, responseTimeoutMs, retries));
  let cycleMs = 0;
  let transactions = 0;
  for (const p of timings) {
    cycleMs += p.totalMs * p.perCycle;
    transactions += p.perCycle;
  }
  let worstCaseMs = cycleMs;
  let worstCaseDevice: string | null = null;
  const devices = [...new Set(timings.filter((p) => p.replyStartMs !== null).map((p) => p.device))];
  for (const d of devices) {
    let c = 0;
    for (const p of timings) c += (p.device === d ? p.silentMs : p.totalMs) * p.perCycle;
    if (c > worstCaseMs) {
      worstCaseMs = c;
      worstCaseDevice = d;
    }
  }

  const findings: BusCycleFinding[] = [];
  let slowest = -1;
  timings.forEach((p, i) => {
    if (p.replyStartMs !== null && (slowest < 0 || p.replyStartMs > timings[slowest]!.replyStartMs!)) slowest = i;
  });
  if (slowest >= 0 && responseTimeoutMs < timings[slowest]!.replyStartMs!) {
    const p = timings[slowest]!;
    const start = p.requestGapMs > 0 ? `the ${ms(p.requestGapMs)} silent interval plus its ${ms(p.responseMs)} response time` : `its ${ms(p.responseMs)} response time`;
    findings.push({
      severity: 'error', code: 'response-timeout-too-short', poll: slowest,
      message: `The response timeout (${ms(responseTimeoutMs)}) ends before the reply to "${p.label}" starts: ${start} make ${ms(p.replyStartMs!)}. Set the master's response timeout above ${ms(p.replyStartMs!)}, with a margin.`,
    });
  }
  if (opts.targetCycleMs !== undefined && cycleMs > opts.targetCycleMs) {
    findings.push({
      severity: 'warning', code: 'cycle-over-target',
      message: `One cycle takes ${ms(cycleMs)}, longer than the ${ms(opts.targetCycleMs)} target. Poll slow values less often (per cycle), read fewer bytes, or raise the baud rate.`,
    });
  }
  const modbus = s.protocol === 'modbus-rtu' || s.protocol === 'modbus-ascii';
  const broadcast = timings.findIndex((p) => p.replyStartMs === null);
  if (modbus && broadcast >= 0 && s.turnaroundDelayMs <= 0) {
    const [lo, hi] = BROADCAST_TURNAROUND_TYPICAL_MS;
    findings.push({
      severity: 'warning', code: 'broadcast-turnaround-missing', poll: broadcast,
      message: `${timings[broadcast]!.label} expects no reply (a broadcast) but the port has no turnaround delay, so the next request can reach devices still busy with it. Set a turnaround delay (typically ${lo}-${hi} ms at 9600 bit/s).`,
    });
  }

  return {
    charTimeMs: charTimeMs(s),
    interFrameGapMs: s.protocol === 'modbus-rtu' ? silentIntervals(s).interFrameGapMs : 0,
    retries,
    responseTimeoutMs,
    turnaroundDelayMs: s.turnaroundDelayMs,
    polls: timings,
    cycleMs,
    pollsPerSecond: cycleMs > 0 ? (transactions * 1000) / cycleMs : 0,
    worstCaseMs,
    worstCaseDevice,
    findings,
  };
}

/** One poll as `POST /api/tools/bus-cycle` answers it, times rounded by `roundMs`. */
export interface PollReport {
  label: string;
  device: string;
  perCycle: number;
  requestMs: number;
  requestGapMs: number;
  responseMs: number;
  replyMs: number;
  replyGapMs: number;
  gapMs: number;
  replyStartMs: number | null;
  totalMs: number;
  silentMs: number;
}

/** What `POST /api/tools/bus-cycle` answers: `busCycle` with the port shorthand, times rounded by `roundMs`. */
export interface BusCycleReport {
  port: string;
  protocol: PortSettings['protocol'];
  charTimeMs: number;
  interFrameGapMs: number;
  retries: number;
  responseTimeoutMs: number;
  turnaroundDelayMs: number;
  cycleMs: number;
  pollsPerSecond: number;
  worstCaseMs: number;
  worstCaseDevice: string | null;
  polls: PollReport[];
  findings: (BusCycleFinding | BusLayoutFinding)[];
}

export function busCycleReport(s: CycleSettings, polls: readonly BusPoll[], opts: BusCycleOptions = {}, layout?: { members: readonly BusLayoutMember[] } & BusLayout): BusCycleReport {
  const c = busCycle(s, polls, opts);
  const r = (p: PollTiming): PollReport => ({
    label: p.label, device: p.device, perCycle: p.perCycle,
    requestMs: roundMs(p.requestMs), requestGapMs: roundMs(p.requestGapMs), responseMs: roundMs(p.responseMs), replyMs: roundMs(p.replyMs),
    replyGapMs: roundMs(p.replyGapMs), gapMs: roundMs(p.gapMs), replyStartMs: p.replyStartMs === null ? null : roundMs(p.replyStartMs),
    totalMs: roundMs(p.totalMs), silentMs: roundMs(p.silentMs),
  });
  const layoutFindings = layout ? checkBusLayout(layout.members, layout) : [];
  return {
    port: lineShorthand(s),
    protocol: s.protocol,
    charTimeMs: roundMs(c.charTimeMs),
    interFrameGapMs: roundMs(c.interFrameGapMs),
    retries: c.retries,
    responseTimeoutMs: c.responseTimeoutMs,
    turnaroundDelayMs: c.turnaroundDelayMs,
    cycleMs: roundMs(c.cycleMs),
    pollsPerSecond: roundMs(c.pollsPerSecond),
    worstCaseMs: roundMs(c.worstCaseMs),
    worstCaseDevice: c.worstCaseDevice,
    polls: c.polls.map(r),
    findings: [...c.findings, ...layoutFindings],
  };
}
