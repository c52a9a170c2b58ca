/** Builders for vault integration tests: a site → machine → device → ports tree made through the API. */
import type { TestClient } from '../helpers/client';

let n = 0;
export const uid = () => `${Date.now().toString(36)}${(n++).toString(36)}`;

export const rs485 = (over: Record<string, unknown> = {}) => ({
  interface: 'rs485-2w', baud: 9600, dataBits: 8, parity: 'even', stopBits: 1, handshake: 'none',
  rs485Direction: 'auto', nodeAddress: 1, termination: false, bias: false, protocol: 'modbus-rtu', ...over,
});

export function expectOk(res: { status: number; body: unknown }, status = 200) {
  if (res.status !== status) throw new Error(`expected ${status}, got ${res.status}: ${JSON.stringify(res.body)}`);
  return res.body as any;
}

export async function makeSite(c: TestClient, name = `Site ${uid()}`) {
  return expectOk(await c.post('/api/sites', { name, customer: 'Invented Dairy Co-op' }), 201);
}

export async function makeMachine(c: TestClient, siteId?: string) {
  siteId ??= (await makeSite(c)).id;
  return expectOk(await c.post('/api/machines', { siteId, name: `Line ${uid()}` }), 201);
}

export async function makeDevice(c: TestClient, machineId?: string, extra: Record<string, unknown> = {}) {
  machineId ??= (await makeMachine(c)).id;
  return expectOk(
    await c.post('/api/devices', {
      machineId,
      tag: `DRV-${uid()}`,
      role: 'drive',
      maker: 'Quillmoor',
      model: 'QD-40',
      ports: [
        { name: 'RS-485', settings: rs485() },
        { name: 'Service', settings: { interface: 'rs232', baud: 19200 } },
      ],
      ...extra,
    }),
    201,
  );
}

export async function makeLink(c: TestClient, machineId: string, members: { portId: string; role: string }[]) {
  return expectOk(await c.post('/api/links', { machineId, name: `Bus ${uid()}`, kind: 'rs485-bus', members }), 201);
}

export async function makeProfile(c: TestClient) {
  return expectOk(await c.post('/api/profiles', { name: `Profile ${uid()}`, role: 'scale', maker: 'Tallowby', model: 'TS-9', ports: [{ name: 'COM', settings: { baud: 4800 } }] }), 201);
}
