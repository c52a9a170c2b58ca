/** Role matrix cases for proposals from the field log: everyone reads them, engineers and above decide. */
import type { TeamFixture } from '../../helpers/client';
import { makeDevice } from '../vault-fixtures';
import { logEntry } from '../field-fixtures';
import type { RouteCase } from './types';

const ALL = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
const EDITORS = ['owner', 'admin', 'engineer'] as const;

/** A device with a pending replacement proposal, logged by the team's technician. */
async function pending(t: TeamFixture) {
  const d = await makeDevice(t.members.owner);
  const entry = await logEntry(t.members.technician, d.id, { kind: 'replacement', newSerialNumber: 'MX-2', appliedVersion: 1 });
  return { device: d, id: entry.proposal.id as string };
}

export const proposalCases: RouteCase[] = [
  { method: 'GET', route: '/api/proposals', allowed: ALL, prepare: async () => ({ path: '/api/proposals' }) },
  {
    method: 'GET', route: '/api/proposals/[id]', allowed: ALL,
    prepare: async (t) => ({ path: `/api/proposals/${(await pending(t)).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/proposals/${(await pending(o)).id}` }),
  },
  {
    method: 'POST', route: '/api/proposals/[id]/accept', allowed: EDITORS,
    prepare: async (t) => { const p = await pending(t); return { path: `/api/proposals/${p.id}/accept`, body: { version: p.device.version } }; },
    otherTeam: async (_t, o) => { const p = await pending(o); return { path: `/api/proposals/${p.id}/accept`, body: { version: p.device.version } }; },
  },
  {
    method: 'POST', route: '/api/proposals/[id]/decline', allowed: EDITORS,
    prepare: async (t) => ({ path: `/api/proposals/${(await pending(t)).id}/decline`, body: { note: 'matrix' } }),
    otherTeam: async (_t, o) => ({ path: `/api/proposals/${(await pending(o)).id}/decline`, body: { note: 'matrix' } }),
  },
];
