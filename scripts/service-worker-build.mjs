#!/usr/bin/env node
// Builds the service worker after `astro build` (docs/decisions/017-offline-cards.md): bundles src/sw/service-worker.ts
// with the Workbox modules it imports (esbuild, production mode, so Workbox logs nothing) into <client>/sw.js, with
// the precache list in place of `self.__WB_MANIFEST`: every built script, style sheet and WOFF2 font under /_astro/
// (hashed names: no revision), the offline page, the manifest, the favicon and the icons (revision = content hash).
// astro.config.mjs runs it from the build's `astro:build:done` hook, so `npm run build`, `npm start` and
// `astro build --outDir …` all produce it. Usage on its own: node scripts/service-worker-build.mjs [dist/client]
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const ROOT = resolve(fileURLToPath(new URL('..', import.meta.url)));
/** Files kept with their content hash as revision, besides the hashed build output. */
const NAMED = ['offline.html', 'manifest.webmanifest', 'favicon.svg', 'icons/icon-192.png', 'icons/icon-512.png', 'icons/icon-maskable-512.png'];
const HASHED = /\.(js|css|woff2)$/;

function filesUnder(dir) {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? filesUnder(path) : [path];
  });
}

/** The precache list of a built client folder, in a stable order. */
export function precacheEntries(clientDir) {
  const assets = filesUnder(join(clientDir, '_astro'))
    .filter((f) => HASHED.test(f))
    .map((f) => ({ url: `/${relative(clientDir, f).split(sep).join('/')}`, revision: null }));
  const named = NAMED.map((name) => ({ url: `/${name}`, revision: createHash('sha256').update(readFileSync(join(clientDir, name))).digest('hex').slice(0, 16) }));
  return [...named, ...assets.sort((a, b) => a.url.localeCompare(b.url))];
}

export async function buildServiceWorker(clientDir) {
  const entries = precacheEntries(clientDir);
  const out = join(clientDir, 'sw.js');
  const result = await build({
    entryPoints: [join(ROOT, 'src/sw/service-worker.ts')],
    bundle: true,
    format: 'iife',
    target: 'es2020',
    minify: true,
    write: false,
    define: { 'process.env.NODE_ENV': '"production"' },
    logLevel: 'warning',
  });
  const code = result.outputFiles[0].text;
  if (!code.includes('self.__WB_MANIFEST')) throw new Error('service worker: self.__WB_MANIFEST not found in the bundle');
  writeFileSync(out, code.replace('self.__WB_MANIFEST', JSON.stringify(entries)));
  const bytes = entries.length;
  console.log(`service worker: ${relative(process.cwd(), out)} with ${bytes} precached files`);
  return { out, entries };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await buildServiceWorker(resolve(process.argv[2] ?? 'dist/client'));
}
