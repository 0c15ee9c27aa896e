import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import type { TestProject } from 'vitest/node';
import { startStack, type Stack } from '@/lib/dev/stack';
import { createTestDatabase, testPgAdminUrl } from './pg-databases';

declare module 'vitest' {
  export interface ProvidedContext {
    appUrl: string;
    mailboxUrl: string;
    stripeUrl: string;
    dataDir: string;
  }
}

// Every test request comes from this machine: the per-client e-mail limit is lifted (tests/unit/auth/mail-limits.test.ts checks it).
let stack: Stack | null = null;
// TEST_PORT_OFFSET lets two checkouts run their stacks side by side on one machine.
const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);

// Starts the production build with fresh data and the local fakes once for all API tests.
export async function setup(project: TestProject): Promise<void> {
  if (!fs.existsSync('.next/BUILD_ID')) throw new Error('No production build: run `npm run build` before the API tests.');
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-api-'));
  // Under `npm run test:postgres`: a fresh database for this run; tests/support/db-direct.ts finds it by this file.
  const admin = testPgAdminUrl();
  const databaseUrl = admin ? await createTestDatabase(admin, 'api') : undefined;
  if (databaseUrl) fs.writeFileSync(path.join(dataDir, 'database-url'), databaseUrl);
  stack = await startStack({ dataDir, appPort: 3100 + OFF, smtpPort: 2625 + OFF, mailboxPort: 2626 + OFF, stripePort: 12211 + OFF, hostPagePort: 4200 + OFF, seed: true, quiet: true, databaseUrl,
    // Loopback stands for a reverse proxy here, so tests can give each simulated client its own address in
    // X-Forwarded-For (tests/integration/api/hardening.test.ts also runs an app that trusts nobody).
    extraEnv: { TRUSTED_PROXIES: '127.0.0.1, ::1', MAIL_LIMIT_PER_CLIENT_HOUR: '1000000' },
  });
  project.provide('appUrl', stack.appUrl);
  project.provide('mailboxUrl', stack.mailboxUrl);
  project.provide('stripeUrl', stack.stripeUrl);
  project.provide('dataDir', dataDir);
}

export async function teardown(): Promise<void> {
  await stack?.stop();
}
