#!/usr/bin/env node
// `npm test`: build the app, run unit and integration tests (vitest), then browser tests in Debian's Chromium.
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
if (!existsSync(chromium)) {
  console.error(
    `\nThe browser tests need Debian's Chromium at ${chromium}, which is missing.\n` +
      'Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n' +
      '(or set CHROMIUM_PATH to another Chromium binary). Never use a downloaded browser build.\n',
  );
  process.exit(1);
}

const env = { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' };
function run(label, cmd, args) {
  console.log(`\n=== ${label} ===`);
  const r = spawnSync(cmd, args, { stdio: 'inherit', env });
  if (r.status !== 0) {
    console.error(`\n${label} failed (exit ${r.status ?? r.signal}).`);
    process.exit(r.status ?? 1);
  }
}

run('build', 'node_modules/.bin/astro', ['build']);
run('unit and integration tests', 'node_modules/.bin/vitest', ['run']);
run('browser tests', 'node_modules/.bin/vitest', ['run', '--config', 'tests/e2e/vitest.config.ts']);
console.log('\nAll test stages passed.');
