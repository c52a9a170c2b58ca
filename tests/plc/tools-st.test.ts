/** The handler of POST /api/tools/st alone (through the server: tests/integration/tools-st.test.ts). */
import { describe, expect, test } from 'vitest';
import { statusQueryTemplate } from '~/lib/composer/demo';
import { POST } from '~/pages/api/tools/st';
import { runSt } from './st-eval';

async function call(body: unknown) {
  const request = new Request('http://localhost/api/tools/st', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  const res = await POST({ request } as any);
  return { status: res.status, body: (await res.json()) as any };
}

describe('POST /api/tools/st (handler)', () => {
  test('the status query with its XOR-8, named after the template when no name is given', async () => {
    const r = await call({ template: { ...statusQueryTemplate, name: 'Status?' } });
    expect(r.status).toBe(200);
    expect(r.body.name).toBe('Status');
    expect(runSt(r.body.code, { address: 1 }).result).toBe('1?STA*48\r');
  });

  test('a binary CRC gives the byte form, with a note saying why', async () => {
    const template = { version: 1, segments: [{ type: 'literal', id: 'a', bytes: '01 03 00 00 00 01' }, { type: 'checksum', id: 'c', algorithm: 'CRC-16/MODBUS' }] };
    const r = await call({ template, name: 'Read one register' });
    expect(r.status).toBe(200);
    expect(r.body.form).toBe('bytes');
    expect(r.body.findings[0].message).toMatch(/ARRAY OF BYTE/);
    const run = runSt(r.body.code, {});
    // Modbus over Serial Line V1.02: 01 03 00 00 00 01 has the CRC 84 0A, low byte first
    expect((run.outputs.BYTES as number[]).slice(0, run.outputs.LENGTH as number)).toEqual([0x01, 0x03, 0x00, 0x00, 0x00, 0x01, 0x84, 0x0a]);
  });

  test('422 for a 32-bit CRC as decimal characters, naming the fix', async () => {
    const template = { version: 1, segments: [{ type: 'literal', id: 'a', bytes: '41' }, { type: 'checksum', id: 'c', algorithm: 'CRC-32', encoding: 'ascii-decimal' }] };
    const r = await call({ template });
    expect(r).toEqual({ status: 422, body: { error: expect.stringMatching(/hex characters or binary/) } });
  });
});
