/**
 * The poll cycle engine. Expected figures worked out by hand and checked with Python's decimal module
 * (`python3`, 30 digits, rounded to 6 decimals); the model's sources are named beside each check.
 */
import { describe, expect, test } from 'vitest';
import { busCycle, busCycleReport, pollTiming } from '~/lib/frame/bus-cycle';
import { defaultPortSettings, type PortSettings } from '~/lib/frame';

const port = (over: Partial<PortSettings>): PortSettings => ({ ...defaultPortSettings, interface: 'rs485-2w', ...over });
const rtu9600 = port({ protocol: 'modbus-rtu', baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, retries: 2, responseTimeoutMs: 100 });
/** Read 10 holding registers: 8-byte request, 5 + 2 × 10 = 25-byte reply (Modbus Application Protocol V1.1b3 §6.3). */
const read10 = { requestBytes: 8, replyBytes: 25, responseMs: 20 };

describe('one transaction', () => {
  test('Modbus RTU at 9600 8-N-1: request, 3.5-character interval, response time, reply, interval', () => {
    const p = pollTiming(rtu9600, { ...read10, label: 'DRV-1' }, 0);
    // common practice: 1 start + 8 data + 1 stop = 10 bits → 10 / 9600 s = 1.041667 ms a character
    expect(p.requestMs).toBeCloseTo(8.333333, 6);
    // Modbus over Serial Line V1.02 §2.5.1.1: frames are separated by 3.5 character times → 3.645833 ms
    expect(p.requestGapMs).toBeCloseTo(3.645833, 6);
    expect(p.replyGapMs).toBeCloseTo(3.645833, 6);
    expect(p.replyMs).toBeCloseTo(26.041667, 6);
    expect(p.responseMs).toBe(20);
    // python3 decimal: (8 + 3.5 + 25 + 3.5) × 10 / 9.6 + 20 = 61.666667
    expect(p.totalMs).toBeCloseTo(61.666667, 6);
    expect(p.gapMs).toBeCloseTo(7.291667, 6);
    expect(p.replyStartMs).toBeCloseTo(23.645833, 6);
    // worst case per the bus planner's model: (1 + 2 retries) × (8.333333 + 100) = 325
    expect(p.silentMs).toBeCloseTo(325, 6);
  });

  test('Modbus RTU above 19,200 bit/s: the intervals are fixed at 1.75 ms', () => {
    const p = pollTiming(port({ protocol: 'modbus-rtu', baud: 38400, parity: 'even' }), { requestBytes: 8, replyBytes: 25, responseMs: 5 }, 0);
    // Modbus over Serial Line V1.02 §2.5.1.1: 1.750 ms above 19200 bit/s; 8-E-1 is 11 bits → 0.286458 ms
    expect(p.requestGapMs).toBe(1.75);
    expect(p.replyGapMs).toBe(1.75);
    expect(p.requestMs).toBeCloseTo(2.291667, 6);
    // python3 decimal: 33 × 11 / 38.4 + 2 × 1.75 + 5 = 17.953125
    expect(p.totalMs).toBeCloseTo(17.953125, 6);
  });

  test('other protocols: no interval after the request, the turnaround delay after the reply', () => {
    const s = port({ protocol: 'ascii', turnaroundDelayMs: 10 });
    const p = pollTiming(s, { requestBytes: 4, replyBytes: 12, responseMs: 5 }, 2);
    expect(p.requestGapMs).toBe(0);
    expect(p.replyGapMs).toBe(10);
    expect(p.replyStartMs).toBe(5);
    // common practice: (4 + 12) × 10 / 9.6 + 5 + 10 = 31.666667
    expect(p.totalMs).toBeCloseTo(31.666667, 6);
    expect(p.label).toBe('Poll 3');
  });

  test('a poll without a reply (broadcast): request, interval, the master turnaround delay', () => {
    const s = port({ protocol: 'modbus-rtu', parity: 'even', turnaroundDelayMs: 150 });
    const p = pollTiming(s, { requestBytes: 8, replyBytes: 0, responseMs: 40 }, 0);
    // Modbus over Serial Line V1.02 §2.4.1: no reply to a broadcast; the master waits its turnaround delay
    // python3 decimal: 11.5 × 11 / 9.6 + 150 = 163.177083
    expect(p.totalMs).toBeCloseTo(163.177083, 6);
    expect(p.responseMs).toBe(0);
    expect(p.replyStartMs).toBeNull();
    expect(p.silentMs).toBe(p.totalMs);
  });

  test('empty request edge: 0 reply bytes and 0 response time on a non-Modbus port is the request alone', () => {
    const p = pollTiming(port({ protocol: 'other' }), { requestBytes: 1, replyBytes: 0 }, 0);
    expect(p.totalMs).toBeCloseTo(1.041667, 6);
  });
});

describe('the cycle', () => {
  test('two devices read 10 registers each: cycle, polls per second, worst case', () => {
    const c = busCycle(rtu9600, [{ ...read10, label: 'DRV-1' }, { ...read10, label: 'DRV-2' }]);
    // python3 decimal: 2 × 61.666667 = 123.333333 ms; 2000 / 123.333333 = 16.216216 polls/s
    expect(c.cycleMs).toBeCloseTo(123.333333, 6);
    expect(c.pollsPerSecond).toBeCloseTo(16.216216, 6);
    // 61.666667 + 3 × (8.333333 + 100) = 386.666667
    expect(c.worstCaseMs).toBeCloseTo(386.666667, 6);
    expect(c.worstCaseDevice).toBe('DRV-1');
    expect(c.findings).toEqual([]);
  });

  test('per cycle counts: the worst device is the one polled most', () => {
    const c = busCycle(rtu9600, [{ ...read10, label: 'fast', perCycle: 4 }, { requestBytes: 8, replyBytes: 9, responseMs: 10, label: 'slow' }]);
    // python3 decimal: 4 × 61.666667 + 35 = 281.666667 ms; 5 transactions → 17.751479 /s
    expect(c.cycleMs).toBeCloseTo(281.666667, 6);
    expect(c.pollsPerSecond).toBeCloseTo(17.751479, 6);
    // fast silent: 4 × 325 + 35 = 1335; slow silent: 4 × 61.666667 + 325 = 571.666667
    expect(c.worstCaseMs).toBeCloseTo(1335, 6);
    expect(c.worstCaseDevice).toBe('fast');
  });

  test('polls of one device go silent together; the top-level retries and timeout override the port', () => {
    const polls = [{ ...read10, device: 'D1', label: 'a' }, { ...read10, device: 'D1', label: 'b' }, { ...read10, device: 'D2' }];
    const c = busCycle(rtu9600, polls, { retries: 0, responseTimeoutMs: 150 });
    expect(c.retries).toBe(0);
    expect(c.responseTimeoutMs).toBe(150);
    // D1 silent: 2 × (8.333333 + 150) + 61.666667 = 378.333333; D2 silent: 2 × 61.666667 + 158.333333 = 281.666667
    expect(c.worstCaseMs).toBeCloseTo(378.333333, 6);
    expect(c.worstCaseDevice).toBe('D1');
  });

  test('when no silence makes the cycle longer, the worst case is the cycle itself', () => {
    // silent: 1 × (8.333333 + 40) = 48.333333 ms, shorter than the 61.666667 ms transaction it replaces
    const c = busCycle(rtu9600, [read10], { retries: 0, responseTimeoutMs: 40 });
    expect(c.worstCaseMs).toBeCloseTo(61.666667, 6);
    expect(c.worstCaseDevice).toBeNull();
  });

  test('no polls', () => {
    expect(busCycle(rtu9600, [])).toMatchObject({ cycleMs: 0, pollsPerSecond: 0, worstCaseMs: 0, worstCaseDevice: null, findings: [] });
  });
});

describe('findings', () => {
  test('a response timeout shorter than the slowest reply start is an error naming the poll', () => {
    // reply starts 3.645833 (Modbus over Serial Line V1.02 §2.5.1.1) + 20 = 23.645833 ms after the request ends
    const c = busCycle(rtu9600, [{ ...read10, label: 'DRV-1', responseMs: 5 }, { ...read10, label: 'DRV-2' }], { responseTimeoutMs: 20 });
    expect(c.findings).toHaveLength(1);
    expect(c.findings[0]).toMatchObject({ severity: 'error', code: 'response-timeout-too-short', poll: 1 });
    expect(c.findings[0]!.message).toContain('the reply to "DRV-2" starts');
    expect(c.findings[0]!.message).toContain('23.646 ms');
    expect(busCycle(rtu9600, [read10], { responseTimeoutMs: 23.7 }).findings).toEqual([]);
  });

  test('a cycle longer than the target', () => {
    expect(busCycle(rtu9600, [read10, read10], { targetCycleMs: 100 }).findings.map((f) => f.code)).toEqual(['cycle-over-target']);
    expect(busCycle(rtu9600, [read10, read10], { targetCycleMs: 124 }).findings).toEqual([]);
  });

  test('a broadcast on a Modbus port without a turnaround delay', () => {
    // Modbus over Serial Line V1.02 §2.4.1: turnaround delay typically 100 to 200 ms
    const broadcast = { label: 'Write all', requestBytes: 13, replyBytes: 0 };
    const c = busCycle({ ...rtu9600, turnaroundDelayMs: 0 }, [read10, broadcast]);
    expect(c.findings).toMatchObject([{ severity: 'warning', code: 'broadcast-turnaround-missing', poll: 1 }]);
    expect(c.findings[0]!.message).toContain('100-200 ms');
    expect(busCycle({ ...rtu9600, turnaroundDelayMs: 100 }, [read10, broadcast]).findings).toEqual([]);
    expect(busCycle(port({ protocol: 'ascii' }), [broadcast]).findings).toEqual([]);
  });
});

describe('busCycleReport', () => {
  test('rounds to 6 decimals and adds the layout findings', () => {
    const r = busCycleReport(rtu9600, [{ ...read10, label: 'DRV-1' }], {}, { members: [{ id: 'a', label: 'A', dropM: 25 }] });
    expect(r).toMatchObject({ port: '9600 8-N-1', charTimeMs: 1.041667, interFrameGapMs: 3.645833, cycleMs: 61.666667, worstCaseMs: 325 });
    expect(r.polls[0]).toMatchObject({ label: 'DRV-1', requestMs: 8.333333, replyMs: 26.041667, gapMs: 7.291667, totalMs: 61.666667, replyStartMs: 23.645833 });
    expect(r.findings.map((f) => f.code)).toEqual(['drop-too-long']);
  });
});
