/**
 * The role matrix: every API route, every role. New routes must join a case list below;
 * the coverage check at the bottom fails for any route file that is not listed.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { ROLES } from '../../src/lib/permissions';
import { createTeamWithRoles, TestClient, type TeamFixture } from '../helpers/client';
import { platformCases, platformPublicRoutes } from './matrix/platform-cases';
import type { PublicRoute, RouteCase } from './matrix/types';
import { extraCases, extraPublicRoutes } from './matrix/index';

const cases: RouteCase[] = [...platformCases, ...extraCases];
const publicRoutes: PublicRoute[] = [...platformPublicRoutes, ...extraPublicRoutes];

let team: TeamFixture;
let other: TeamFixture;

beforeAll(async () => {
  [team, other] = await Promise.all([createTeamWithRoles('matrix'), createTeamWithRoles('matrix-other')]);
}, 60_000);

describe.each(cases)('$method $route', (c) => {
  it.each(ROLES)('as %s', async (role) => {
    const fixture = c.freshTeam ? await createTeamWithRoles('matrix-fresh') : team;
    const req = await c.prepare(fixture, role);
    const res = await fixture.members[role].request(c.method, req.path, req.body);
    if (c.allowed.includes(role)) {
      expect(res.status, JSON.stringify(res.body)).toBeGreaterThanOrEqual(200);
      expect(res.status, JSON.stringify(res.body)).toBeLessThan(300);
    } else {
      expect(res.status, JSON.stringify(res.body)).toBe(403);
    }
  });

  it('without a session answers 401', async () => {
    const req = await c.prepare(team, 'owner');
    const res = await new TestClient().request(c.method, req.path, req.body);
    expect(res.status).toBe(401);
  });

  it.runIf(!!c.otherTeam)("with another team's id answers 404", async () => {
    const req = await c.otherTeam!(team, other);
    const res = await team.members.owner.request(c.method, req.path, req.body);
    expect(res.status, JSON.stringify(res.body)).toBe(404);
  });
});

describe('coverage', () => {
  function routeFiles(dir: string): string[] {
    return readdirSync(dir).flatMap((name) => {
      const full = join(dir, name);
      return statSync(full).isDirectory() ? routeFiles(full) : full.endsWith('.ts') ? [full] : [];
    });
  }

  it('lists every API route and method in the matrix or as deliberately public', () => {
    const missing: string[] = [];
    for (const file of routeFiles('src/pages/api')) {
      const route = '/' + relative('src/pages', file).replace(/\.ts$/, '').replace(/\/index$/, '');
      const methods = [...readFileSync(file, 'utf8').matchAll(/export const (GET|POST|PATCH|PUT|DELETE|ALL)\b/g)].map((m) => m[1]!);
      for (const method of methods) {
        const listed =
          cases.some((c) => c.route === route && c.method === method) ||
          publicRoutes.some((p) => p.route === route && p.method === method);
        if (!listed) missing.push(`${method} ${route}`);
      }
    }
    expect(missing).toEqual([]);
  });
});
