// Who is on the other end of a request: the client address and whether the request comes from the person at
// this machine. Plain JavaScript with no dependencies, so the server entry and the tests share one copy.
import { isIP } from 'node:net';

/** Request headers that only a proxy (or someone pretending to be one) sets. */
export const FORWARDING_HEADERS = ['forwarded', 'x-forwarded-for', 'x-forwarded-host', 'x-forwarded-proto', 'x-forwarded-port', 'x-real-ip'];

/**
 * TRUST_PROXY: how many proxies in front of this server append to X-Forwarded-For. Unset, empty, `0` or
 * `false` trusts none (the address is the socket's); `1` (or `true`) one proxy, `2` two, and so on.
 * Anything else is a configuration error.
 */
export function parseTrustProxy(value) {
  const v = (value ?? '').trim().toLowerCase();
  if (v === '' || v === '0' || v === 'false') return 0;
  if (v === 'true') return 1;
  if (/^[1-9]\d?$/.test(v)) return Number(v);
  throw new Error(`TRUST_PROXY must be a number of proxies (0 to 99, or true/false); got "${value}".`);
}

/** Strips an IPv4-mapped IPv6 prefix (`::ffff:127.0.0.1`), so addresses compare as people write them. */
export function plainAddress(address) {
  if (!address) return '';
  return address.startsWith('::ffff:') && isIP(address.slice(7)) === 4 ? address.slice(7) : address;
}

export function isLoopback(address) {
  const a = plainAddress(address);
  return a === '::1' || (isIP(a) === 4 && a.startsWith('127.'));
}

/** Host names of this machine's loopback interface, as a Host header carries them (port removed). */
export function isLoopbackHost(hostHeader) {
  if (!hostHeader) return false;
  const host = hostHeader.startsWith('[') ? hostHeader.slice(0, hostHeader.indexOf(']') + 1) : hostHeader.replace(/:\d+$/, '');
  return host === 'localhost' || host === '[::1]' || isLoopback(host);
}

/**
 * The client address: the socket peer, or with `trustedHops` proxies in front, the right-most
 * X-Forwarded-For entry that no trusted proxy wrote (entries to its left are the client's own claims).
 * An entry that is not an IP address falls back to the socket peer.
 */
export function clientAddress(socketAddress, forwardedFor, trustedHops) {
  const socket = plainAddress(socketAddress) || '127.0.0.1';
  if (!trustedHops || !forwardedFor) return socket;
  const hops = forwardedFor
    .split(',')
    .map((h) => h.trim())
    .filter(Boolean);
  if (hops.length === 0) return socket;
  const chosen = plainAddress(hops[Math.max(0, hops.length - trustedHops)]);
  return isIP(chosen) ? chosen : socket;
}

/**
 * Resolves a Node request's peer. `atMachine` is true only for a request that came straight from this
 * machine's loopback interface to a loopback host name, with no proxy in between (no forwarding headers,
 * no trusted proxy configured): the person at the machine, not a client behind a reverse proxy on it.
 */
export function resolvePeer(req, trustedHops) {
  const headers = req.headers;
  const forwardedFor = Array.isArray(headers['x-forwarded-for']) ? headers['x-forwarded-for'].join(',') : headers['x-forwarded-for'];
  const address = clientAddress(req.socket?.remoteAddress, forwardedFor, trustedHops);
  const forwarded = FORWARDING_HEADERS.some((h) => headers[h] !== undefined);
  const atMachine = trustedHops === 0 && !forwarded && isLoopback(req.socket?.remoteAddress) && isLoopbackHost(headers.host);
  return { address, atMachine };
}

/**
 * Rewrites the forwarding headers before the app sees them: without trusted proxies every one is removed;
 * with them, X-Forwarded-For is replaced by the one resolved address, so nothing downstream can read a
 * client's own claim. Our own internal header is always removed from what the client sent.
 */
export function scrubForwardingHeaders(req, peer, trustedHops) {
  delete req.headers['x-baudbook-client-ip'];
  if (trustedHops === 0) {
    for (const h of FORWARDING_HEADERS) delete req.headers[h];
  } else {
    req.headers['x-forwarded-for'] = peer.address;
    delete req.headers['forwarded'];
    delete req.headers['x-real-ip'];
  }
}
