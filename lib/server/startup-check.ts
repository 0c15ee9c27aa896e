import 'server-only';
import { env } from '@/lib/server/env';

/** Node.js start-up only (see instrumentation.ts): a missing or unsafe setting stops the server with the reason. */
export function checkEnvironmentOrExit(): void {
  try {
    env();
  } catch (err) {
    console.error(`Stochos cannot start. ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  }
}
