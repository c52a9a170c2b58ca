import type { MiddlewareHandler } from 'astro';
import { startup } from '../startup';
import { secureCookies, toolsRequestsPerMinute } from '../config';
import { clientIp } from '../client-ip';
import { takeQuota } from '../quota';
import { json } from '../http';

/**
 * Same-origin only, never framed. Pages get script-src from Astro's CSP support, which hashes every
 * script it emits (islands' hydration included); responses without it get a script-src of 'self'.
 * Styles allow 'unsafe-inline' because islands set inline style attributes.
 */
const BASE_CSP = [
  "default-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
];

/** Keeps the script-src Astro computed for the page (its hashes) and sets every other directive ourselves. */
export function contentSecurityPolicy(fromAstro: string | null): string {
  const scriptSrc = fromAstro
    ?.split(';')
    .map((d) => d.trim())
    .find((d) => d.startsWith('script-src '));
  return [...BASE_CSP, scriptSrc ?? "script-src 'self'"].join('; ');
}

export const securityHeaders: MiddlewareHandler = async (_context, next) => {
  const response = await next();
  const headers = response.headers;
  try {
    headers.set('X-Content-Type-Options', 'nosniff');
    headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
    headers.set('X-Frame-Options', 'DENY');
    headers.set('Content-Security-Policy', contentSecurityPolicy(headers.get('Content-Security-Policy')));
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
