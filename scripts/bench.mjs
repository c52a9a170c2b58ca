#!/usr/bin/env node
// `npm run bench`: every benchmark, printing its figures. Benchmarks are never part of `npm test`.
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const env = { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' };
// Each server benchmark leaves its figures in bench/.out (BENCH_JSON); scripts/perf-table.mjs writes them into
// docs/performance.md at the end.
rmSync('bench/.out', { recursive: true, force: true });
mkdirSync('bench/.out', { recursive: true });
const out = { 'vault endpoints': 'bench/.out/1-vault.json', 'bench/csv-import.ts': 'bench/.out/2-csv-import.json', 'bench/composer.ts': 'bench/.out/3-composer.json' };
const steps = [
  ['frame engine', 'node_modules/.bin/vitest', ['run', '--config', 'bench/vitest.config.ts']],
];
if (existsSync('bench/vault.ts')) {
  steps.push(['build (for server benchmarks)', 'node_modules/.bin/astro', ['build']]);
  steps.push(['vault endpoints', 'node_modules/.bin/tsx', ['bench/vault.ts']]);
}
for (const extra of ['bench/composer.ts', 'bench/csv-import.ts', 'bench/long-jobs.ts']) {
  if (existsSync(extra)) steps.push([extra, 'node_modules/.bin/tsx', [extra]]);
}
let failed = false;
for (const [label, cmd, args] of steps) {
  console.log(`\n=== ${label} ===`);
  const r = spawnSync(cmd, args, { stdio: 'inherit', env: out[label] ? { ...env, BENCH_JSON: out[label] } : env });
  if (r.status !== 0) failed = true;
}
spawnSync(process.execPath, ['scripts/perf-table.mjs'], { stdio: 'inherit' });
process.exit(failed ? 1 : 0);
