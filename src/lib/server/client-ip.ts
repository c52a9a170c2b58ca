import { isLoopback } from '../../../server/peer.mjs';

/** Header the app sets on requests it hands to the auth layer, carrying the resolved client address. */
export const CLIENT_IP_HEADER = 'x-baudbook-client-ip';

/**
 * The peer as server/serve.mjs resolved it (the socket's address unless TRUST_PROXY trusts proxies, which it
 * checked before the app ran). Under `astro dev` there is no such server: the dev server's own address is
 * used, and only a loopback client counts as the person at the machine.
 */
export function peerOf(locals: Partial<App.Locals>, clientAddress: () => string): App.Locals['peer'] {
  if (locals.peer) return locals.peer;
  let address = '127.0.0.1';
  try {
    address = clientAddress();
  } catch {
    // no address known
  }
  return { address, atMachine: import.meta.env.DEV && isLoopback(address) };
}

/** The client's address, for rate limits and anything logged. */
export function clientIp(locals: App.Locals): string {
  return locals.peer.address;
}
