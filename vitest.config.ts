/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

/**
 * Two projects: `unit` (pure code and the local database layer: no build, no server) and `integration`
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
          include: ['tests/frame/**/*.test.ts', 'tests/composer/**/*.test.ts', 'tests/db/**/*.test.ts', 'tests/server/**/*.test.ts'],
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
