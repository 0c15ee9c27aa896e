import { defineConfig } from '@playwright/test';

// End-to-end tests in Debian's Chromium against the production build; the global setup starts the stack.
export default defineConfig({
  testDir: 'tests/e2e',
  timeout: 90_000,
  expect: { timeout: 15_000 },
  fullyParallel: false,
  workers: 1,
  retries: 0,
  reporter: [['list']],
  globalSetup: './tests/e2e/support/global-setup.ts',
  use: {
    baseURL: `http://localhost:${3200 + Number(process.env.TEST_PORT_OFFSET ?? 0)}`,
    browserName: 'chromium',
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
    },
    trace: 'off',
    screenshot: 'only-on-failure',
  },
});
