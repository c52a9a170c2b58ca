/** Builders for command library tests: a jog command on a fresh device, made through the API. */
import type { TestClient } from '../helpers/client';
import { expectOk, makeDevice, makeProfile, uid } from './vault-fixtures';

/** `1!JOG:` + signed angle (° × 100 → steps) + CR: our own demo syntax. */
export const jogTemplate = () => ({
  version: 1,
  segments: [
    { type: 'literal', id: 'head', bytes: '31 21 4A 4F 47 3A' },
    { type: 'integer', id: 'angle', name: 'angle', label: 'Jog angle', unit: '°', scale: { factor: 100 }, sign: 'always', min: -360, max: 360 },
    { type: 'terminator', id: 'cr', bytes: '0D' },
  ],
});

export const jogBody = (owner: { deviceId?: string; profileId?: string }, over: Record<string, unknown> = {}) => ({
  ...owner,
  name: `Jog ${uid()}`,
  purpose: 'Jog forward one degree',
  template: jogTemplate(),
  fieldValues: { angle: 1 },
  rawUnits: { angle: 'steps' },
  movesMachinery: true,
  ...over,
});

export async function makeCommand(c: TestClient, owner?: { deviceId?: string; profileId?: string }, over: Record<string, unknown> = {}) {
  owner ??= { deviceId: (await makeDevice(c)).id };
  return expectOk(await c.post('/api/commands', jogBody(owner, over)), 201);
}

export { makeDevice, makeProfile };
