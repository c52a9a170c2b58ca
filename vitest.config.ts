/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

/**
 * Two projects: `unit` (every test outside tests/integration: pure code and the local database layer, no build,
 * no server) and `integration`
 * (through the built server, which the global setup starts). `vitest run --project unit` needs no build.
 */
export default getViteConfig({
  test: {
    testTimeout: 20_000,
    hookTimeout: 30_000,
    pool: 'forks',
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          // Every test file outside tests/integration (and the browser tests), so none is silently left out.
          include: ['tests/**/*.test.ts'],
          exclude: ['tests/integration/**', 'tests/e2e/**', 'node_modules/**'],
        },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/helpers/global-setup.ts'],
        },
      },
    ],
  },
});
