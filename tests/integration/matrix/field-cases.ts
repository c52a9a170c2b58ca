/** Role matrix cases for field work and sharing: field log, attachments, share links, import and export. */
import type { TeamFixture } from '../../helpers/client';
import { makeDevice, makeMachine, uid } from '../vault-fixtures';
import { logEntry, makeShare, rawUpload } from '../field-fixtures';
import type { PublicRoute, RouteCase } from './types';

const ALL = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
const EDITORS = ['owner', 'admin', 'engineer'] as const;
const FIELD = ['owner', 'admin', 'engineer', 'technician'] as const;
const owner = (t: TeamFixture) => t.members.owner;
const device = (t: TeamFixture) => makeDevice(owner(t));

const csv = (machineId: string) => ({ machineId, csv: `tag,port,settings\nMX-${uid()},COM1,9600 8-N-1\n`, mapping: { tag: 'tag', portName: 'port', shorthand: 'settings' }, apply: true });

export const fieldCases: RouteCase[] = [
  {
    method: 'GET', route: '/api/devices/[id]/field-log', allowed: ALL,
    prepare: async (t) => ({ path: `/api/devices/${(await device(t)).id}/field-log` }),
    otherTeam: async (_t, o) => ({ path: `/api/devices/${(await device(o)).id}/field-log` }),
  },
  {
    method: 'POST', route: '/api/devices/[id]/field-log', allowed: FIELD,
    prepare: async (t) => ({ path: `/api/devices/${(await device(t)).id}/field-log`, body: { kind: 'verified', note: 'matrix' } }),
    otherTeam: async (_t, o) => ({ path: `/api/devices/${(await device(o)).id}/field-log`, body: { kind: 'verified' } }),
  },
  {
    method: 'POST', route: '/api/field-log/[entryId]/annotations', allowed: FIELD,
    prepare: async (t) => ({ path: `/api/field-log/${(await logEntry(owner(t), (await device(t)).id)).id}/annotations`, body: { note: 'matrix' } }),
    otherTeam: async (_t, o) => ({ path: `/api/field-log/${(await logEntry(owner(o), (await device(o)).id)).id}/annotations`, body: { note: 'x' } }),
  },
  {
    method: 'GET', route: '/api/attachments', allowed: ALL,
    prepare: async (t) => ({ path: `/api/attachments?ownerType=device&ownerId=${(await device(t)).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/attachments?ownerType=device&ownerId=${(await device(o)).id}` }),
  },
  {
    // The matrix client sends a string body: the route takes it as the raw bytes of a configuration file.
    method: 'POST', route: '/api/attachments', allowed: FIELD,
    prepare: async (t) => ({ path: `/api/attachments?ownerType=device&ownerId=${(await device(t)).id}&kind=config&name=matrix.cfg`, body: 'matrix' }),
    otherTeam: async (_t, o) => ({ path: `/api/attachments?ownerType=device&ownerId=${(await device(o)).id}&kind=config&name=matrix.cfg`, body: 'matrix' }),
  },
  {
    method: 'GET', route: '/api/attachments/[id]', allowed: ALL,
    prepare: async (t) => ({ path: `/api/attachments/${(await rawUpload(owner(t), (await device(t)).id)).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/attachments/${(await rawUpload(owner(o), (await device(o)).id)).id}` }),
  },
  {
    method: 'DELETE', route: '/api/attachments/[id]', allowed: EDITORS,
    prepare: async (t) => ({ path: `/api/attachments/${(await rawUpload(owner(t), (await device(t)).id)).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/attachments/${(await rawUpload(owner(o), (await device(o)).id)).id}` }),
  },
  { method: 'GET', route: '/api/shares', allowed: EDITORS, prepare: async () => ({ path: '/api/shares' }) },
  {
    method: 'POST', route: '/api/shares', allowed: EDITORS,
    prepare: async (t) => ({ path: '/api/shares', body: { scopeType: 'machine', scopeId: (await makeMachine(owner(t))).id } }),
    otherTeam: async (_t, o) => ({ path: '/api/shares', body: { scopeType: 'machine', scopeId: (await makeMachine(owner(o))).id } }),
  },
  {
    method: 'DELETE', route: '/api/shares/[id]', allowed: EDITORS,
    prepare: async (t) => ({ path: `/api/shares/${(await makeShare(owner(t), 'machine', (await makeMachine(owner(t))).id)).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/shares/${(await makeShare(owner(o), 'machine', (await makeMachine(owner(o))).id)).id}` }),
  },
  {
    method: 'POST', route: '/api/shares/[id]/email', allowed: EDITORS,
    prepare: async (t) => ({ path: `/api/shares/${(await makeShare(owner(t), 'machine', (await makeMachine(owner(t))).id)).id}/email`, body: { to: 'maintenance@example.test' } }),
    otherTeam: async (_t, o) => ({ path: `/api/shares/${(await makeShare(owner(o), 'machine', (await makeMachine(owner(o))).id)).id}/email`, body: { to: 'x@example.test' } }),
  },
  {
    method: 'POST', route: '/api/field/card-email', allowed: EDITORS,
    prepare: async (t) => ({ path: '/api/field/card-email', body: { deviceId: (await device(t)).id, to: 'colleague@example.test' } }),
    otherTeam: async (_t, o) => ({ path: '/api/field/card-email', body: { deviceId: (await device(o)).id, to: 'x@example.test' } }),
  },
  {
    // Every role may keep cards on a phone; another team's machine comes back under `missing` (checked in offline.test.ts).
    method: 'GET', route: '/api/field/kept', allowed: ALL,
    prepare: async (t) => ({ path: `/api/field/kept?machine=${(await makeMachine(owner(t))).id}` }),
  },
  { method: 'GET', route: '/api/export', allowed: EDITORS, prepare: async () => ({ path: '/api/export' }) },
  { method: 'GET', route: '/api/export/csv', allowed: EDITORS, prepare: async () => ({ path: '/api/export/csv?table=devices' }) },
  {
    method: 'POST', route: '/api/import', allowed: EDITORS,
    prepare: async () => ({ path: '/api/import', body: { document: { format: 'baudbook-export', version: 1, exportedAt: new Date().toISOString(), source: { team: 'Matrix', scope: 'team', siteId: null }, sites: [], machines: [], profiles: [], devices: [], ports: [], links: [], commands: [] } } }),
  },
  {
    method: 'POST', route: '/api/import/csv', allowed: EDITORS,
    prepare: async (t) => ({ path: '/api/import/csv', body: csv((await makeMachine(owner(t))).id) }),
    otherTeam: async (_t, o) => ({ path: '/api/import/csv', body: csv((await makeMachine(owner(o))).id) }),
  },
  { method: 'GET', route: '/api/import/jobs', allowed: EDITORS, prepare: async () => ({ path: '/api/import/jobs' }) },
];

export const fieldPublicRoutes: PublicRoute[] = [
  { method: 'GET', route: '/s/[token]', reason: 'share-link page for people without an account: read-only cards of one machine or site, opened by an unguessable token (only its hash is stored); expired and revoked links answer 404' },
];
