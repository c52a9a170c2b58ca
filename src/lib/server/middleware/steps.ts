import type { MiddlewareHandler } from 'astro';
import { startup } from '../startup';
import { secureCookies, toolsRequestsPerMinute } from '../config';
import { clientIp } from '../client-ip';
import { takeQuota } from '../quota';
import { json } from '../http';

/**
 * Astro hydrates islands with inline module scripts, so script-src needs 'unsafe-inline';
 * everything else is same-origin only and the app cannot be framed.
 */
const CSP = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-inline'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join('; ');

export const securityHeaders: MiddlewareHandler = async (_context, next) => {
  const response = await next();
  const headers = response.headers;
  try {
    headers.set('X-Content-Type-Options', 'nosniff');
    headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
    headers.set('X-Frame-Options', 'DENY');
    headers.set('Content-Security-Policy', CSP);
    headers.set('Permissions-Policy', 'camera=(self), microphone=(), geolocation=()');
    if (secureCookies) headers.set('Strict-Transport-Security', 'max-age=15552000');
    return response;
  } catch {
    // Immutable headers (e.g. a fetched response): copy into a new response.
    const copy = new Response(response.body, response);
    return securityHeaders(_context, async () => copy) as Promise<Response>;
  }
};

export const prepare: MiddlewareHandler = async (_context, next) => {
  await startup();
  return next();
};

/** Public tools API: a per-address request budget shared by all servers through the database. */
export const toolsQuota: MiddlewareHandler = async (context, next) => {
  if (!context.url.pathname.startsWith('/api/tools/')) return next();
  const ip = clientIp(context.request, context.clientAddress);
  const { allowed, retryAfter } = await takeQuota(`tools|${ip}`, toolsRequestsPerMinute, 60);
  if (!allowed) {
    return json({ error: `Too many requests: at most ${toolsRequestsPerMinute} a minute. Try again in ${retryAfter} s.` }, 429, {
      'Retry-After': String(retryAfter),
    });
  }
  return next();
};
