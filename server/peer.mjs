// Who is on the other end of a request: the client address and whether the request comes from the person at
// this machine. Plain JavaScript with no dependencies, so the server entry and the tests share one copy.
import { isIP } from 'node:net';

/** Request headers that only a proxy (or someone pretending to be one) sets. */
export const FORWARDING_HEADERS = ['forwarded', 'x-forwarded-for', 'x-forwarded-host', 'x-forwarded-proto', 'x-forwarded-port', 'x-real-ip'];

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

/** An X-Forwarded-For entry as some proxies write it (`1.2.3.4:5678`, `[2001:db8::1]:443`), as a bare address. */
export function hopAddress(hop) {
  const h = hop.trim();
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(h);
  if (bracketed) return plainAddress(bracketed[1]);
  const v4port = /^(\d{1,3}(?:\.\d{1,3}){3}):\d+$/.exec(h);
  return plainAddress(v4port ? v4port[1] : h);
}

/**
 * Which socket peers may speak for a client in X-Forwarded-For: loopback (a proxy on this host) and the
 * addresses in PROXY_ADDRESSES (read by server/config.mjs). Anyone else reaching the port directly is taken at
 * its socket.
 * @param {string[]} addresses
 */
export function trustedProxyPeers(addresses) {
  const listed = new Set(addresses.map((a) => plainAddress(a)));
  return (address) => isLoopback(address) || listed.has(plainAddress(address));
}

/**
 * The client address: the socket peer, or with `trustedHops` proxies in front (and the socket peer one of
 * them), the right-most X-Forwarded-For entry that no trusted proxy wrote (entries to its left are the
 * client's own claims). With fewer entries than proxies, or an entry that is not an IP address, the socket
 * peer is used: the client's own words never are.
 */
export function clientAddress(socketAddress, forwardedFor, trustedHops, isProxyPeer = isLoopback) {
  const socket = plainAddress(socketAddress) || '127.0.0.1';
  if (!trustedHops || !forwardedFor || !isProxyPeer(socket)) return socket;
  const hops = forwardedFor
    .split(',')
    .map((h) => h.trim())
    .filter(Boolean);
  if (hops.length < trustedHops) return socket;
  const chosen = hopAddress(hops[hops.length - trustedHops]);
  return isIP(chosen) ? chosen : socket;
}

/**
 * Resolves a Node request's peer. `atMachine` is true only for a request that came straight from this
 * machine's loopback interface to a loopback host name, with no proxy in between (no forwarding headers,
 * no trusted proxy configured): the person at the machine, not a client behind a reverse proxy on it.
 */
export function resolvePeer(req, trustedHops, isProxyPeer = isLoopback) {
  const headers = req.headers;
  const forwardedFor = Array.isArray(headers['x-forwarded-for']) ? headers['x-forwarded-for'].join(',') : headers['x-forwarded-for'];
  const address = clientAddress(req.socket?.remoteAddress, forwardedFor, trustedHops, isProxyPeer);
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
    // X-Forwarded-Host, -Proto and -Port pass on for the trusted proxy's sake; Astro accepts a forwarded host
    // only when it is one of ALLOWED_HOSTS.
  }
}

/** A rate-limit key: an IPv6 client holds a whole /64, so it is counted per /64 (as the sign-in limits count it). */
export function quotaKeyOf(ip) {
  if (!ip.includes(':')) return ip;
  const [head = '', tail = ''] = ip.split('::');
  const left = head ? head.split(':') : [];
  const right = tail ? tail.split(':') : [];
  const groups = ip.includes('::') ? [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill('0'), ...right] : left;
  return `${groups.slice(0, 4).map((g) => g.toLowerCase().replace(/^0+(?=.)/, '')).join(':')}::/64`;
}
