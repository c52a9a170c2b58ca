#!/usr/bin/env node
// `npm test`: type-check, check the layers (npm run lint), build the app, run unit and integration tests (vitest), then browser tests in Debian's Chromium.
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
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

mkdirSync('test-results', { recursive: true });
const reporters = (name) => ['--reporter=default', '--reporter=json', `--outputFile.json=test-results/${name}.json`];

// astro check type-checks the .astro pages and components as well as every .ts file (tsc alone skips .astro).
run('type check', 'node_modules/.bin/astro', ['check']);
run('layer check', 'node_modules/.bin/depcruise', ['src', 'server', '--config', '.dependency-cruiser.cjs']);
run('build', 'node_modules/.bin/astro', ['build']);
run('unit and integration tests', 'node_modules/.bin/vitest', ['run', ...reporters('unit')]);
run('browser tests', 'node_modules/.bin/vitest', ['run', '--config', 'tests/e2e/vitest.config.ts', ...reporters('e2e')]);

const totals = { passed: 0, failed: 0, skipped: 0 };
for (const name of ['unit', 'e2e']) {
  const r = JSON.parse(readFileSync(`test-results/${name}.json`, 'utf8'));
  totals.passed += r.numPassedTests;
  totals.failed += r.numFailedTests;
  totals.skipped += r.numPendingTests + r.numTodoTests;
}
console.log('\nAll test stages passed.');
console.log(`Tests: ${totals.passed} passed, ${totals.failed} failed, ${totals.skipped} skipped`);
