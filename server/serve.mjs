#!/usr/bin/env node
// Baudbook's HTTP server: a small node:http server of ours in front of Astro's handler (the node adapter in
// middleware mode). It owns what must be decided before the app runs: the client address (from the socket
// unless TRUST_PROXY names trusted proxies), whether a request comes from the person at this machine, static
// files with their headers, and where to listen. Usage: node server/serve.mjs [path/to/dist]
import { existsSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { createServer } from 'node:http';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import send from 'send';
import { resolvePeer, scrubForwardingHeaders, trustedProxyPeers } from './peer.mjs';
import { ConfigError, listenHost, loadConfig, preferProductionBuilds } from './config.mjs';

/** Every setting, parsed once (server/config.mjs); a bad one stops the server here with its message. */
let config;
try {
  config = loadConfig();
} catch (err) {
  if (!(err instanceof ConfigError)) throw err;
  console.error(`Baudbook cannot start: ${err.problems.length === 1 ? 'a setting is' : 'settings are'} not valid.\n${err.message}`);
  process.exit(1);
}

const distDir = process.argv[2] ? resolve(process.argv[2]) : config.distDir;
const entry = join(distDir, 'server/entry.mjs');
const clientDir = join(distDir, 'client');
if (!existsSync(entry)) {
  console.error(`${entry} is missing: build first (npm run build, or npm start which builds).`);
  process.exit(1);
}

const trustedHops = config.trustProxy;
const isProxyPeer = trustedProxyPeers(config.proxyAddresses);
const port = config.port;
const host = listenHost(config);

/**
 * The local outbox's key: only someone who can read this server's console (or its OUTBOX_KEY setting) gets the
 * link that opens the outbox, so a relay on this host that hides the real client cannot hand mail to anyone.
 */
const outboxKey = config.outbox === 'local' ? config.outboxKey || randomBytes(18).toString('base64url') : undefined;

// The libraries' production builds unless NODE_ENV says otherwise: decided before the app is loaded.
preferProductionBuilds();
const { handler } = await import(pathToFileURL(entry).href);

const ASSETS = '/_astro/';

/** Serves a file from the built client folder; calls `fallThrough` when there is none. */
function serveStatic(req, res, fallThrough) {
  if (req.method !== 'GET' && req.method !== 'HEAD') return fallThrough();
  const path = (req.url ?? '/').split('?')[0];
  // Only a file name (`/favicon.svg`, `/_astro/x.js`) can be in the built folder: pages and the API go straight to
  // the app, without a look at the disk (and the not-found error it raises) on every request.
  if (!/\.[^/]*$/.test(path)) return fallThrough();
  const immutable = path.startsWith(ASSETS);
  const stream = send(req, path, { root: clientDir, index: false, dotfiles: 'deny', immutable, maxAge: immutable ? '365d' : 0 });
  stream.on('directory', () => fallThrough());
  stream.on('error', (err) => {
    if (err.status === 404 || err.status === 403) return fallThrough();
    res.statusCode = err.status ?? 500;
    res.end();
  });
  stream.on('headers', (r) => {
    // The service worker script is asked for on every navigation check: never from an HTTP cache, so a new build's
    // worker is found at once (docs/decisions/017-offline-cards.md).
    if (path === '/sw.js') r.setHeader('Cache-Control', 'no-cache');
    r.setHeader('X-Content-Type-Options', 'nosniff');
    r.setHeader('Referrer-Policy', 'strict-origin-when-cross-origin');
    r.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
  });
  stream.pipe(res);
}

const server = createServer((req, res) => {
  try {
    decodeURI(req.url ?? '/');
  } catch {
    res.writeHead(400, { 'content-type': 'text/plain; charset=utf-8' });
    res.end('Bad request: the address is not valid.');
    return;
  }
  const peer = resolvePeer(req, trustedHops, isProxyPeer);
  scrubForwardingHeaders(req, peer, trustedHops);
  serveStatic(req, res, () => handler(req, res, undefined, { peer, outboxKey }));
});

server.listen(port, host, () => {
  console.log(`Baudbook listening on http://${host.includes(':') ? `[${host}]` : host}:${port}`);
  // The link goes where the app's own links go (a local demo's BASE_URL: localhost, 127.0.0.1 or [::1]).
  if (outboxKey) console.log(`Outbox (e-mails kept on this machine; open it in a browser here): ${new URL(`/dev/outbox?key=${outboxKey}`, config.baseUrl).href}`);
});

for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => {
    server.close(() => process.exit(0));
    server.closeAllConnections?.();
    setTimeout(() => process.exit(0), 2000).unref();
  });
}
