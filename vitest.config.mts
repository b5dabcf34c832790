import { defineConfig } from 'vitest/config';
import path from 'node:path';

// Two projects: `unit` needs nothing but Node; `api` runs against the private
// PostgreSQL cluster that tests/setup/global.ts prepares (one schema per file).
export default defineConfig({
  resolve: { alias: { '@': path.resolve(__dirname) } },
  test: {
    testTimeout: 30_000,
    hookTimeout: 60_000,
    projects: [
      { extends: true, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/global.ts'],
        },
      },
    ],
  },
});
