import 'server-only';
import { getDb } from '@/db/knex';
import { logger } from '@/lib/server/ops/log';

// Readiness for a load balancer: this instance can serve when its database answers and every migration in the
// build has been applied. After SIGTERM it answers "not ready" so the balancer stops sending new requests while
// the server finishes the ones it has.

export interface Readiness {
  ready: boolean;
  /** Why not, in words an operator can act on (no internals). */
  reason: string | null;
  checks: { database: boolean; migrations: boolean; accepting: boolean };
  pendingMigrations: number;
  ms: number;
}

const TIMEOUT_MS = 2000;

const g = globalThis as unknown as { __stochosDraining?: boolean };
if (g.__stochosDraining === undefined) {
  g.__stochosDraining = false;
  // Only joined when someone (next start) already handles SIGTERM: a listener would otherwise cancel the default exit.
  if (process.listenerCount('SIGTERM') > 0) process.once('SIGTERM', () => (g.__stochosDraining = true));
}

function withTimeout<T>(p: Promise<T>, what: string): Promise<T> {
  let t: NodeJS.Timeout;
  return Promise.race([p, new Promise<T>((_, reject) => (t = setTimeout(() => reject(new Error(`${what} took longer than ${TIMEOUT_MS} ms`)), TIMEOUT_MS)))]).finally(() => clearTimeout(t));
}

export async function readiness(): Promise<Readiness> {
  const started = performance.now();
  const accepting = !g.__stochosDraining;
  let database = false;
  let migrations = false;
  let pending = 0;
  let reason: string | null = null;
  try {
    await withTimeout(getDb().raw('select 1'), 'the database check');
    database = true;
    const [, todo] = (await withTimeout(getDb().migrate.list(), 'the migration check')) as [unknown[], unknown[]];
    pending = todo.length;
    migrations = pending === 0;
    if (!migrations) reason = `${pending} database migration${pending === 1 ? ' is' : 's are'} not applied yet: run npm run db:migrate.`;
  } catch (err) {
    logger().error({ err }, 'readiness check failed');
    reason = database ? 'The migration state could not be read.' : 'The database does not answer.';
  }
  if (!accepting) reason = 'This instance is shutting down.';
  return { ready: database && migrations && accepting, reason, checks: { database, migrations, accepting }, pendingMigrations: pending, ms: Math.round(performance.now() - started) };
}
