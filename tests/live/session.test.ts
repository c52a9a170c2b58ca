import { afterEach, describe, expect, it } from 'vitest';
import { createFakeSerial } from '../../src/lib/live/fake-serial';
import { LiveLink, LINE_ERROR_TEXT } from '../../src/lib/live/session';
import { replyComplete, replySilenceMs } from '../../src/lib/live/reply-end';
import { exchangeLogText, exchangeLogFileName } from '../../src/lib/live/exchange-log';
import type { SimulatedCommand } from '../../src/lib/live/simulator';
import { indexAckTemplate, indexMoveTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { latin1Bytes, portSettingsSchema, type PortSettingsInput } from '../../src/lib/frame';

const ascii = (s: string) => latin1Bytes(s) as Uint8Array;
const text = (b: Uint8Array) => String.fromCharCode(...b);
const library: SimulatedCommand[] = [
  { id: 'idx', name: 'Index 45°', template: indexMoveTemplate, replyTemplate: indexAckTemplate },
  { id: 'sta', name: 'Status query', template: statusQueryTemplate, replyTemplate: statusReplyTemplate },
];
const port = (s: PortSettingsInput = {}) => portSettingsSchema.parse({ baud: 9600, responseTimeoutMs: 150, frameRules: { terminator: '0D' }, ...s });
const links: LiveLink[] = [];
async function connect(settings = port(), sim: Partial<Parameters<typeof createFakeSerial>[0]> = {}) {
  const serial = createFakeSerial({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 }, commands: library, responseDelayMs: 3, ...sim });
  const link = await LiveLink.open(await serial.requestPort(), settings);
  links.push(link);
  return { serial, link };
}
afterEach(async () => {
  for (const l of links.splice(0)) await l.close();
});

describe('where a reply ends', () => {
  it('at the reply template terminator, at its length, at the port terminator, else only at a silence', () => {
    const s = port();
    expect(replyComplete(statusReplyTemplate, s, ascii('1=STA:+0004500,R*14'))).toBeNull();
    expect(replyComplete(statusReplyTemplate, s, ascii('1=STA:+0004500,R*14\r'))).toBe(20);
    const fixed = { version: 1 as const, segments: [{ type: 'literal' as const, id: 'a', bytes: '01 03' }, { type: 'checksum' as const, id: 'c', algorithm: 'CRC-16/MODBUS', range: { from: 'start' as const, to: 'checksum' as const }, over: 'bytes' as const, encoding: 'binary' as const, byteOrder: 'low-first' as const, case: 'upper' as const }] };
    expect(replyComplete(fixed, s, Uint8Array.of(0x01, 0x03, 0x40))).toBeNull();
    expect(replyComplete(fixed, s, Uint8Array.of(0x01, 0x03, 0x40, 0x21, 0xff))).toBe(4);
    expect(replyComplete(null, s, Uint8Array.of(0x41, 0x0d, 0x42))).toBe(2);
    expect(replyComplete(null, port({ frameRules: {} }), Uint8Array.of(0x00, 0x7f, 0x80, 0xff))).toBeNull();
    expect(replyComplete(null, s, new Uint8Array(0))).toBeNull();
  });

  it('waits at least 20 ms of silence in a browser, longer when the port says so', () => {
    // 3.5 characters at 9600 8-N-1 = 3.646 ms, below what a browser can time.
    expect(replySilenceMs(port())).toBe(20);
    expect(replySilenceMs(port({ baud: 300 }))).toBeCloseTo(3.5 * 10 * 1000 / 300, 6);
    expect(replySilenceMs(port({ interCharTimeoutMs: 50 }))).toBe(50);
  });
});

describe('a live link to the simulated device through the fake port', () => {
  it('opens with the stored settings, sends the query and reads the reply to its terminator', async () => {
    const { serial, link } = await connect();
    const x = await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    expect(serial.evidence.opened).toEqual([{ baudRate: 9600, dataBits: 8, stopBits: 1, parity: 'none', flowControl: 'none', bufferSize: 4096 }]);
    expect(serial.evidence.written).toEqual([[...ascii('1?STA*48\r')]]);
    // Position 0 (no value set): XOR-8 of "1=STA:+0004500,R" is 14; 4 and 5 → 0 and 0 flips 34^35 = 01: 15.
    expect(text(x.reply)).toBe('1=STA:+0000000,R*15\r');
    expect(x.endedBy).toBe('terminator');
    // 9 + 20 characters of 10 bits at 9600: 30.208 ms on the wire; the fake delivers after that and the delay.
    expect(x.wireMs).toBeCloseTo(30.2083, 3);
    expect(x.roundTripMs!).toBeGreaterThanOrEqual(30);
    expect(link.exchangeLog.map((e) => e.kind)).toEqual(['sent', 'received']);
  });

  it('says when nothing comes back within the response timeout', async () => {
    const { link } = await connect(port(), { fault: 'no-reply' });
    const x = await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    expect(x).toMatchObject({ endedBy: 'timeout', roundTripMs: null });
    expect(x.reply.length).toBe(0);
  });

  it('ends a reply with the wrong terminator at the silence, and shows garbage with framing errors, then recovers', async () => {
    const { serial, link } = await connect(port(), { fault: 'wrong-terminator' });
    const wrong = await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    expect(wrong.endedBy).toBe('silence');
    expect(text(wrong.reply)).toBe('1=STA:+0000000,R*15\n');
    serial.configure({ fault: 'none', line: { baud: 19200, dataBits: 8, parity: 'none', stopBits: 1 } });
    const garbage = await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    expect(garbage.lineErrors).toContain('FramingError');
    expect(link.exchangeLog.some((e) => e.kind === 'line-error' && e.error.includes(LINE_ERROR_TEXT))).toBe(true);
    serial.configure({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 } });
    const again = await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    expect(again.endedBy).toBe('terminator');
    expect(again.lineErrors).toEqual([]);
  });

  it('sets RTS, DTR and break and reads CTS, DSR, DCD and RI back (null-modem loops)', async () => {
    const { serial, link } = await connect();
    expect(await link.getSignals()).toEqual({ clearToSend: true, dataSetReady: true, dataCarrierDetect: true, ringIndicator: false });
    await link.setSignals({ requestToSend: false });
    await link.setSignals({ dataTerminalReady: false, break: true });
    expect(await link.getSignals()).toEqual({ clearToSend: false, dataSetReady: false, dataCarrierDetect: false, ringIndicator: false });
    expect(serial.evidence.signals).toEqual([{ requestToSend: false }, { dataTerminalReady: false, break: true }]);
  });

  it('refuses to open settings the browser cannot, without touching the port', async () => {
    const serial = createFakeSerial({ line: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 }, commands: library });
    await expect(LiveLink.open(await serial.requestPort(), port({ parity: 'mark' }))).rejects.toThrow(/not mark/);
    expect(serial.evidence.opened).toEqual([]);
  });

  it('writes the exchange log as text with both directions and the framing', async () => {
    const { link } = await connect();
    await link.exchange(ascii('1?STA*48\r'), 'Status query', statusReplyTemplate);
    const out = exchangeLogText({ device: 'DRV-501 Seamer drive', port: 'Service RS-232', line: '9600 8-N-1', through: 'the simulated device (no hardware)', openedAt: new Date('2026-12-02T10:00:00Z'), options: link.options }, link.exchangeLog);
    expect(out).toMatch(/Opened: 2026-12-02T10:00:00.000Z with baudRate 9600, dataBits 8, parity none, stopBits 1/);
    expect(out).toMatch(/TX {3}31 3F 53 54 41 2A 34 38 0D {2}\| {2}1\?STA\*48<CR> {2}\(Status query\)/);
    expect(out).toMatch(/RX {3}31 3D 53 54 41/);
    expect(exchangeLogFileName('DRV-501 Seamer', new Date('2026-12-02T10:00:00Z'))).toBe('live-link-DRV-501-Seamer-2026-12-02-10-00-00.txt');
  });
});
