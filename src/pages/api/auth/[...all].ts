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
  return auth.handler(new Request(request.url, init));
};
