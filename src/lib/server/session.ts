import { parseCookies } from 'better-auth/cookies';
import { client } from '../../db/client';
import type { Role } from '../permissions';
import { auth, SESSION_EXPIRES_IN, SESSION_UPDATE_AGE } from './auth';
import { verifySignedValue } from './signed-cookie';
import { SESSION_SQL, type SessionRow } from './session-sql';

export interface TeamOfUser {
  id: string;
  name: string;
  role: Role;
}

export interface CurrentSession {
  sessionId: string;
  user: { id: string; name: string; email: string };
  /** The user's teams, oldest membership first. */
  teams: TeamOfUser[];
  /** Set-Cookie headers to pass on when the auth layer extended the session. */
  setCookies: string[];
}

/** The session token from the request's session cookie (the auth layer's name for it), once its signature checks out. */
async function sessionToken(headers: Headers): Promise<string | null> {
  const cookie = headers.get('cookie');
  if (!cookie) return null;
  const { authCookies, secret } = await auth.$context;
  const name = authCookies.sessionToken.name;
  // Two session cookies (one planted from a sibling host, say) would let this lookup and the auth layer's
  // read different sessions: such a request has no session at all.
  if (cookie.split(';').filter((c) => c.trim().startsWith(`${name}=`)).length > 1) return null;
  const signed = parseCookies(cookie).get(name);
  return signed ? verifySignedValue(signed, secret) : null;
}

/**
 * The signed-in user and their teams for a request, in one indexed query: the session cookie's
 * signature is checked as the auth layer checks it, then its token is looked up directly (revocation
 * and sign-out take effect at once), and the memberships come along as JSON. When the session is due
 * for its daily extension, the auth layer does that and returns fresh cookies.
 */
export async function readSession(headers: Headers): Promise<CurrentSession | null> {
  const token = await sessionToken(headers);
  if (!token) return null;
  const row = (await client.execute({ sql: SESSION_SQL, args: [token] })).rows[0] as unknown as SessionRow | undefined;
  const now = Date.now();
  if (!row || Number(row.expiresAt) <= now) return null;
  const current: CurrentSession = {
    sessionId: row.sessionId,
    user: { id: row.id, name: row.name, email: row.email },
    teams: JSON.parse(row.teams) as TeamOfUser[],
    setCookies: [],
  };
  const refreshDue = Number(row.expiresAt) - SESSION_EXPIRES_IN * 1000 + SESSION_UPDATE_AGE * 1000 <= now;
  if (refreshDue) {
    const refreshed = await auth.api.getSession({ headers, returnHeaders: true });
    if (!refreshed.response) return null;
    current.setCookies = refreshed.headers.getSetCookie();
  }
  return current;
}
