import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { startStack } from '../../../lib/dev/stack';
import { E2E } from './ports';

// One stack for the whole e2e run: fresh data, seeded demo firm, local fakes, the production build on :3200.
// Every test request comes from this machine: the per-client e-mail limit is lifted.
export default async function globalSetup(): Promise<() => Promise<void>> {
  if (!fs.existsSync('.next/BUILD_ID')) throw new Error('No production build: run `npm run build` first.');
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-e2e-'));
  const stack = await startStack({ dataDir, ...E2E, seed: true, quiet: true, extraEnv: { MAIL_LIMIT_PER_CLIENT_HOUR: '1000000' } });
  process.env.E2E_MAILBOX_URL = stack.mailboxUrl;
  process.env.E2E_STRIPE_URL = stack.stripeUrl;
  process.env.E2E_DATA_DIR = dataDir;
  return async () => stack.stop();
}
