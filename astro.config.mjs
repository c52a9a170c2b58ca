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
  adapter: node({ mode: 'standalone' }),
  integrations: [react()],
  server: { host: process.env.HOST ?? '127.0.0.1', port: Number(process.env.PORT ?? 4321) },
  security: {
    checkOrigin: true,
    allowedDomains: [{ hostname: '127.0.0.1' }, { hostname: 'localhost' }, ...extraHosts],
  },
  // Sessions live in the database through the auth layer; Astro's own session store is unused.
  session: { driver: 'null' },
  // Hashes every script Astro emits into the page's CSP header, so script-src needs no 'unsafe-inline'.
  experimental: { csp: { algorithm: 'SHA-256' } },
  vite: { plugins: [tailwindcss()] },
});
