/**
 * JavaScript budget of the composer pages, measured on a built server (run after a build):
 *   node_modules/.bin/tsx bench/composer.ts        (DIST_DIR picks the build, default dist)
 * Starts the built server with the demo data, signs in as the demo engineer, loads each page's HTML,
 * collects every script it loads (module scripts, inline module imports, island component-url and
 * renderer-url, then the static imports of each served file, transitively), gzips each file and
 * prints the total per page against the budget. A page without islands must load no React at all.
 */
import { gzipSync } from 'node:zlib';
import { build } from 'esbuild';
import { startServer } from '../tests/helpers/server';

const BUDGET_KB = 150;
const COMPOSER = '/vault/devices/dev_demo_drv501/commands/cmd_demo_drv501_index';
const PAGES = [
  { path: COMPOSER, signedIn: true, islands: true },
  { path: '/vault/devices/dev_demo_drv501/commands/new', signedIn: true, islands: true },
  { path: '/vault/devices/dev_demo_drv501/commands/new?kind=sequence', signedIn: true, islands: true },
  { path: '/vault/devices/dev_demo_drv501/commands', signedIn: true, islands: true },
  { path: '/workbench', signedIn: false, islands: true },
  { path: '/', signedIn: false, islands: false },
];
/** Text every React DOM production build carries (its error-decoder link). */
const REACT_MARK = 'react.dev/errors';

const STATIC_IMPORT = /(?:import|export)\s*(?:[\w*{}\s,$]*?\s*from\s*)?["']([^"']+\.m?js)["']/g;

async function scriptsOf(baseUrl: string, html: string): Promise<{ entries: string[]; inline: string[] }> {
  const entries = new Set<string>();
  const inline: string[] = [];
  for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/g)) {
    const src = /\bsrc="([^"]+)"/.exec(m[1]!)?.[1];
    if (src) entries.add(new URL(src, baseUrl).href);
    else if (m[2]!.trim()) {
      inline.push(m[2]!);
      for (const i of m[2]!.matchAll(STATIC_IMPORT)) entries.add(new URL(i[1]!, baseUrl).href);
    }
  }
  for (const m of html.matchAll(/(?:component-url|renderer-url)="([^"]+)"/g)) entries.add(new URL(m[1]!.replace(/&amp;/g, '&'), baseUrl).href);
  for (const m of html.matchAll(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g)) entries.add(new URL(m[1]!, baseUrl).href);
  return { entries: [...entries], inline };
}

/** Every file reachable through static imports from the entries, with its gzipped size. */
async function closure(entries: string[]): Promise<Map<string, { gzip: number; text: string }>> {
  const seen = new Map<string, { gzip: number; text: string }>();
  const queue = [...entries];
  while (queue.length) {
    const url = queue.shift()!;
    if (seen.has(url)) continue;
    const res = await fetch(url);
    if (!res.ok) throw new Error(`${url}: ${res.status}`);
    const text = await res.text();
    seen.set(url, { gzip: gzipSync(text, { level: 9 }).length, text });
    for (const m of text.matchAll(STATIC_IMPORT)) queue.push(new URL(m[1]!, url).href);
  }
  return seen;
}

async function signIn(baseUrl: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl },
    body: JSON.stringify({ email: 'engineer@fernhollow.test', password: 'baudbook-demo' }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

/**
 * What the form resolver costs the composer: @hookform/resolvers' zod resolver bundled and minified on its own,
 * with what every composer page loads anyway (React, react-hook-form, zod) left out, against a hand-written
 * resolver of the same job. The redesign keeps the library unless it costs more than 2 KB gzip.
 */
async function resolverCost(): Promise<void> {
  const sizes: Record<string, number> = {};
  const entries = {
    '@hookform/resolvers/zod': `import { zodResolver } from '@hookform/resolvers/zod'; globalThis.r = zodResolver;`,
    'hand-written (for comparison)': `globalThis.r = (schema) => async (values) => { const r = schema.safeParse(values); if (r.success) return { values, errors: {} };
      const errors = {}; for (const i of r.error.issues) errors[i.path.join('.') || 'root'] ??= { type: i.code, message: i.message }; return { values: {}, errors }; };`,
  };
  for (const [name, contents] of Object.entries(entries)) {
    const out = await build({
      stdin: { contents, resolveDir: process.cwd(), loader: 'js' }, bundle: true, minify: true, format: 'esm', write: false,
      external: ['react', 'react-hook-form', 'zod', 'zod/*'], logLevel: 'error',
    });
    sizes[name] = gzipSync(out.outputFiles[0]!.contents, { level: 9 }).length;
  }
  const cost = sizes['@hookform/resolvers/zod']! - sizes['hand-written (for comparison)']!;
  for (const [name, n] of Object.entries(sizes)) console.log(`resolver ${name}: ${(n / 1024).toFixed(2)} KB gzip`);
  console.log(`${cost <= 2048 ? 'PASS' : 'FAIL'} @hookform/resolvers costs ${(cost / 1024).toFixed(2)} KB gzip more than a hand-written resolver (keep it unless over 2 KB)`);
  failed ||= cost > 2048;
}

let failed = false;
await resolverCost();
const server = await startServer({ SEED_DEMO: '1' });
try {
  await fetch(`${server.baseUrl}/`); // runs migrations and the demo seed
  const cookie = await signIn(server.baseUrl);
  for (const page of PAGES) {
    const res = await fetch(server.baseUrl + page.path, { headers: page.signedIn ? { cookie } : {}, redirect: 'manual' });
    if (res.status !== 200) throw new Error(`${page.path}: HTTP ${res.status}`);
    const html = await res.text();
    const { entries, inline } = await scriptsOf(server.baseUrl, html);
    const files = await closure(entries);
    const inlineGzip = inline.reduce((n, s) => n + gzipSync(s, { level: 9 }).length, 0);
    const total = [...files.values()].reduce((n, f) => n + f.gzip, inlineGzip);
    const react = [...files.values()].some((f) => f.text.includes(REACT_MARK));
    console.log(`\n${page.path}: ${files.size} script files, ${inline.length} inline`);
    for (const [url, f] of [...files].sort((a, b) => b[1].gzip - a[1].gzip)) console.log(`  ${(f.gzip / 1024).toFixed(1).padStart(7)} KB  ${new URL(url).pathname}`);
    const kb = total / 1024;
    if (page.islands) {
      const ok = kb < BUDGET_KB;
      failed ||= !ok;
      console.log(`${ok ? 'PASS' : 'FAIL'} ${page.path}: ${kb.toFixed(1)} KB gzip in total (budget ${BUDGET_KB} KB)`);
    } else {
      const ok = !react && !html.includes('<astro-island');
      failed ||= !ok;
      console.log(`${ok ? 'PASS' : 'FAIL'} ${page.path}: no islands, ${react ? 'loads React' : 'loads no React'} (${kb.toFixed(1)} KB gzip of other script)`);
    }
  }
} finally {
  await server.stop();
}
process.exit(failed ? 1 : 0);
