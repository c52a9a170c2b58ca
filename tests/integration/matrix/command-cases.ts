/** Role matrix cases for the command library routes. */
import type { TeamFixture } from '../../helpers/client';
import { jogBody, makeCommand, makeDevice } from '../command-fixtures';
import { makeMachine } from '../vault-fixtures';
import type { RouteCase } from './types';

const ALL = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
const EDITORS = ['owner', 'admin', 'engineer'] as const;
const STAFF = ['owner', 'admin'] as const;

const owner = (t: TeamFixture) => t.members.owner;
const fresh = (t: TeamFixture) => makeCommand(owner(t));
const at = (suffix = '') => (c: { id: string }) => `/api/commands/${c.id}${suffix}`;

async function restoreRequest(t: TeamFixture) {
  const c = await fresh(t);
  const revs = await owner(t).get(`/api/commands/${c.id}/revisions`);
  return { path: `/api/commands/${c.id}/restore`, body: { revisionId: revs.body.items[0].id, version: c.version } };
}

/** A command moved to the trash on its own, as the trash routes address it. */
async function trashed(t: TeamFixture) {
  const c = await fresh(t);
  await owner(t).del(`/api/commands/${c.id}`);
  return { path: `/api/trash/command/${c.id}` };
}

export const commandCases: RouteCase[] = [
  {
    method: 'GET', route: '/api/devices/[id]/plc-code', allowed: ALL,
    prepare: async (t) => ({ path: `/api/devices/${(await makeDevice(owner(t))).id}/plc-code` }),
    otherTeam: async (_t, o) => ({ path: `/api/devices/${(await makeDevice(owner(o))).id}/plc-code` }),
  },
  {
    method: 'GET', route: '/api/machines/[id]/plc-code', allowed: ALL,
    prepare: async (t) => ({ path: `/api/machines/${(await makeMachine(owner(t))).id}/plc-code` }),
    otherTeam: async (_t, o) => ({ path: `/api/machines/${(await makeMachine(owner(o))).id}/plc-code` }),
  },
  {
    method: 'GET', route: '/api/commands', allowed: ALL,
    prepare: async (t) => ({ path: `/api/commands?deviceId=${(await makeDevice(owner(t))).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/commands?deviceId=${(await makeDevice(owner(o))).id}` }),
  },
  {
    method: 'POST', route: '/api/commands', allowed: EDITORS,
    prepare: async (t) => ({ path: '/api/commands', body: jogBody({ deviceId: (await makeDevice(owner(t))).id }) }),
    otherTeam: async (_t, o) => ({ path: '/api/commands', body: jogBody({ deviceId: (await makeDevice(owner(o))).id }) }),
  },
  {
    method: 'GET', route: '/api/commands/[id]', allowed: ALL,
    prepare: async (t) => ({ path: at()(await fresh(t)) }),
    otherTeam: async (_t, o) => ({ path: at()(await fresh(o)) }),
  },
  {
    method: 'PATCH', route: '/api/commands/[id]', allowed: EDITORS,
    prepare: async (t) => { const c = await fresh(t); return { path: at()(c), body: { version: c.version, notes: 'matrix' } }; },
    otherTeam: async (_t, o) => { const c = await fresh(o); return { path: at()(c), body: { version: c.version, notes: 'matrix' } }; },
  },
  {
    method: 'DELETE', route: '/api/commands/[id]', allowed: EDITORS,
    prepare: async (t) => ({ path: at()(await fresh(t)) }),
    otherTeam: async (_t, o) => ({ path: at()(await fresh(o)) }),
  },
  {
    method: 'GET', route: '/api/commands/[id]/revisions', allowed: ALL,
    prepare: async (t) => ({ path: at('/revisions')(await fresh(t)) }),
    otherTeam: async (_t, o) => ({ path: at('/revisions')(await fresh(o)) }),
  },
  {
    method: 'POST', route: '/api/commands/[id]/restore', allowed: EDITORS,
    prepare: (t) => restoreRequest(t),
    otherTeam: (_t, o) => restoreRequest(o),
  },
  {
    method: 'POST', route: '/api/commands/[id]/copy', allowed: EDITORS,
    prepare: async (t) => ({ path: at('/copy')(await fresh(t)), body: { deviceId: (await makeDevice(owner(t))).id } }),
    otherTeam: async (t, o) => ({ path: at('/copy')(await fresh(o)), body: { deviceId: (await makeDevice(owner(t))).id } }),
  },
  // The trash routes again, for a command (the vault cases use a site).
  { method: 'POST', route: '/api/trash/[type]/[id]', allowed: EDITORS, prepare: (t) => trashed(t), otherTeam: (_t, o) => trashed(o) },
  { method: 'DELETE', route: '/api/trash/[type]/[id]', allowed: STAFF, prepare: (t) => trashed(t), otherTeam: (_t, o) => trashed(o) },
];
