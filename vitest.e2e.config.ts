import { defineConfig } from 'vitest/config';

// Browser tests: real Chromium against the app started by scripts/test.ts (APP_URL).
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    environment: 'node',
    testTimeout: 90_000,
    hookTimeout: 90_000,
    fileParallelism: false,
  },
});
