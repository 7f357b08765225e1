/// <reference types="vitest" />
import { getViteConfig } from 'astro/config';

// Unit (pure domain, tooling) and integration (real PostgreSQL, started by scripts/test.ts) tests.
// Browser tests live in tests/e2e and run with vitest.e2e.config.ts against the built app.
export default getViteConfig({
  test: {
    include: ['tests/domain/**/*.test.ts', 'tests/client/**/*.test.ts', 'tests/tooling/**/*.test.ts', 'tests/integration/**/*.test.ts'],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 60_000,
    // Integration tests share one database; run files one after another.
    fileParallelism: false,
    globalSetup: ['tests/setup/global-setup.ts'],
  },
});
