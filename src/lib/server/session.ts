import { eq } from 'drizzle-orm';
import { getSessionCookie } from 'better-auth/cookies';
import { db } from '../../db/client';
import { session, user } from '../../db/schema';
import { auth, SESSION_EXPIRES_IN, SESSION_UPDATE_AGE } from './auth';

export interface CurrentSession {
  sessionId: string;
  user: { id: string; name: string; email: string };
  /** Set-Cookie headers to pass on when the auth layer extended the session. */
  setCookies: string[];
}

/**
 * The signed-in user for a request, in one indexed query: the session cookie's token is looked up
 * directly (it is a random secret of its own; revocation and sign-out take effect at once). When the
 * session is due for its daily extension, the auth layer does that and returns fresh cookies.
 */
export async function readSession(headers: Headers): Promise<CurrentSession | null> {
  const signed = getSessionCookie(headers);
  if (!signed) return null;
  const token = decodeURIComponent(signed).split('.')[0];
  if (!token) return null;
  const [row] = await db
    .select({ sessionId: session.id, expiresAt: session.expiresAt, id: user.id, name: user.name, email: user.email })
    .from(session)
    .innerJoin(user, eq(user.id, session.userId))
    .where(eq(session.token, token));
  const now = Date.now();
  if (!row || row.expiresAt.getTime() <= now) return null;
  const current = { sessionId: row.sessionId, user: { id: row.id, name: row.name, email: row.email }, setCookies: [] as string[] };
  const refreshDue = row.expiresAt.getTime() - SESSION_EXPIRES_IN * 1000 + SESSION_UPDATE_AGE * 1000 <= now;
  if (refreshDue) {
    const refreshed = await auth.api.getSession({ headers, returnHeaders: true });
    if (!refreshed.response) return null;
    current.setCookies = refreshed.headers.getSetCookie();
  }
  return current;
}
