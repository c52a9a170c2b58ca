import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

/** Benchmarks run apart from the unit tests: `node_modules/.bin/vitest run --config bench/vitest.config.ts`. */
export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('../src', import.meta.url)) } },
  test: {
    include: ['bench/**/*.bench.ts'],
    testTimeout: 120_000,
    pool: 'forks',
    reporters: ['default'],
  },
});
