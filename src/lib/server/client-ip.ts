/** Header the app sets on requests it hands to the auth layer, carrying the resolved client address. */
export const CLIENT_IP_HEADER = 'x-baudbook-client-ip';

/**
 * The client's address: the socket peer, or the first X-Forwarded-For entry when TRUST_PROXY=1
 * (set it only behind a proxy that overwrites that header).
 */
export function clientIp(request: Request, socketAddress: string | undefined): string {
  if (process.env.TRUST_PROXY === '1') {
    const forwarded = request.headers.get('x-forwarded-for')?.split(',')[0]?.trim();
    if (forwarded) return forwarded;
  }
  return socketAddress || '127.0.0.1';
}
