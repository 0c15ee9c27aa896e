import 'server-only';
import { bumpRateCounters, countLiveLeases, pruneLeases, pruneRateCounters, releaseLease, takeLease } from '@/db/run-limits';
import { AppError } from '@/lib/server/http/errors';
import { runLimits } from './limits';

// Admission of a server-side run: a rate limit (runs started per fixed minute) and a cap on runs in progress, each per
// API key (or signed-in member) and per firm. Counts live in the database so every app instance shares them.

export interface RunCaller {
  firmId: string;
  /** "key:<api key id>" or "user:<user id>". */
  caller: string;
  via: 'api-key' | 'session';
}

export interface Admission {
  release(): Promise<void>;
}

/** Seconds a client waits after a refusal for runs in progress: most runs end within a few seconds. */
export const CONCURRENT_RETRY_AFTER_S = 2;
// Leases outlive the time limit by this much, so a crashed instance's leases stop counting soon after.
const LEASE_SLACK_MS = 30_000;

const g = globalThis as unknown as { __stochosRunPrune?: number };

function who(c: RunCaller): string {
  return c.via === 'api-key' ? 'This API key has' : 'You have';
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en')} ${n === 1 ? one : many}`;
}

export async function admitRun(c: RunCaller, now = Date.now()): Promise<Admission> {
  const l = runLimits();
  const windowStartMs = Math.floor(now / l.rateWindowMs) * l.rateWindowMs;
  const windowStart = new Date(windowStartMs).toISOString();
  await pruneOld(now, l.rateWindowMs);

  const [firmRuns, callerRuns] = await bumpRateCounters([`firm:${c.firmId}`, c.caller], windowStart);
  const retryRate = Math.max(1, Math.ceil((windowStartMs + l.rateWindowMs - now) / 1000));
  if (callerRuns! > l.ratePerKey) {
    throw new AppError('rate_limited', `${who(c)} started ${plural(l.ratePerKey, 'run')} this minute, the most allowed. Try again in ${plural(retryRate, 'second')}.`, { retryAfter: retryRate });
  }
  if (firmRuns! > l.ratePerFirm) {
    throw new AppError('rate_limited', `Your firm has started ${plural(l.ratePerFirm, 'run')} this minute, the most allowed. Try again in ${plural(retryRate, 'second')}.`, { retryAfter: retryRate });
  }

  const nowIso = new Date(now).toISOString();
  const lease = await takeLease(c.firmId, c.caller, nowIso, new Date(now + l.timeLimitMs + LEASE_SLACK_MS).toISOString());
  const over =
    lease.callerCount > l.concurrentPerKey
      ? `${who(c)} ${plural(l.concurrentPerKey, 'run')} in progress, the most at once.`
      : lease.firmCount > l.concurrentPerFirm
        ? `Your firm has ${plural(l.concurrentPerFirm, 'run')} in progress, the most at once.`
        : null;
  if (over) {
    await releaseLease(c.firmId, lease.id);
    throw new AppError('rate_limited', `${over} Wait for one to finish, then try again (in about ${plural(CONCURRENT_RETRY_AFTER_S, 'second')}).`, {
      retryAfter: CONCURRENT_RETRY_AFTER_S,
    });
  }
  let released = false;
  return {
    async release() {
      if (released) return;
      released = true;
      await releaseLease(c.firmId, lease.id);
    },
  };
}

/** Runs of the firm in progress on any instance. */
export function firmRunsInProgress(firmId: string, now = Date.now()): Promise<number> {
  return countLiveLeases(firmId, new Date(now).toISOString());
}

// Old counter windows and dead leases go at most once a minute per process.
async function pruneOld(now: number, windowMs: number): Promise<void> {
  if (g.__stochosRunPrune && now - g.__stochosRunPrune < 60_000) return;
  g.__stochosRunPrune = now;
  await pruneRateCounters(new Date(now - 10 * windowMs).toISOString());
  await pruneLeases(new Date(now).toISOString());
}
