import { defineConfig } from 'vitest/config';

// Node-side and cross-process tests. Angular specs under src/ run through `ng test`.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'node',
          include: ['test/**/*.test.ts'],
          exclude: ['test/e2e/**'],
          environment: 'node',
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120000,
          hookTimeout: 180000,
          fileParallelism: false,
        },
      },
    ],
  },
});
