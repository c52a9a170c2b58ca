import type { MiddlewareHandler } from 'astro';
import { startup } from '../startup';
import { config } from '../../../config';
import { clientIp, peerOf } from '../client-ip';
import { quotaKeyOf } from '../../../../server/peer.mjs';
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
  // The service worker (/sw.js) and the web app manifest, both same-origin (docs/decisions/017-offline-cards.md).
  "worker-src 'self'",
  "manifest-src 'self'",
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

/** Signed-in requests carry this cookie (Secure-prefixed when BASE_URL is https). */
const SESSION_COOKIE = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_token=/;
export function carriesSession(request: Request): boolean {
  return SESSION_COOKIE.test(request.headers.get('cookie') ?? '');
}

export const securityHeaders: MiddlewareHandler = async (context, next) => {
  const response = await next();
  const headers = response.headers;
  try {
    // Pages and data for a signed-in user are never kept by the browser's or a proxy's HTTP cache. Field cards kept
    // on a phone go through the Cache API, on the technician's request only (decisions 007 and 017).
    if (!headers.has('Cache-Control') && (context.locals.user || carriesSession(context.request))) {
      headers.set('Cache-Control', 'no-store');
    }
    headers.set('X-Content-Type-Options', 'nosniff');
    headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
    headers.set('X-Frame-Options', 'DENY');
    headers.set('Content-Security-Policy', contentSecurityPolicy(headers.get('Content-Security-Policy')));
    headers.set('Permissions-Policy', 'camera=(self), microphone=(), geolocation=()');
    if (config.secureCookies) headers.set('Strict-Transport-Security', 'max-age=15552000');
    return response;
  } catch {
    // Immutable headers (e.g. a fetched response): copy into a new response.
    const copy = new Response(response.body, response);
    return securityHeaders(context, async () => copy) as Promise<Response>;
  }
};

/** Migrates (once) and settles who sent the request, before anything reads it. */
export const prepare: MiddlewareHandler = async (context, next) => {
  await startup();
  context.locals.peer = peerOf(context.locals, () => context.clientAddress);
  return next();
};

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

function forbidden(message: string): Response {
  return json({ error: message }, 403);
}

/**
 * The Origin rule for state-changing requests (docs/api.md): an Origin header must name one of the app's
 * origins; a request without one passes only when the browser marks it same-origin (Sec-Fetch-Site) or when
 * it carries no session. The public, stateless tools API is exempt, as its documented examples show.
 */
export const originRule: MiddlewareHandler = async (context, next) => {
  const { request, url } = context;
  if (!STATE_CHANGING.has(request.method) || url.pathname.startsWith('/api/tools/')) return next();
  const origin = request.headers.get('origin');
  if (origin && origin !== 'null') {
    if (config.trustedOrigins.includes(origin)) return next();
    return forbidden(`Requests from ${origin} are not accepted: send them from ${config.baseUrl}.`);
  }
  if (request.headers.get('sec-fetch-site') === 'same-origin' || !carriesSession(request)) return next();
  return forbidden(`A signed-in ${request.method} needs an Origin header naming this app (${config.baseUrl}), as browsers send.`);
};

/** Public tools API: a per-address request budget shared by all servers through the database. */
export const toolsQuota: MiddlewareHandler = async (context, next) => {
  if (!context.url.pathname.startsWith('/api/tools/')) return next();
  const ip = quotaKeyOf(clientIp(context.locals));
  const { allowed, retryAfter } = await takeQuota(`tools|${ip}`, config.toolsRequestsPerMinute, 60);
  if (!allowed) {
    return json({ error: `Too many requests: at most ${config.toolsRequestsPerMinute} a minute. Try again in ${retryAfter} s.` }, 429, {
      'Retry-After': String(retryAfter),
    });
  }
  return next();
};
