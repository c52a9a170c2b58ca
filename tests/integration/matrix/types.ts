import type { Role } from '../../../src/lib/permissions';
import type { TeamFixture } from '../../helpers/client';

export interface PreparedRequest {
  path: string;
  body?: unknown;
}

/** One API route and method, with the roles that may use it. */
export interface RouteCase {
  method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** Route as its file path under src/pages, e.g. `/api/members/[userId]`. */
  route: string;
  /** Roles expected to succeed (2xx); every other role must get 403. */
  allowed: readonly Role[];
  /** Builds the request as `role` in `team`; may create what the route acts on. */
  prepare: (team: TeamFixture, role: Role) => Promise<PreparedRequest>;
  /** The same request aimed at a record of `other` team (expect 404); omit for routes without ids. */
  otherTeam?: (team: TeamFixture, other: TeamFixture) => Promise<PreparedRequest>;
  /** Run each role against a fresh team (for routes that destroy the team). */
  freshTeam?: boolean;
}

/** Routes deliberately open without a session (checked separately). */
export interface PublicRoute {
  method: string;
  route: string;
  reason: string;
}
