import { can, type Permission, type Role } from '../permissions';
import { AppError, Forbidden, NotFound, Unauthenticated } from './errors';
import { httpStatus } from './http';

export interface TeamContext {
  user: { id: string; name: string; email: string };
  team: { id: string; name: string };
  role: Role;
}

/**
 * The one guard for API routes and pages: 401 without a session, 404 without a team
 * (nothing to act on), 403 when the role lacks the permission.
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

/** Page variant: the same checks, answered as a redirect to sign-in or an error status for the page to show. */
export function guardPage(
  locals: App.Locals,
  url: URL,
  permission: Permission,
): { ok: true; ctx: TeamContext } | { ok: false; response?: Response; status: number; message: string } {
  try {
    return { ok: true, ctx: guard(locals, permission) };
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    const status = httpStatus(err);
    if (status === 401) {
      const next = encodeURIComponent(url.pathname + url.search);
      return { ok: false, status: 401, message: err.message, response: redirect(`/sign-in?next=${next}`) };
    }
    if (status === 404 && !locals.team) {
      return { ok: false, status: 302, message: err.message, response: redirect('/teams/new') };
    }
    return { ok: false, status, message: err.message };
  }
}

function redirect(location: string): Response {
  return new Response(null, { status: 302, headers: { location } });
}
