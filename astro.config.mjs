// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';
import { parseBuildConfig } from './server/config.mjs';
import { buildServiceWorker } from './scripts/service-worker-build.mjs';

/**
 * The settings the build and the dev server need (server/config.mjs): ALLOWED_HOSTS, extra host names the server
 * answers for, is fixed at build time; HOST and PORT are where the dev server listens. Read from the environment
 * only (`.env` is the running server's).
 */
const config = parseBuildConfig(process.env);

/**
 * The browser build treats the pure folders (src/lib/frame, composer, schemas: definitions only, no effects on
 * import, as the layer rules keep them) as free of side effects, so a module imported only for the server's
 * render of a part that the browser loads later (src/components/composer/Later.tsx) leaves nothing behind in the
 * browser's first load: without this, Rollup keeps a bare `import` of each such module because it builds zod
 * schemas at its top level, and with it zod itself (composer JavaScript budget, issue 16).
 */
const PURE_MODULES = /\/src\/lib\/(frame|composer|schemas)\//;
const pureModules = {
  name: 'baudbook-pure-modules',
  /** @param {import('vite').UserConfig} _ @param {import('vite').ConfigEnv} env */
  config(_, env) {
    if (env.isSsrBuild) return;
    return { build: { rollupOptions: { treeshake: { moduleSideEffects: (/** @type {string} */ id) => !PURE_MODULES.test(id) } } } };
  },
};

export default defineConfig({
  output: 'server',
  // Middleware mode: the built entry only exports a handler; server/serve.mjs owns the socket, the client
  // address and static files, so nothing can start the app without them.
  adapter: node({ mode: 'middleware' }),
  // Islands render with renderToString: a streamed render outlines any Suspense boundary past the first
  // 12.8 kB of HTML into a hidden template completed by an inline script, which the hash-only CSP refuses; the
  // composer's parts that load after the page is interactive each sit in one (src/components/composer/Later.tsx).
  integrations: [
    react({ experimentalDisableStreaming: true }),
    // The service worker (/sw.js) is built from the finished client folder, so every build has it (decision 017).
    { name: 'baudbook-service-worker', hooks: { 'astro:build:done': async ({ dir }) => { await buildServiceWorker(fileURLToPath(dir)); } } },
  ],
  server: { host: config.host ?? '127.0.0.1', port: config.port },
  security: {
    // Our middleware enforces the Origin rule (JSON answers, Sec-Fetch-Site, the public tools API exempt);
    // Astro's own check would answer before it with 403 text/plain.
    checkOrigin: false,
    allowedDomains: [{ hostname: '127.0.0.1' }, { hostname: 'localhost' }, ...config.allowedHosts.map((hostname) => ({ hostname }))],
  },
  // Sessions live in the database through the auth layer; Astro's own session store is unused.
  session: { driver: 'null' },
  // Hashes every script Astro emits into the page's CSP header, so script-src needs no 'unsafe-inline'.
  experimental: { csp: { algorithm: 'SHA-256' } },
  vite: { plugins: [tailwindcss(), pureModules] },
});
