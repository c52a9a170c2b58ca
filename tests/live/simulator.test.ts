import { describe, expect, it } from 'vitest';
import { answer, recognise, type SimulatedCommand, type SimulatorSettings } from '../../src/lib/live/simulator';
import { indexAckTemplate, indexMoveTemplate, jogTemplate, statusQueryTemplate, statusReplyTemplate } from '../../src/lib/composer/demo';
import { latin1Bytes, type LineSettings, type Template } from '../../src/lib/frame';

const ascii = (s: string) => latin1Bytes(s) as Uint8Array;
const text = (b: Uint8Array) => String.fromCharCode(...b);
const l8n1 = (baud: number): LineSettings => ({ baud, dataBits: 8, parity: 'none', stopBits: 1 });

const library: SimulatedCommand[] = [
  { id: 'idx', name: 'Index 45°', template: indexMoveTemplate, replyTemplate: indexAckTemplate },
  { id: 'jog', name: 'Jog +1°', template: jogTemplate('+'), replyTemplate: null },
  { id: 'sta', name: 'Status query', template: statusQueryTemplate, replyTemplate: statusReplyTemplate },
];
const base: SimulatorSettings = { line: l8n1(9600), commands: library, responseDelayMs: 7 };
// Hand-worked XOR-8 of the demo syntax: "1?STA" = 31^3F^53^54^41 = 48; "1=STA:+0004500,R" = 14; "1=IDX:OK" = 67.
const STATUS = ascii('1?STA*48\r');

describe('the simulated device', () => {
  it('recognises a request by decoding it against the library and reads its fields', () => {
    expect(recognise(library, STATUS)).toMatchObject({ command: { id: 'sta' }, values: { address: 1 } });
    expect(recognise(library, ascii('1!IDX:+4500/R180000/F180000/S18000\r'))).toMatchObject({ command: { id: 'idx' }, values: { angle: 45 } });
    expect(recognise(library, ascii('1?STA*49\r'))).toBeNull();
    for (const junk of [new Uint8Array(0), Uint8Array.of(0x00), Uint8Array.of(0x7f), Uint8Array.of(0x80), Uint8Array.of(0xff)]) expect(recognise(library, junk)).toBeNull();
  });

  it('answers the status query with its reply template and the values set, after the response delay', () => {
    const a = answer({ ...base, replyValues: { sta: { position: 45, state: 'ready' } } }, STATUS, l8n1(9600));
    expect(a.command).toEqual({ id: 'sta', name: 'Status query' });
    expect(text(a.sent)).toBe('1=STA:+0004500,R*14\r');
    expect(a.received.map((c) => c.byte)).toEqual([...a.sent]);
    expect(a.framingErrors + a.parityErrors).toBe(0);
    expect(a.delayMs).toBe(7);
    // 20 characters of 10 bits at 9600 bit/s.
    expect(a.replyWireMs).toBeCloseTo(20.8333, 3);
  });

  it('echoes the request address into the reply and fills fields without a default', () => {
    const a = answer(base, ascii('7?STA*4E\r'), l8n1(9600));
    // "7?STA": 37^3F^53^54^41 = 4E. Position without a value is 0, the state its first choice (R).
    expect(text(a.sent)).toBe(`7=STA:+0000000,R*${xor('7=STA:+0000000,R')}\r`);
  });

  it('acknowledges the index move', () => {
    const a = answer(base, ascii('1!IDX:+4500/R180000/F180000/S18000\r'), l8n1(9600));
    expect(text(a.sent)).toBe('1=IDX:OK*67\r');
  });

  it('stays silent for unknown requests and commands without a reply template, saying why', () => {
    expect(answer(base, ascii('hello\r'), l8n1(9600))).toMatchObject({ command: null, sent: new Uint8Array(0) });
    expect(answer(base, ascii('1!JOG:+100\r'), l8n1(9600)).silence).toMatch(/no reply template/);
  });

  it('faults: no reply, a bad checksum, the wrong terminator', () => {
    expect(answer({ ...base, fault: 'no-reply' }, STATUS, l8n1(9600)).silence).toMatch(/never to answer/);
    const values = { sta: { position: 45, state: 'ready' } };
    expect(text(answer({ ...base, replyValues: values, fault: 'bad-checksum' }, STATUS, l8n1(9600)).sent)).toBe('1=STA:+0004500,R*15\r');
    expect(text(answer({ ...base, replyValues: values, fault: 'wrong-terminator' }, STATUS, l8n1(9600)).sent)).toBe('1=STA:+0004500,R*14\n');
    // A binary CRC has its last byte's lowest bit flipped; a hex F wraps to A.
    const binary: Template = { version: 1, segments: [{ type: 'literal', id: 'a', bytes: '01 03' }, { type: 'checksum', id: 'c', algorithm: 'CRC-16/MODBUS', range: { from: 'start', to: 'checksum' }, over: 'bytes', encoding: 'binary', byteOrder: 'low-first', case: 'upper' }] };
    const rtu = answer({ ...base, commands: [{ id: 'b', name: 'b', template: { version: 1, segments: [{ type: 'literal', id: 'q', bytes: '01' }] }, replyTemplate: binary }], fault: 'bad-checksum' }, Uint8Array.of(0x01), l8n1(9600));
    // CRC-16/MODBUS of 01 03 is 0x2140 (sent 40 21); the spoiled reply ends 20.
    expect([...rtu.sent]).toEqual([0x01, 0x03, 0x40, 0x20]);
  });

  it('a framing mismatch brings back garbage with framing errors, not silence', () => {
    // The reply "1=IDX:OK*67\r" sent at 9600 8-N-1 read by an opener at 19200 8-N-1: every character splits as in
    // the 0x55 worked example of uart.test.ts, so errors are certain and the bytes are not the reply.
    const a = answer(base, ascii('1!IDX:+4500/R180000/F180000/S18000\r'), l8n1(19200));
    expect(a.silence).toBeNull();
    expect(a.received.length).toBeGreaterThan(0);
    expect(a.framingErrors).toBeGreaterThan(0);
    expect(a.received.map((c) => c.byte)).not.toEqual([...a.sent]);
    // A simulator that reads requests through its own UART does not recognise the garbled request.
    expect(answer({ ...base, hearsAnyFraming: false }, STATUS, l8n1(19200)).command).toBeNull();
    expect(answer({ ...base, hearsAnyFraming: false }, STATUS, l8n1(9600)).command).toMatchObject({ id: 'sta' });
  });
});

function xor(s: string): string {
  let x = 0;
  for (const ch of s) x ^= ch.charCodeAt(0);
  return x.toString(16).toUpperCase().padStart(2, '0');
}
