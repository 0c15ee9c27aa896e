import 'server-only';
import { after } from 'next/server';
import { logger } from '@/lib/server/ops/log';

/**
 * Keeps a request's deferred write alive past the response: Next awaits `after()` callbacks before a clean stop
 * (SIGTERM), so a batched write that a request started is committed before the process exits.
 */
export function afterResponse(p: Promise<void>, what: string): void {
  const settled = p.catch((err) => logger().error({ err }, `${what} was not stored`));
  try {
    after(() => settled);
  } catch {
    // Outside a request (scripts, tests) there is no response to wait for: the batch timer still writes it.
  }
}
