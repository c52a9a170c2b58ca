/** Role matrix cases for every vault route. */
import type { TeamFixture } from '../../helpers/client';
import { makeDevice, makeLink, makeMachine, makeProfile, makeSite, uid } from '../vault-fixtures';
import type { RouteCase } from './types';

const ALL = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
const EDITORS = ['owner', 'admin', 'engineer'] as const;
const FIELD = ['owner', 'admin', 'engineer', 'technician'] as const;
const STAFF = ['owner', 'admin'] as const;

const owner = (t: TeamFixture) => t.members.owner;

/** A fresh record made by the owner, for routes that act on one. */
const fresh = {
  site: (t: TeamFixture) => makeSite(owner(t)),
  machine: (t: TeamFixture) => makeMachine(owner(t)),
  device: (t: TeamFixture) => makeDevice(owner(t)),
  port: async (t: TeamFixture) => (await makeDevice(owner(t))).ports[0],
  link: async (t: TeamFixture) => {
    const d = await makeDevice(owner(t));
    return makeLink(owner(t), d.machineId, [{ portId: d.ports[0].id, role: 'master' }]);
  },
  profile: (t: TeamFixture) => makeProfile(owner(t)),
};
type Kind = keyof typeof fresh;
const plural: Record<Kind, string> = { site: 'sites', machine: 'machines', device: 'devices', port: 'ports', link: 'links', profile: 'profiles' };

const patchBody: Record<Kind, (r: any) => unknown> = {
  site: (r) => ({ version: r.version, notes: 'matrix' }),
  machine: (r) => ({ version: r.version, notes: 'matrix' }),
  device: (r) => ({ version: r.version, notes: 'matrix' }),
  port: (r) => ({ version: r.version, notes: 'matrix' }),
  link: (r) => ({ version: r.version, notes: 'matrix' }),
  profile: (r) => ({ version: r.version, notes: 'matrix' }),
};

function itemCases(kind: Kind): RouteCase[] {
  const route = `/api/${plural[kind]}/[id]`;
  const path = (r: { id: string }) => `/api/${plural[kind]}/${r.id}`;
  return [
    {
      method: 'GET', route, allowed: ALL,
      prepare: async (t) => ({ path: path(await fresh[kind](t)) }),
      otherTeam: async (_t, o) => ({ path: path(await fresh[kind](o)) }),
    },
    {
      method: 'PATCH', route, allowed: EDITORS,
      prepare: async (t) => { const r = await fresh[kind](t); return { path: path(r), body: patchBody[kind](r) }; },
      otherTeam: async (_t, o) => { const r = await fresh[kind](o); return { path: path(r), body: patchBody[kind](r) }; },
    },
    {
      method: 'DELETE', route, allowed: EDITORS,
      prepare: async (t) => ({ path: path(await fresh[kind](t)) }),
      otherTeam: async (_t, o) => ({ path: path(await fresh[kind](o)) }),
    },
  ];
}

const createBody: Record<Exclude<Kind, 'port'>, (t: TeamFixture) => Promise<unknown>> = {
  site: async () => ({ name: `Matrix site ${uid()}` }),
  machine: async (t) => ({ siteId: (await makeSite(owner(t))).id, name: `Matrix line ${uid()}` }),
  device: async (t) => ({ machineId: (await makeMachine(owner(t))).id, tag: `PLC-${uid()}` }),
  link: async (t) => ({ machineId: (await makeMachine(owner(t))).id, name: `Matrix link ${uid()}`, kind: 'point-to-point' }),
  profile: async () => ({ name: `Matrix profile ${uid()}` }),
};

function collectionCases(kind: Exclude<Kind, 'port'>): RouteCase[] {
  const route = `/api/${plural[kind]}`;
  return [
    { method: 'GET', route, allowed: ALL, prepare: async () => ({ path: `${route}?pageSize=5` }) },
    { method: 'POST', route, allowed: EDITORS, prepare: async (t) => ({ path: route, body: await createBody[kind](t) }) },
  ];
}

const trashed = async (t: TeamFixture) => {
  const s = await makeSite(owner(t));
  await owner(t).del(`/api/sites/${s.id}`);
  return `/api/trash/site/${s.id}`;
};

/** A bus with a master and one member, and a body saving its poll plan (the bus planner's save). */
const busPlanRequest = async (t: TeamFixture) => {
  const d = await makeDevice(owner(t));
  const l = await makeLink(owner(t), d.machineId, [{ portId: d.ports[0].id, role: 'master' }, { portId: d.ports[1].id, role: 'slave' }]);
  return { path: `/api/links/${l.id}`, body: { version: l.version, busPlan: { polls: [{ portId: d.ports[1].id, requestBytes: 8, replyBytes: 25, responseMs: 5, perCycle: 1 }] } } };
};

export const vaultCases: RouteCase[] = [
  { method: 'PATCH', route: '/api/links/[id]', allowed: EDITORS, prepare: busPlanRequest, otherTeam: async (_t, o) => busPlanRequest(o) },
  ...(['site', 'machine', 'device', 'link', 'profile'] as const).flatMap(collectionCases),
  ...(Object.keys(fresh) as Kind[]).flatMap(itemCases),
  {
    method: 'GET', route: '/api/ports', allowed: ALL,
    prepare: async (t) => ({ path: `/api/ports?deviceId=${(await makeDevice(owner(t))).id}` }),
    otherTeam: async (_t, o) => ({ path: `/api/ports?deviceId=${(await makeDevice(owner(o))).id}` }),
  },
  {
    method: 'POST', route: '/api/ports', allowed: EDITORS,
    prepare: async (t) => ({ path: '/api/ports', body: { deviceId: (await makeDevice(owner(t))).id, name: `Aux ${uid()}` } }),
    otherTeam: async (_t, o) => ({ path: '/api/ports', body: { deviceId: (await makeDevice(owner(o))).id, name: 'Aux' } }),
  },
  { method: 'GET', route: '/api/devices/search', allowed: ALL, prepare: async () => ({ path: '/api/devices/search?q=drv' }) },
  { method: 'GET', route: '/api/search', allowed: ALL, prepare: async () => ({ path: '/api/search?q=drv' }) },
  {
    method: 'POST', route: '/api/devices/copy', allowed: FIELD,
    prepare: async (t) => {
      const [a, b] = await Promise.all([makeDevice(owner(t)), makeDevice(owner(t))]);
      return { path: '/api/devices/copy', body: { source: { kind: 'device', id: a.id }, target: { kind: 'device', id: b.id } } };
    },
    otherTeam: async (t, o) => {
      const [a, b] = await Promise.all([makeDevice(owner(t)), makeDevice(owner(o))]);
      return { path: '/api/devices/copy', body: { source: { kind: 'device', id: a.id }, target: { kind: 'device', id: b.id } } };
    },
  },
  {
    method: 'POST', route: '/api/devices/[id]/profile', allowed: EDITORS,
    prepare: async (t) => ({ path: `/api/devices/${(await makeDevice(owner(t))).id}/profile`, body: { name: `From device ${uid()}` } }),
    otherTeam: async (_t, o) => ({ path: `/api/devices/${(await makeDevice(owner(o))).id}/profile`, body: { name: 'x' } }),
  },
  { method: 'GET', route: '/api/revisions', allowed: ALL, prepare: async () => ({ path: '/api/revisions?pageSize=5' }) },
  {
    method: 'GET', route: '/api/revisions/[id]', allowed: ALL,
    prepare: async (t) => ({ path: `/api/revisions/${await firstRevision(t)}` }),
    otherTeam: async (_t, o) => ({ path: `/api/revisions/${await firstRevision(o)}` }),
  },
  {
    method: 'POST', route: '/api/revisions/[id]/restore', allowed: EDITORS,
    prepare: async (t) => restoreRequest(t),
    otherTeam: async (_t, o) => restoreRequest(o),
  },
  { method: 'GET', route: '/api/trash', allowed: EDITORS, prepare: async () => ({ path: '/api/trash' }) },
  {
    method: 'POST', route: '/api/trash/[type]/[id]', allowed: EDITORS,
    prepare: async (t) => ({ path: await trashed(t) }),
    otherTeam: async (_t, o) => ({ path: await trashed(o) }),
  },
  {
    method: 'DELETE', route: '/api/trash/[type]/[id]', allowed: STAFF,
    prepare: async (t) => ({ path: await trashed(t) }),
    otherTeam: async (_t, o) => ({ path: await trashed(o) }),
  },
];

async function firstRevision(t: TeamFixture): Promise<string> {
  const s = await makeSite(owner(t));
  const res = await owner(t).get(`/api/revisions?entityType=site&entityId=${s.id}`);
  return res.body.items[0].id;
}

async function restoreRequest(t: TeamFixture) {
  const s = await makeSite(owner(t));
  const edited = await owner(t).patch(`/api/sites/${s.id}`, { version: s.version, name: `${s.name} renamed` });
  const res = await owner(t).get(`/api/revisions?entityType=site&entityId=${s.id}`);
  const first = res.body.items.find((r: { version: number }) => r.version === 1);
  return { path: `/api/revisions/${first.id}/restore`, body: { version: edited.body.version } };
}

