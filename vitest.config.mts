import { defineConfig } from 'vitest/config';
import path from 'node:path';

// Projects: `unit` needs nothing but Node; `api` runs against the private
// PostgreSQL cluster (one database per test file, copied from a migrated
// template); `e2e` drives the exported web build in Debian's Chromium.
export default defineConfig({
  resolve: { alias: { '@': path.resolve(import.meta.dirname) } },
  test: {
    testTimeout: 30_000,
    hookTimeout: 60_000,
    projects: [
      { extends: true, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      {
        extends: true,
        test: { name: 'api', include: ['tests/api/**/*.test.ts'], environment: 'node', globalSetup: ['tests/setup/global.ts'] },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/global.ts'],
          // One browser at a time on a 2-core machine.
          fileParallelism: false,
          testTimeout: 90_000,
        },
      },
    ],
  },
});
