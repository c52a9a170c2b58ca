/**
 * The server entry's rules for who is on the other end of a request, and who may read the local outbox.
 * Through-the-server checks are in tests/integration/edge-security.test.ts; these cover what a test on one
 * machine cannot produce over the network (a client whose socket is not loopback).
 */
import { describe, expect, it } from 'vitest';
import { clientAddress, hopAddress, quotaKeyOf, isLoopback, isLoopbackHost, resolvePeer, trustedProxyPeers } from '../../server/peer.mjs';
import { parseConfig } from '../../server/config.mjs';

/** The settings as the server reads them at start (server/config.mjs applies server/outbox.mjs's rules). */
const parseTrustProxy = (value: string | undefined) => parseConfig({ TRUST_PROXY: value }).trustProxy;
const outboxMode = (env: Record<string, string>) => parseConfig(env).outbox;

const req = (remoteAddress: string, headers: Record<string, string>) => ({ socket: { remoteAddress }, headers }) as never;

describe('client address', () => {
  it('is the socket peer when no proxy is trusted, whatever X-Forwarded-For says', () => {
    expect(clientAddress('203.0.113.9', '198.51.100.1', 0)).toBe('203.0.113.9');
    expect(clientAddress('::ffff:127.0.0.1', '198.51.100.1', 0)).toBe('127.0.0.1');
  });
  it('is the right-most hop no trusted proxy wrote', () => {
    // One proxy appends the address it saw: the entries to its left are the client's own claims.
    expect(clientAddress('127.0.0.1', '6.6.6.6, 198.51.100.7', 1)).toBe('198.51.100.7');
    expect(clientAddress('127.0.0.1', '6.6.6.6, 198.51.100.7, 10.0.0.2', 2)).toBe('198.51.100.7');
  });
  it('never takes the header from a peer that is not a trusted proxy', () => {
    // Anyone who reaches the port directly is taken at the socket, whatever they claim.
    expect(clientAddress('203.0.113.9', '198.51.100.1', 1)).toBe('203.0.113.9');
    const peers = trustedProxyPeers(parseConfig({ PROXY_ADDRESSES: '10.0.0.5, 10.0.0.6' }).proxyAddresses);
    expect(clientAddress('10.0.0.5', '198.51.100.1', 1, peers)).toBe('198.51.100.1');
    expect(clientAddress('10.0.0.7', '198.51.100.1', 1, peers)).toBe('10.0.0.7');
  });
  it('uses the socket when there are fewer hops than trusted proxies (the rest would be the client\'s words)', () => {
    expect(clientAddress('127.0.0.1', '198.51.100.7', 3)).toBe('127.0.0.1');
  });
  it('reads hops written with a port', () => {
    expect(hopAddress('198.51.100.7:5678')).toBe('198.51.100.7');
    expect(hopAddress('[2001:db8::1]:443')).toBe('2001:db8::1');
    expect(clientAddress('127.0.0.1', '6.6.6.6, 198.51.100.7:5678', 1)).toBe('198.51.100.7');
  });
  it('falls back to the socket for a missing or malformed hop', () => {
    expect(clientAddress('127.0.0.1', undefined, 1)).toBe('127.0.0.1');
    expect(clientAddress('127.0.0.1', ' , ', 1)).toBe('127.0.0.1');
    expect(clientAddress('127.0.0.1', '1.2.3.4, not-an-ip', 1)).toBe('127.0.0.1');
  });
  it('reads TRUST_PROXY as a number of proxies and refuses anything else', () => {
    expect(parseTrustProxy(undefined)).toBe(0);
    expect(parseTrustProxy('')).toBe(0);
    expect(parseTrustProxy('false')).toBe(0);
    expect(parseTrustProxy('1')).toBe(1);
    expect(parseTrustProxy('true')).toBe(1);
    expect(parseTrustProxy('2')).toBe(2);
    expect(() => parseTrustProxy('yes please')).toThrow(/TRUST_PROXY/);
    expect(() => parseTrustProxy('-1')).toThrow(/TRUST_PROXY/);
  });
});

describe('the person at the machine', () => {
  it('is a loopback socket to a loopback host name with no forwarding headers', () => {
    expect(resolvePeer(req('127.0.0.1', { host: 'localhost:4321' }), 0).atMachine).toBe(true);
    expect(resolvePeer(req('::1', { host: '[::1]:4321' }), 0).atMachine).toBe(true);
    expect(resolvePeer(req('::ffff:127.0.0.1', { host: '127.0.0.1:4321' }), 0).atMachine).toBe(true);
  });
  it('is never a client on the network, whatever it claims', () => {
    expect(resolvePeer(req('192.0.2.44', { host: 'localhost:4321' }), 0).atMachine).toBe(false);
    expect(resolvePeer(req('192.0.2.44', { host: '127.0.0.1' }), 0).atMachine).toBe(false);
  });
  it('is never a request that came through a proxy on the same host', () => {
    for (const h of ['x-forwarded-for', 'forwarded', 'x-real-ip', 'x-forwarded-host', 'x-forwarded-proto']) {
      expect(resolvePeer(req('127.0.0.1', { host: 'localhost', [h]: '1' }), 0).atMachine).toBe(false);
    }
    expect(resolvePeer(req('127.0.0.1', { host: 'baudbook.example' }), 0).atMachine).toBe(false);
    expect(resolvePeer(req('127.0.0.1', { host: 'localhost' }), 1).atMachine).toBe(false);
    expect(resolvePeer(req('127.0.0.1', {}), 0).atMachine).toBe(false);
  });
  it('knows loopback addresses and host names', () => {
    expect(isLoopback('127.8.9.1')).toBe(true);
    expect(isLoopback('128.0.0.1')).toBe(false);
    expect(isLoopback('::2')).toBe(false);
    expect(isLoopbackHost('localhost.evil.test')).toBe(false);
    expect(isLoopbackHost('127.0.0.1.nip.test')).toBe(false);
  });
});

describe('outbox mode', () => {
  it('is local only for a localhost BASE_URL with no proxy, no SMTP server and not production', () => {
    expect(outboxMode({})).toBe('local');
    expect(outboxMode({ BASE_URL: 'http://127.0.0.1:4321' })).toBe('local');
    expect(outboxMode({ BASE_URL: 'https://baudbook.example' })).toBe('off');
    expect(outboxMode({ TRUST_PROXY: '1' })).toBe('off');
    expect(outboxMode({ SMTP_URL: 'smtp://mail.test' })).toBe('off');
    expect(outboxMode({ APP_MODE: 'production' })).toBe('off');
  });
  it('needs an explicit setting to show anything on a server others reach, and then only own mail', () => {
    expect(outboxMode({ BASE_URL: 'https://baudbook.example', OUTBOX: 'own' })).toBe('own');
    expect(() => outboxMode({ BASE_URL: 'https://baudbook.example', OUTBOX: 'local' })).toThrow(/localhost/);
    expect(() => outboxMode({ TRUST_PROXY: '1', OUTBOX: 'local' })).toThrow(/TRUST_PROXY/);
    expect(() => outboxMode({ OUTBOX: 'everyone' })).toThrow(/local, own or off/);
    expect(outboxMode({ OUTBOX: 'own', SMTP_URL: 'smtp://mail.test' })).toBe('off');
  });
});

describe('tools budget key', () => {
  it('counts an IPv6 client per /64 and an IPv4 client per address', () => {
    expect(quotaKeyOf('198.51.100.7')).toBe('198.51.100.7');
    expect(quotaKeyOf('2001:db8:1:2:aaaa::1')).toBe('2001:db8:1:2::/64');
    expect(quotaKeyOf('2001:0db8:0001:0002:ffff:ffff:ffff:ffff')).toBe('2001:db8:1:2::/64');
    expect(quotaKeyOf('2001:db8::1')).toBe('2001:db8:0:0::/64');
    expect(quotaKeyOf('::1')).toBe('0:0:0:0::/64');
  });
});
