import { can, type Permission, type Role } from '../permissions';
import { Forbidden, NotFound, Unauthenticated } from './errors';

export interface TeamContext {
  user: { id: string; name: string; email: string };
  team: { id: string; name: string };
  role: Role;
}

/** What team-scoped reads need: the team's id. A share link's page has this and no session (nor the team's name). */
export interface TeamScope {
  team: Pick<TeamContext['team'], 'id'>;
}

/**
 * The one guard for API routes and pages (pages through `loadPage`, ./page.ts): 401 without a session, 404
 * without a team (nothing to act on), 403 when the role lacks the permission.
 */
export function guard(locals: App.Locals, permission: Permission): TeamContext {
  const user = requireUser(locals);
  if (!locals.team) throw new NotFound('You are not a member of any team yet.');
  if (!can(locals.team.role, permission)) {
    throw new Forbidden(`Your role (${locals.team.role}) does not allow ${permission.replace(':', ' ')}.`);
  }
  return { user, team: { id: locals.team.id, name: locals.team.name }, role: locals.team.role };
}

export function requireUser(locals: App.Locals): NonNullable<App.Locals['user']> {
  if (!locals.user) throw new Unauthenticated('Sign in first.');
  return locals.user;
}
