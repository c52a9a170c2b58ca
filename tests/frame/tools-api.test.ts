import { describe, expect, test } from 'vitest';
import { POST as busCycle } from '~/pages/api/tools/bus-cycle';
import { POST as checksum } from '~/pages/api/tools/checksum';
import { POST as convert } from '~/pages/api/tools/convert';
import { POST as frame } from '~/pages/api/tools/frame';
import { POST as sequence } from '~/pages/api/tools/sequence';
import { POST as timing } from '~/pages/api/tools/timing';

type Handler = typeof convert;
async function call(handler: Handler, body: unknown, init: { contentType?: string; raw?: string } = {}) {
  const request = new Request('http://localhost/api/tools/x', {
    method: 'POST',
    headers: { 'content-type': init.contentType ?? 'application/json' },
    body: init.raw ?? JSON.stringify(body),
  });
  const res = await handler({ request } as any);
  return { status: res.status, body: (await res.json()) as any };
}

describe('POST /api/tools/convert', () => {
  test('200 with bytes and every notation', async () => {
    // common practice: CR LF line end; IEC 61131-3 Annex B $hh escapes for the PLC string
    const r = await call(convert, { from: 'escaped', text: 'GO\\r\\n' });
    expect(r).toEqual({
      status: 200,
      body: { bytes: '47 4F 0D 0A', byteCount: 4, notations: { escaped: 'GO\\r\\n', iec: 'GO$0D$0A', iecLiteral: "'GO$0D$0A'", mnemonic: 'GO<CR><LF>', hex: '47 4F 0D 0A', decimal: '71 79 13 10' } },
    });
  });
  test('0x00 0x7F 0x80 0xFF from decimal, and empty text', async () => {
    expect((await call(convert, { from: 'decimal', text: '0 127 128 255' })).body).toMatchObject({ bytes: '00 7F 80 FF', byteCount: 4 });
    expect((await call(convert, { from: 'hex', text: '' })).body).toMatchObject({ bytes: '', byteCount: 0 });
  });
  test('422 with position for malformed text', async () => {
    expect(await call(convert, { from: 'escaped', text: 'ABC\\x4G' })).toEqual({ status: 422, body: { error: '\\x needs two hex digits', position: 3 } });
  });
  test('422 for an unknown notation, 400 for bad JSON, 415 for other content types', async () => {
    const bad = await call(convert, { from: 'octal', text: '1' });
    expect(bad.status).toBe(422);
    expect(bad.body.fields).toHaveProperty('from');
    expect((await call(convert, null, { raw: '{nope' })).status).toBe(400);
    expect((await call(convert, null, { raw: 'x', contentType: 'text/plain' })).status).toBe(415);
  });
  test('413 above 64 KiB', async () => {
    expect((await call(convert, { from: 'hex', text: 'A'.repeat(70 * 1024) })).status).toBe(413);
  });
});

describe('POST /api/tools/checksum', () => {
  test('CRC-16/MODBUS check value by alias, with wire orders', async () => {
    // CRC RevEng catalogue: CRC-16/MODBUS check 0x4B37 over "123456789"
    expect(await call(checksum, { algorithm: 'modbus', bytes: '31 32 33 34 35 36 37 38 39' })).toEqual({
      status: 200,
      body: { algorithm: 'CRC-16/MODBUS', value: '0x4B37', width: 16, byteOrder: 'low-first', highByteFirst: '4B 37', lowByteFirst: '37 4B' },
    });
  });
  test('CRC-16/CCITT resolves to KERMIT; CRC-32; LRC', async () => {
    // CRC RevEng catalogue: CRC-16/CCITT is an alias of CRC-16/KERMIT (check 0x2189); CRC-32 check 0xCBF43926
    expect((await call(checksum, { algorithm: 'CRC-16/CCITT', bytes: '313233343536373839' })).body).toMatchObject({ algorithm: 'CRC-16/KERMIT', value: '0x2189' });
    expect((await call(checksum, { algorithm: 'crc-32', bytes: '0x31,0x32,0x33,0x34,0x35,0x36,0x37,0x38,0x39' })).body).toMatchObject({ value: '0xCBF43926', width: 32 });
    // Modbus guide V1.02, 6.2.1: LRC = two's complement of the 8-bit sum; 01 03 00 9B sums to 0x9F
    expect((await call(checksum, { algorithm: 'LRC', bytes: '01 03 00 9B' })).body).toMatchObject({ algorithm: 'LRC', value: '0x61', width: 8 });
  });
  test('422 for malformed hex (with position) and unknown algorithm', async () => {
    expect(await call(checksum, { algorithm: 'XOR-8', bytes: '01 0Z' })).toMatchObject({ status: 422, body: { position: 4 } });
    const unknown = await call(checksum, { algorithm: 'CRC-7/NOPE', bytes: '01' });
    expect(unknown.status).toBe(422);
    expect(unknown.body.algorithms).toContain('CRC-16/KERMIT');
  });
});

describe('POST /api/tools/checksum: more models, sums, custom parameters', () => {
  const nine = '31 32 33 34 35 36 37 38 39';
  test('catalogue models by alias, with the byte order the model is presented in', async () => {
    // CRC RevEng catalogue: CRC-32/ISCSI (alias CRC-32C) check 0xE3069283, reflected; CRC-16/DNP check 0xEA82;
    // CRC-16/GENIBUS (alias CRC-16/EPC) check 0xD64E, not reflected
    expect((await call(checksum, { algorithm: 'crc-32c', bytes: nine })).body).toEqual({
      algorithm: 'CRC-32/ISCSI', value: '0xE3069283', width: 32, byteOrder: 'low-first', highByteFirst: 'E3 06 92 83', lowByteFirst: '83 92 06 E3',
    });
    expect((await call(checksum, { algorithm: 'CRC-16/DNP', bytes: nine })).body).toMatchObject({ value: '0xEA82', byteOrder: 'low-first' });
    expect((await call(checksum, { algorithm: 'CRC-16/EPC', bytes: nine })).body).toMatchObject({ algorithm: 'CRC-16/GENIBUS', value: '0xD64E', byteOrder: 'high-first' });
    // common practice: sum of the bytes modulo 65536; "123456789" sums to 0x01DD
    expect((await call(checksum, { algorithm: 'SUM-16', bytes: nine })).body).toMatchObject({ value: '0x01DD', width: 16, highByteFirst: '01 DD' });
  });
  test('names are ASCII and names of several widths need their prefix', async () => {
    for (const algorithm of ['crc-16/modbuſ', 'AUTOSAR', 'XZ']) {
      const r = await call(checksum, { algorithm, bytes: '01' });
      expect(r.status, algorithm).toBe(422);
      expect(r.body.algorithms).toContain('CRC-16/MODBUS');
    }
  });
  test('custom CRC parameters', async () => {
    // CRC RevEng catalogue: CRC-12/UMTS width 12 poly 0x80F init 0 refin false refout true xorout 0, check 0xDAF
    const crc = { width: 12, poly: '0x80F', init: 0, refin: false, refout: true, xorout: '0x000' };
    expect((await call(checksum, { algorithm: 'custom', crc, bytes: nine })).body).toEqual({
      algorithm: 'CRC-12 custom (poly=0x80F init=0x000 refin=false refout=true xorout=0x000)', value: '0xDAF', width: 12,
      byteOrder: 'low-first', highByteFirst: '0D AF', lowByteFirst: 'AF 0D',
    });
    // the parameters of CRC-16/MODBUS are CRC-16/MODBUS (CRC RevEng catalogue, check 0x4B37)
    const modbus = { width: 16, poly: 0x8005, init: 0xffff, refin: true, refout: true, xorout: 0 };
    expect((await call(checksum, { algorithm: 'custom', crc: modbus, bytes: nine })).body).toMatchObject({ algorithm: 'CRC-16/MODBUS', value: '0x4B37' });
    const reversed = await call(checksum, { algorithm: 'custom', crc: { ...crc, width: 16, poly: '0x8408' }, bytes: nine });
    expect(reversed.status).toBe(422);
    expect(reversed.body.fields).toHaveProperty(['crc.poly']);
    expect((await call(checksum, { algorithm: 'custom', bytes: nine })).status).toBe(422);
    expect((await call(checksum, { algorithm: 'CRC-16/ARC', crc: modbus, bytes: nine })).status).toBe(422);
  });
});

describe('POST /api/tools/timing', () => {
  test('9600 8-N-1, 10 bytes', async () => {
    // published UART timing example: 9600 baud, 10-bit chars → 1.04167 ms per char, 1.5 chars = 1.5625 ms
    const r = await call(timing, { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, byteCount: 10 });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ port: '9600 8-N-1', bitsPerChar: 10, charTimeMs: 1.041667, frameTimeMs: 10.416667, interCharTimeoutMs: 1.5625, interFrameGapMs: 3.645833 });
  });
  test('fixed intervals above 19200', async () => {
    // Modbus over Serial Line guide V1.02, 2.5.1.1: 750 µs and 1.750 ms above 19200 bit/s
    expect((await call(timing, { baud: 38400, dataBits: 8, parity: 'even', stopBits: 1, byteCount: 8 })).body).toMatchObject({ bitsPerChar: 11, interCharTimeoutMs: 0.75, interFrameGapMs: 1.75 });
  });
  test('422 for invalid settings', async () => {
    const r = await call(timing, { baud: 9600, dataBits: 9, parity: 'none', stopBits: 1, byteCount: 1 });
    expect(r.status).toBe(422);
    expect(r.body.fields).toHaveProperty('dataBits');
    expect((await call(timing, { baud: 9600, dataBits: 8, parity: 'none', stopBits: 3, byteCount: 1 })).status).toBe(422);
  });
});

describe('POST /api/tools/timing: the transaction as the bus planner counts it', () => {
  const read10 = { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, byteCount: 8, replyByteCount: 25 };
  test('request, 3.5-character interval, response time, reply, interval; turnaroundMs is the older name of responseMs', async () => {
    // Modbus over Serial Line V1.02 §2.5.1.1: 3.5 characters after each frame; python3 decimal: 40 × 10 / 9.6 + 20 = 61.666667
    expect((await call(timing, { ...read10, responseMs: 20 })).body).toMatchObject({ frameTimeMs: 8.333333, replyTimeMs: 26.041667, transactionMs: 61.666667 });
    expect((await call(timing, { ...read10, turnaroundMs: 20 })).body.transactionMs).toBe(61.666667);
    expect((await call(timing, { ...read10, turnaroundMs: 20, responseMs: 20 })).body.transactionMs).toBe(61.666667);
    // without a reply: the request and its interval (python3: 11.5 × 10 / 9.6 = 11.979167)
    expect((await call(timing, { ...read10, replyByteCount: 0 })).body.transactionMs).toBe(11.979167);
  });
  test('422: the two names disagree, or a response time without a reply', async () => {
    const both = await call(timing, { ...read10, turnaroundMs: 20, responseMs: 5 });
    expect(both.status).toBe(422);
    expect(both.body.fields.turnaroundMs).toContain('older name of responseMs');
    const noReply = await call(timing, { ...read10, replyByteCount: undefined, responseMs: 5 });
    expect(noReply.status).toBe(422);
    expect(noReply.body.fields.responseMs).toContain('needs a reply');
  });
});

describe('POST /api/tools/bus-cycle', () => {
  const settings = { baud: 9600, protocol: 'modbus-rtu', retries: 2, responseTimeoutMs: 100 };
  const read10 = { requestBytes: 8, replyBytes: 25, responseMs: 20 };
  test('the worked example of docs/api.md: two devices read 10 holding registers at 9600 8-N-1', async () => {
    // Modbus over Serial Line V1.02 §2.5.1.1 (3.5-character intervals); python3 decimal for the figures
    const r = await call(busCycle, { settings, polls: [{ label: 'DRV-1', ...read10 }, { label: 'DRV-2', ...read10 }] });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ port: '9600 8-N-1', cycleMs: 123.333333, pollsPerSecond: 16.216216, worstCaseMs: 386.666667, worstCaseDevice: 'DRV-1', findings: [] });
    expect(r.body.polls[1]).toMatchObject({ label: 'DRV-2', requestMs: 8.333333, replyMs: 26.041667, gapMs: 7.291667, totalMs: 61.666667 });
  });
  test('defaults: responseMs 0, perCycle 1, settings 9600 8-N-1 ascii; top-level retries and timeout override', async () => {
    const r = await call(busCycle, { polls: [{ requestBytes: 4, replyBytes: 12 }], retries: 1, responseTimeoutMs: 50 });
    // common practice: 16 × 10 / 9.6 = 16.666667 ms, no silent intervals outside Modbus RTU
    expect(r.body).toMatchObject({ cycleMs: 16.666667, retries: 1, responseTimeoutMs: 50, worstCaseMs: 108.333333 });
    expect(r.body.polls[0]).toMatchObject({ label: 'Poll 1', responseMs: 0, perCycle: 1 });
  });
  test('findings: timeout, target, broadcast delay, layout', async () => {
    const r = await call(busCycle, {
      settings: { ...settings, responseTimeoutMs: 20 }, targetCycleMs: 50,
      polls: [{ label: 'DRV-1', ...read10 }, { label: 'All', requestBytes: 13, replyBytes: 0 }],
      layout: { trunkM: 60, members: [{ label: 'PLC', bias: true }, { label: 'DRV-1', dropM: 25, bias: true }] },
    });
    expect(r.body.findings.map((f: any) => f.code)).toEqual(['response-timeout-too-short', 'cycle-over-target', 'broadcast-turnaround-missing', 'drop-too-long', 'bias-multiple']);
  });
  test('422 with a message per field', async () => {
    const empty = await call(busCycle, { polls: [] });
    expect(empty).toMatchObject({ status: 422, body: { fields: { polls: 'List at least one poll' } } });
    const bad = await call(busCycle, { polls: [{ requestBytes: 0, replyBytes: 1.5, perCycle: 0 }], retries: -1 });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.fields).sort()).toEqual(['polls.0.perCycle', 'polls.0.replyBytes', 'polls.0.requestBytes', 'retries']);
    expect(bad.body.fields['polls.0.requestBytes']).toBe('The request is at least 1 byte');
    const noReply = await call(busCycle, { polls: [{ requestBytes: 8, replyBytes: 0, responseMs: 10 }] });
    expect(noReply.body.fields['polls.0.responseMs']).toContain('no response time');
    expect((await call(busCycle, { polls: [read10], extra: 1 })).status).toBe(422);
    expect((await call(busCycle, { polls: [read10], settings: { baud: -1 } })).body.fields).toHaveProperty(['settings.baud']);
  });
});

describe('POST /api/tools/frame', () => {
  const template = {
    version: 1,
    segments: [
      { type: 'literal', id: 'cmd', bytes: '54 55 52 4E 20' }, // "TURN " (invented syntax)
      { type: 'integer', id: 'a', name: 'angle', label: 'Angle', unit: '°', scale: { factor: 100 }, sign: 'always' },
      { type: 'terminator', id: 'end', bytes: '0D' },
    ],
  };
  test('200: bytes, notations, segments, findings', async () => {
    // common practice: 36,000 steps/rev → 45° = 4,500 steps; CR terminator written $0D in a PLC string
    const r = await call(frame, { template, values: { angle: 45 } });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ ok: true, bytes: '54 55 52 4E 20 2B 34 35 30 30 0D', byteCount: 11, findings: [] });
    expect(r.body.notations.iecLiteral).toBe("'TURN +4500$0D'");
    expect(r.body.segments[1]).toEqual({ index: 1, id: 'a', type: 'integer', start: 5, end: 10, name: 'angle', value: 45, raw: 4500 });
  });
  test('typed values are scaled in exact decimals; numbers that cannot be sent are error findings', async () => {
    // computed with Python decimal, ROUND_HALF_UP: 1.005 × 100 = 100.5 → 101
    const exact = await call(frame, { template, values: { angle: '1.005' } });
    expect(exact.body).toMatchObject({ ok: true, bytes: '54 55 52 4E 20 2B 31 30 31 0D', findings: [{ code: 'field-not-integer' }] });
    const hex = await call(frame, { template, values: { angle: '0x10' } });
    expect(hex.body).toMatchObject({ ok: false, bytes: '54 55 52 4E 20 0D', findings: [{ code: 'field-invalid', severity: 'error' }] });
    const huge = await call(frame, { template, values: { angle: 1e300 } });
    expect(huge.body).toMatchObject({ ok: false, findings: [{ code: 'field-too-wide', severity: 'error' }] });
    expect(huge.body.notations.escaped).not.toMatch(/e\+|Infinity/);
  });
  test('findings from the port settings and frame rules', async () => {
    const r = await call(frame, { template, values: {}, settings: { dataBits: 7, frameRules: { terminator: '0A' } } });
    expect(r.status).toBe(200);
    expect(r.body.ok).toBe(false);
    expect(r.body.findings.map((f: { code: string }) => f.code)).toEqual(['field-missing', 'missing-terminator']);
  });
  test('422 for an invalid template', async () => {
    const r = await call(frame, { template: { version: 1, segments: [{ type: 'literal', id: 'x', bytes: '0G' }] }, values: {} });
    expect(r.status).toBe(422);
    expect(r.body.error).toContain('segments.0.bytes');
    expect((await call(frame, { template: { version: 7, segments: [] } })).status).toBe(422);
  });
});

describe('POST /api/tools/sequence', () => {
  // invented syntax (the demo drive's, src/lib/composer/demo.ts): "1!IDX:+4500" then CR
  const step = {
    template: { version: 1, segments: [
      { type: 'literal', id: 'cmd', bytes: '31 21 49 44 58 3A' },
      { type: 'integer', id: 'a', name: 'angle', label: 'Angle', scale: { factor: 36000, divisor: 360 }, sign: 'always', min: -360, max: 360 },
      { type: 'terminator', id: 'end', bytes: '0D' },
    ] },
    values: { angle: 45 },
  };
  test('200: two steps in one string, partial settings filled with defaults', async () => {
    // 45° at 36,000 steps/rev = 4,500 steps; "1!IDX:+4500\r" is 12 bytes, twice is 24; 24 × 10 / 9600 s = 25 ms
    const r = await call(sequence, { steps: [step, { ...step, values: { angle: -45 } }], settings: { frameRules: { terminator: '0D', byteSet: 'printable' } } });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ ok: true, mode: 'one-string', byteCount: 24, findings: [], plcString: { scope: 'whole-string', capacity: null, length: 24, longestLength: 26 } });
    expect(r.body.notations.iecLiteral).toBe("'1!IDX:+4500$0D1!IDX:-4500$0D'");
    expect(r.body.steps.map((s: { start: number; end: number }) => [s.start, s.end])).toEqual([[0, 12], [12, 24]]);
    expect(r.body.timing).toMatchObject({ port: '9600 8-N-1', frameTimeMs: 25, sends: 1, totalMs: 25 });
  });
  test('422 with fields: no steps, too many steps, a bad template in a step, unknown keys, a delay without separate sends', async () => {
    const bad = async (body: object, field: string) => {
      const r = await call(sequence, body);
      expect(r.status, field).toBe(422);
      expect(r.body.fields, field).toHaveProperty([field]);
    };
    await bad({ steps: [] }, 'steps');
    await bad({ steps: Array.from({ length: 33 }, () => step) }, 'steps');
    await bad({ steps: [step, { ...step, template: { version: 1, segments: [{ type: 'literal', id: 'x', bytes: '0G' }] } }] }, 'steps.1.template.segments.0.bytes');
    await bad({ steps: [step], plcStringCapacty: 80 }, '_');
    await bad({ steps: [{ ...step, name: 'x' }] }, 'steps.0');
    await bad({ steps: [step], delayMs: 10 }, 'delayMs');
    await bad({ steps: [step], mode: 'separate', delayMs: -1 }, 'delayMs');
    await bad({ steps: [step], plcStringCapacity: 0 }, 'plcStringCapacity');
    await bad({ steps: [step], mode: 'both' }, 'mode');
    expect((await call(sequence, { steps: Array.from({ length: 32 }, () => step) })).status).toBe(200);
  });
});
