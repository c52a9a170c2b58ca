import { joinTeam } from '../../helpers/client';
import type { PublicRoute, RouteCase } from './types';

const ALL = ['owner', 'admin', 'engineer', 'technician', 'viewer'] as const;
const STAFF = ['owner', 'admin'] as const;

let n = 0;
const uniqueEmail = () => `matrix-${Date.now().toString(36)}-${n++}@example.test`;

export const platformPublicRoutes: PublicRoute[] = [
  { method: 'ALL', route: '/api/auth/[...all]', reason: 'sign-up, sign-in and reset happen before there is a session' },
  { method: 'GET', route: '/api/health', reason: 'readiness probe for load balancers' },
  { method: 'POST', route: '/api/teams', reason: 'any signed-in user may start a team (401 without a session, tested below)' },
  { method: 'POST', route: '/api/session/team', reason: 'switches among the caller’s own teams (tested in platform.test.ts)' },
  { method: 'POST', route: '/api/invitations/accept', reason: 'the invited user is not a member yet (tested in platform.test.ts)' },
];

export const platformCases: RouteCase[] = [
  { method: 'GET', route: '/api/teams/current', allowed: ALL, prepare: async () => ({ path: '/api/teams/current' }) },
  {
    method: 'PATCH',
    route: '/api/teams/current',
    allowed: STAFF,
    prepare: async (t) => ({ path: '/api/teams/current', body: { name: t.teamName } }),
  },
  {
    method: 'DELETE',
    route: '/api/teams/current',
    allowed: ['owner'],
    freshTeam: true,
    prepare: async (t) => ({ path: '/api/teams/current', body: { confirmName: t.teamName } }),
  },
  {
    method: 'POST',
    route: '/api/teams/transfer',
    allowed: ['owner'],
    freshTeam: true,
    prepare: async (t) => ({ path: '/api/teams/transfer', body: { userId: t.members.engineer.user!.id } }),
    otherTeam: async (_t, other) => ({ path: '/api/teams/transfer', body: { userId: other.members.engineer.user!.id } }),
  },
  { method: 'GET', route: '/api/members', allowed: ALL, prepare: async () => ({ path: '/api/members' }) },
  {
    method: 'PATCH',
    route: '/api/members/[userId]',
    allowed: STAFF,
    prepare: async (t) => {
      const target = await joinTeam(t.members.owner, 'viewer', 'matrix-target');
      return { path: `/api/members/${target.user!.id}`, body: { role: 'technician' } };
    },
    otherTeam: async (_t, other) => ({ path: `/api/members/${other.members.viewer.user!.id}`, body: { role: 'technician' } }),
  },
  {
    method: 'DELETE',
    route: '/api/members/[userId]',
    allowed: STAFF,
    prepare: async (t) => {
      const target = await joinTeam(t.members.owner, 'viewer', 'matrix-target');
      return { path: `/api/members/${target.user!.id}` };
    },
    otherTeam: async (_t, other) => ({ path: `/api/members/${other.members.viewer.user!.id}` }),
  },
  {
    method: 'POST',
    route: '/api/invitations',
    allowed: STAFF,
    prepare: async () => ({ path: '/api/invitations', body: { email: uniqueEmail(), role: 'viewer' } }),
  },
  {
    method: 'DELETE',
    route: '/api/invitations/[id]',
    allowed: STAFF,
    prepare: async (t) => {
      const inv = await t.members.owner.post('/api/invitations', { email: uniqueEmail(), role: 'viewer' });
      return { path: `/api/invitations/${inv.body.id}` };
    },
    otherTeam: async (_t, other) => {
      const inv = await other.members.owner.post('/api/invitations', { email: uniqueEmail(), role: 'viewer' });
      return { path: `/api/invitations/${inv.body.id}` };
    },
  },
];
