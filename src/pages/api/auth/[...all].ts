import type { APIRoute } from 'astro';
import { auth } from '../../../lib/server/auth';
import { CLIENT_IP_HEADER, clientIp } from '../../../lib/server/client-ip';

/** Hands sign-up, sign-in, sign-out and password reset to the auth layer, with the resolved client address. */
export const ALL: APIRoute = async ({ request, locals }) => {
  const headers = new Headers(request.headers);
  headers.set(CLIENT_IP_HEADER, clientIp(locals));
  const init: RequestInit & { duplex?: 'half' } = { method: request.method, headers };
  if (request.method !== 'GET' && request.method !== 'HEAD') {
    init.body = request.body;
    init.duplex = 'half';
  }
  const response = await auth.handler(new Request(request.url, init));
  return new URL(request.url).pathname === '/api/auth/sign-in/email' ? hideUnconfirmed(response) : response;
};

/**
 * Signing in to an account whose address is not confirmed yet answers like a wrong password (the auth
 * layer has e-mailed a fresh confirmation link meanwhile). Otherwise anyone could sign up with an
 * address and then sign in to learn whether it had an account already: a new one would say "not
 * confirmed", a registered one "wrong password".
 */
async function hideUnconfirmed(response: Response): Promise<Response> {
  if (response.status !== 403) return response;
  const body = (await response.clone().json().catch(() => null)) as { code?: string } | null;
  if (body?.code !== 'EMAIL_NOT_VERIFIED') return response;
  return new Response(JSON.stringify({ message: 'Invalid email or password', code: 'INVALID_EMAIL_OR_PASSWORD' }), {
    status: 401,
    headers: { 'content-type': 'application/json' },
  });
}
