// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';

/** Extra host names the server answers for, comma-separated (e.g. a deployed host behind a proxy). */
const extraHosts = (process.env.ALLOWED_HOSTS ?? '')
  .split(',')
  .map((h) => h.trim())
  .filter(Boolean)
  .map((hostname) => ({ hostname }));

export default defineConfig({
  output: 'server',
  // Middleware mode: the built entry only exports a handler; server/serve.mjs owns the socket, the client
  // address and static files, so nothing can start the app without them.
  adapter: node({ mode: 'middleware' }),
  integrations: [react()],
  server: { host: process.env.HOST ?? '127.0.0.1', port: Number(process.env.PORT ?? 4321) },
  security: {
    // Our middleware enforces the Origin rule (JSON answers, Sec-Fetch-Site, the public tools API exempt);
    // Astro's own check would answer before it with 403 text/plain.
    checkOrigin: false,
    allowedDomains: [{ hostname: '127.0.0.1' }, { hostname: 'localhost' }, ...extraHosts],
  },
  // Sessions live in the database through the auth layer; Astro's own session store is unused.
  session: { driver: 'null' },
  // Hashes every script Astro emits into the page's CSP header, so script-src needs no 'unsafe-inline'.
  experimental: { csp: { algorithm: 'SHA-256' } },
  vite: { plugins: [tailwindcss()] },
});
