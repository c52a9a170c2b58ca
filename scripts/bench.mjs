#!/usr/bin/env node
// `npm run bench`: every benchmark, printing its figures. Benchmarks are never part of `npm test`.
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const env = { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' };
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
  const r = spawnSync(cmd, args, { stdio: 'inherit', env });
  if (r.status !== 0) failed = true;
}
process.exit(failed ? 1 : 0);
