import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Removes every temporary folder a test file made through test/temp.ts when the file ends.
    setupFiles: ['test/setup.ts'],
    // Property-based and end-to-end tests do real work; keep the default generous but finite.
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
