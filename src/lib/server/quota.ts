import { sql } from 'drizzle-orm';
import { db } from '../../db/client';

/**
 * Fixed-window counter kept in the database so every app server shares it.
 * Returns whether this request is allowed and how many seconds until the window resets.
 */
export async function takeQuota(key: string, max: number, windowSeconds: number): Promise<{ allowed: boolean; retryAfter: number }> {
  const now = Date.now();
  const windowStart = now - (now % (windowSeconds * 1000));
  const rows = await db.all<{ count: number }>(sql`
    INSERT INTO request_quota (key, window_start, count) VALUES (${key}, ${windowStart}, 1)
    ON CONFLICT(key) DO UPDATE SET
      count = CASE WHEN window_start = excluded.window_start THEN count + 1 ELSE 1 END,
      window_start = excluded.window_start
    RETURNING count`);
  const count = Number(rows[0]?.count ?? 1);
  return { allowed: count <= max, retryAfter: Math.ceil((windowStart + windowSeconds * 1000 - now) / 1000) };
}
