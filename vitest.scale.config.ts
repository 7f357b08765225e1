import { defineConfig } from 'vitest/config';

// The scaling rehearsal (npm run test:scale): starts nginx, two app instances, a primary and a hot
// standby, so it takes a few minutes and stays out of `npm test`. The slow one-off steps (nginx
// install, app build) run first, in the global setup.
export default defineConfig({
  test: {
    include: ['tests/scale/**/*.test.ts'],
    globalSetup: ['tests/scale/global-setup.ts'],
    environment: 'node',
    testTimeout: 300_000,
    hookTimeout: 900_000,
  },
});
