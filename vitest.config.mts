import { defineConfig } from 'vitest/config';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const __dirname = path.dirname(fileURLToPath(import.meta.url));

const alias = { '@': path.resolve(__dirname, '.'), 'server-only': path.resolve(__dirname, 'tests/support/server-only-stub.ts') };

// Two projects: "unit" needs nothing running; "api" talks HTTP to a production build started by its global setup.
export default defineConfig({
  resolve: { alias },
  test: {
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts', 'tests/integration/**/*.test.ts'],
          exclude: ['tests/integration/api/**'],
          environment: 'node',
          globalSetup: ['tests/support/run-worker-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/integration/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/api-global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
      // Only under `npm run test:postgres` (tests/postgres/run.sh), which starts the PostgreSQL cluster these need.
      ...(process.env.STOCHOS_TEST_PG_URL
        ? [
            {
              resolve: { alias },
              test: {
                name: 'postgres',
                include: ['tests/postgres/**/*.test.ts'],
                environment: 'node',
                testTimeout: 300_000,
                hookTimeout: 300_000,
              },
            },
          ]
        : []),
    ],
  },
});
