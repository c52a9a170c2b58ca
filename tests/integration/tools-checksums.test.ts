/** The public checksum and frame tools through the running server (the handlers alone are in tests/frame/tools-api.test.ts). */
import { describe, expect, inject, test } from 'vitest';

describe('checksum tools through the running server', () => {
  const post = async (path: string, body: unknown) => {
    const base = inject('baseUrl');
    const res = await fetch(`${base}${path}`, { method: 'POST', headers: { 'content-type': 'application/json', origin: base }, body: JSON.stringify(body) });
    return { status: res.status, body: (await res.json()) as any };
  };
  test('new models, custom parameters and ASCII-only names', async () => {
    // CRC RevEng catalogue: CRC-32/BZIP2 check 0xFC891918; CRC-8/AUTOSAR check 0xDF
    expect((await post('/api/tools/checksum', { algorithm: 'CRC-32/BZIP2', bytes: '313233343536373839' })).body).toMatchObject({ value: '0xFC891918', byteOrder: 'high-first' });
    expect((await post('/api/tools/checksum', { algorithm: 'crc-8/autosar', bytes: '313233343536373839' })).body).toMatchObject({ algorithm: 'CRC-8/AUTOSAR', value: '0xDF' });
    expect((await post('/api/tools/checksum', { algorithm: 'crc-16/modbuſ', bytes: '01' })).status).toBe(422);
  });
  test('frame tool: Modbus ASCII LRC over the decoded hex, and the protocol findings', async () => {
    // Modbus over Serial Line V1.02, 2.5.2.2: ":" 01 03 00 00 00 01 LRC CR LF, LRC 0xFB
    const segments = [
      { type: 'literal', id: 'colon', bytes: '3A' },
      { type: 'literal', id: 'pdu', bytes: '30 31 30 33 30 30 30 30 30 30 30 31' },
      { type: 'checksum', id: 'lrc', algorithm: 'LRC', range: { from: 1, to: 'checksum' }, encoding: 'ascii-hex', over: 'decoded-hex' },
      { type: 'terminator', id: 'end', bytes: '0D 0A' },
    ];
    const good = await post('/api/tools/frame', { template: { version: 1, segments }, settings: { protocol: 'modbus-ascii' } });
    expect(good.status).toBe(200);
    expect(good.body).toMatchObject({ ok: true, findings: [], notations: { escaped: ':010300000001FB\\r\\n' } });
    const chars = await post('/api/tools/frame', { template: { version: 1, segments: segments.map((s) => (s.id === 'lrc' ? { ...s, over: 'bytes' } : s)) }, settings: { protocol: 'modbus-ascii' } });
    expect(chars.body.findings.map((f: { code: string }) => f.code)).toEqual(['checksum-over-characters']);
    // Modbus over Serial Line V1.02, 2.5.1.2: CRC-16/MODBUS low byte first; 02 07 gives 0x1241, sent 41 12 (6.2.2)
    const rtu = (byteOrder?: string) => post('/api/tools/frame', {
      template: { version: 1, segments: [{ type: 'literal', id: 'p', bytes: '02 07' }, { type: 'checksum', id: 'crc', algorithm: 'CRC-16/MODBUS', ...(byteOrder ? { byteOrder } : {}) }] },
      settings: { protocol: 'modbus-rtu', parity: 'even' },
    });
    expect((await rtu()).body).toMatchObject({ ok: true, bytes: '02 07 41 12', findings: [] });
    const high = await rtu('high-first');
    expect(high.body).toMatchObject({ ok: false, bytes: '02 07 12 41', findings: [{ code: 'checksum-byte-order', severity: 'error', range: [2, 4] }] });
  });
});
