/** The service worker's precache list (scripts/service-worker-build.mjs): what a phone fetches once per build. */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { precacheEntries } from '../../scripts/service-worker-build.mjs';

const dir = mkdtempSync(join(tmpdir(), 'baudbook-sw-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('precacheEntries', () => {
  it('lists hashed scripts, styles and WOFF2 fonts without a revision, and the named files with a content hash', () => {
    mkdirSync(join(dir, '_astro'));
    mkdirSync(join(dir, 'icons'));
    for (const f of ['b.Xy12.js', 'a.Qw34.css', 'f.Ab56.woff2', 'f.Ab56.woff', 'page.Cd78.js.map']) writeFileSync(join(dir, '_astro', f), 'y');
    for (const f of ['offline.html', 'manifest.webmanifest', 'favicon.svg', 'icons/icon-192.png', 'icons/icon-512.png', 'icons/icon-maskable-512.png']) writeFileSync(join(dir, f), 'x');
    const entries = precacheEntries(dir);
    // SHA-256 of the single byte "x", first 16 hex digits (from sha256sum).
    const x = '2d711642b726b044';
    expect(entries).toEqual([
      { url: '/offline.html', revision: x },
      { url: '/manifest.webmanifest', revision: x },
      { url: '/favicon.svg', revision: x },
      { url: '/icons/icon-192.png', revision: x },
      { url: '/icons/icon-512.png', revision: x },
      { url: '/icons/icon-maskable-512.png', revision: x },
      { url: '/_astro/a.Qw34.css', revision: null },
      { url: '/_astro/b.Xy12.js', revision: null },
      { url: '/_astro/f.Ab56.woff2', revision: null },
    ]);
  });
});
