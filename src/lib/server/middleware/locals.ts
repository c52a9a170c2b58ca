import type { MiddlewareHandler } from 'astro';
import { readSession } from '../session';
import { config } from '../../../config';

export const TEAM_COOKIE = 'bb_team';

/** Fills locals with the signed-in user, their teams and the active team; nothing else. */
export const fillLocals: MiddlewareHandler = async (context, next) => {
  const { locals, request, url } = context;
  locals.user = null;
  locals.sessionId = null;
  locals.teams = [];
  locals.team = null;
  if (url.pathname.startsWith('/_astro/') || url.pathname.startsWith('/api/auth/') || url.pathname.startsWith('/api/tools/')) {
    return next();
  }
  const session = await readSession(request.headers);
  if (!session) return next();
  locals.user = session.user;
  locals.sessionId = session.sessionId;
  locals.teams = session.teams;
  const wanted = context.cookies.get(TEAM_COOKIE)?.value;
  locals.team = locals.teams.find((t) => t.id === wanted) ?? locals.teams[0] ?? null;
  const response = await next();
  for (const cookie of session.setCookies) response.headers.append('set-cookie', cookie);
  return response;
};

/** Remembers the active team for the team switcher (validated against membership on every request). */
export function setActiveTeam(cookies: import('astro').AstroCookies, teamId: string): void {
  cookies.set(TEAM_COOKIE, teamId, { path: '/', httpOnly: true, sameSite: 'lax', secure: config.secureCookies, maxAge: 31_536_000 });
}
