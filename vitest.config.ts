/// <reference types="vitest/config" />
import { getViteConfig } from 'astro/config';

export default getViteConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    testTimeout: 20_000,
    hookTimeout: 30_000,
    pool: 'forks',
    globalSetup: ['tests/helpers/global-setup.ts'],
  },
});
