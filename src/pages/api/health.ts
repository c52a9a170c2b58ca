import type { APIRoute } from 'astro';
import { json } from '../../lib/server/http';

/** Liveness and readiness: answers once the database is migrated (middleware runs first). */
export const GET: APIRoute = () => json({ ok: true });
