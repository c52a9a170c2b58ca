/** Setting up a replacement found by the framing search, against the fake serial port and the simulated demo drive. */
import { describe, expect, it } from 'vitest';
import { createFakeSerial } from '../../src/lib/live/fake-serial';
import { LiveLink } from '../../src/lib/live/session';
import { runSetup, setupCommands, setupValues } from '../../src/lib/live/setup';
import { lineFromSetup, type SimulatedCommand } from '../../src/lib/live/simulator';
import { assembleFrame } from '../../src/lib/frame/assemble';
import { lineAckTemplate, lineSetupTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { latin1Bytes, portSettingsSchema } from '../../src/lib/frame';

const ascii = (s: string) => latin1Bytes(s) as Uint8Array;
const text = (b: number[] | Uint8Array) => String.fromCharCode(...b);
const stored = portSettingsSchema.parse({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, responseTimeoutMs: 100, frameRules: { terminator: '0D' } });
const line = { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 } as const;
const factory = { baud: 19200, dataBits: 8, parity: 'even', stopBits: 1 } as const;
const simulated: SimulatedCommand[] = [
  { id: 'sta', name: 'Status query', template: statusQueryTemplate, replyTemplate: statusReplyTemplate },
  { id: 'lin', name: 'Set service line', template: lineSetupTemplate, replyTemplate: lineAckTemplate, setsUpDevice: true },
];
// Saved with other values than the port's: the stored line settings must win.
const saved = { address: 1, baud: 38400, parity: 'odd', dataBits: 7, stopBits: 2 };
const query = { name: 'Status query', movesMachinery: false, safeToRepeat: true, request: ascii('1?STA*48\r'), replyTemplate: statusReplyTemplate };
const setupStep = (over: Partial<{ setsUpDevice: boolean }> = {}) => ({
  name: 'Set service line', setsUpDevice: true, movesMachinery: false, replyTemplate: lineAckTemplate, ...over,
  request: assembleFrame(lineSetupTemplate, setupValues(lineSetupTemplate, saved, line)).bytes,
});
const open = (p: Parameters<typeof LiveLink.open>[0], s: Parameters<typeof LiveLink.open>[1]) => LiveLink.open(p, s);

describe('setup commands after a framing search', () => {
  it('fills a setup command\'s line fields from the stored settings, a choice only when it offers the value', () => {
    expect(setupValues(lineSetupTemplate, saved, line)).toEqual({ address: 1, baud: 9600, parity: 'none', dataBits: 8, stopBits: 1 });
    // The demo template offers no mark parity: the saved choice stays.
    expect(setupValues(lineSetupTemplate, saved, { ...line, parity: 'mark' }).parity).toBe('odd');
    // Demo syntax (src/lib/composer/demo.ts): address, !LIN:, baud, parity letter, data bits, stop bits, CR.
    expect(text(setupStep().request)).toBe('1!LIN:9600,N,8,1\r');
  });

  it('lists the library\'s setup commands in its order, never a sequence', () => {
    const list = [
      { name: 'B set address', setsUpDevice: true, sequence: null },
      { name: 'Status query', setsUpDevice: false, sequence: null },
      { name: 'C set line', setsUpDevice: true, sequence: { steps: [] } },
      { name: 'D save', setsUpDevice: true },
    ];
    expect(setupCommands(list).map((c) => c.name)).toEqual(['B set address', 'D save']);
  });

  it('sends the setup commands at the framing found, then verifies with the query at the stored framing', async () => {
    const serial = createFakeSerial({ line: factory, commands: simulated, responseDelayMs: 1 });
    const port = await serial.requestPort();
    const r = await runSetup([setupStep()], query, factory, { port, settings: stored, open });
    expect(r.at).toBe('19200 8-E-1');
    expect(r.steps).toEqual([{ name: 'Set service line', outcome: 'acknowledged', detail: 'A reply that decodes, checksum good.' }]);
    expect(r.verify).toMatchObject({ shorthand: '9600 8-N-1', outcome: 'answered' });
    expect(serial.evidence.opened.map((o) => [o.baudRate, o.parity])).toEqual([[19200, 'even'], [9600, 'none']]);
    expect(serial.evidence.written.map(text)).toEqual(['1!LIN:9600,N,8,1\r', '1?STA*48\r']);
    expect(serial.settings().line).toEqual(line);
  });

  it('stops at a setup command that is not acknowledged and reports the verification that fails', async () => {
    const serial = createFakeSerial({ line: factory, commands: simulated, responseDelayMs: 1, fault: 'no-reply' });
    const port = await serial.requestPort();
    const second = { ...setupStep(), name: 'Store settings' };
    const r = await runSetup([setupStep(), second], query, factory, { port, settings: stored, open });
    expect(r.steps.map((s) => s.outcome)).toEqual(['no-reply', 'not-sent']);
    expect(r.verify.outcome).toBe('silent');
    expect(serial.evidence.written.map(text)).toEqual(['1!LIN:9600,N,8,1\r', '1?STA*48\r']);
  });

  it('sends nothing when a step is not marked as a setup command or the query is not safe to repeat', async () => {
    const serial = createFakeSerial({ line: factory, commands: simulated });
    const port = await serial.requestPort();
    await expect(runSetup([setupStep({ setsUpDevice: false })], query, factory, { port, settings: stored, open })).rejects.toThrow(/not marked as a setup command/);
    await expect(runSetup([], query, factory, { port, settings: stored, open })).rejects.toThrow(/no setup commands/);
    await expect(runSetup([setupStep()], { ...query, safeToRepeat: false }, factory, { port, settings: stored, open })).rejects.toThrow(/not marked safe to repeat/);
    await expect(runSetup([setupStep()], { ...query, movesMachinery: true }, factory, { port, settings: stored, open })).rejects.toThrow(/moves machinery/);
    expect(serial.evidence.opened).toEqual([]);
    expect(serial.evidence.written).toEqual([]);
  });
});

describe('the simulator taking on a setup command\'s framing', () => {
  it('changes only the fields named, and nothing when they match its own', () => {
    expect(lineFromSetup(factory, { baud: 9600, parity: 'none' })).toEqual({ baud: 9600, dataBits: 8, parity: 'none', stopBits: 1 });
    expect(lineFromSetup(factory, { baud: '38400', stopBits: 2 })).toEqual({ baud: 38400, dataBits: 8, parity: 'even', stopBits: 2 });
    expect(lineFromSetup(factory, { baud: 19200, parity: 'even' })).toBeNull();
    expect(lineFromSetup(factory, { parity: 'sideways', dataBits: 9 })).toBeNull();
  });

  it('keeps its framing for a command not marked as setup', async () => {
    const serial = createFakeSerial({ line: factory, commands: simulated.map((c) => ({ ...c, setsUpDevice: false })), responseDelayMs: 1 });
    const link = await LiveLink.open(await serial.requestPort(), { ...stored, ...factory });
    const x = await link.exchange(ascii('1!LIN:9600,N,8,1\r'), 'set line', lineAckTemplate);
    await link.close();
    // "1=LIN:OK*79" CR: XOR-8 of "1=LIN:OK" worked out with Python's functools.reduce over the bytes.
    expect(text(x.reply)).toBe('1=LIN:OK*79\r');
    expect(serial.settings().line).toEqual(factory);
  });
});
