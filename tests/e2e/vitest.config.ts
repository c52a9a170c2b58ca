import { defineConfig } from 'vitest/config';

/** Browser tests: Debian's Chromium through playwright-core against the built server with demo data. */
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.e2e.ts'],
    globalSetup: ['tests/e2e/helpers/global-setup.ts'],
    // Every screen a test looks at is also checked with axe-core (helpers/screen-checks.ts).
    testTimeout: 120_000,
    hookTimeout: 60_000,
    // One browser at a time keeps the 2-core machine responsive.
    fileParallelism: false,
  },
});
