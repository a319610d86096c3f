import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const alias = { '@': fileURLToPath(new URL('./src', import.meta.url)) };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        // property tests run hundreds of cases: a generous bound, speed is measured in the benches
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node', testTimeout: 60_000, setupFiles: ['tests/support/fast-check.ts'] },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/support/build.ts'],
          setupFiles: ['tests/support/fast-check.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/build.ts', 'tests/support/chromium.ts'],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          // one browser at a time on a 2-core machine
          poolOptions: { forks: { singleFork: true } },
        },
      },
    ],
  },
});
