import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getDb } from '@/db/knex';
import { admitRun, firmRunsInProgress, type RunCaller } from '@/lib/server/simulate/admission';
import { resetRunLimits } from '@/lib/server/simulate/limits';
import { AppError } from '@/lib/server/http/errors';
import { useFreshDb } from '../../support/test-db';

// Rate and concurrency limits of server runs, against a migrated database (the counts every instance shares).

const ENV = { SIMULATE_RATE_PER_KEY: '3', SIMULATE_RATE_PER_FIRM: '5', SIMULATE_MAX_CONCURRENT_PER_KEY: '2', SIMULATE_MAX_CONCURRENT_PER_FIRM: '3', SIMULATE_TIME_LIMIT_MS: '10000' };

async function newFirm(): Promise<string> {
  const id = randomUUID();
  await getDb()('firms').insert({ id, name: 'Admission Test Firm', created_at: new Date().toISOString() });
  return id;
}

async function refusal(p: Promise<unknown>): Promise<AppError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  if (!(err instanceof AppError)) throw new Error(`expected an AppError, got ${String(err)}`);
  return err;
}

beforeAll(async () => {
  Object.assign(process.env, ENV);
  resetRunLimits();
  await useFreshDb();
});
afterAll(() => {
  for (const k of Object.keys(ENV)) delete process.env[k];
  resetRunLimits();
});

describe('admission of server runs', () => {
  it('caps runs in progress per key and per firm, and frees the place when a run ends', async () => {
    const firmId = await newFirm();
    const a: RunCaller = { firmId, caller: 'key:a', via: 'api-key' };
    const b: RunCaller = { firmId, caller: 'user:b', via: 'session' };
    const t = Date.UTC(2026, 11, 3, 8, 0, 5);
    const a1 = await admitRun(a, t);
    const a2 = await admitRun(a, t + 1);
    const e = await refusal(admitRun(a, t + 2));
    expect(e).toMatchObject({ status: 429, code: 'rate_limited', retryAfter: 2 });
    expect(e.message).toMatch(/^This API key has 2 runs in progress, the most at once\./);
    const b1 = await admitRun(b, t + 3);
    // Three in progress in the firm: the member is refused by the firm's cap, in words for a member.
    const f = await refusal(admitRun(b, t + 4));
    expect(f.message).toMatch(/^Your firm has 3 runs in progress, the most at once\./);
    expect(await firmRunsInProgress(firmId, t + 4)).toBe(3);
    await a1.release();
    await a1.release();
    // Refused attempts count against the rate (3 per key per minute): key a has used 3 this minute.
    const r = await refusal(admitRun(a, t + 5));
    expect(r.message).toMatch(/^This API key has started 3 runs this minute, the most allowed\. Try again in 55 seconds\./);
    expect(r.retryAfter).toBe(55);
    await Promise.all([a2.release(), b1.release()]);
    expect(await firmRunsInProgress(firmId, t + 6)).toBe(0);
  });

  it('counts runs per fixed minute per key and per firm; a new minute starts afresh', async () => {
    const firmId = await newFirm();
    const t = Date.UTC(2026, 11, 3, 9, 0, 30);
    const keys: RunCaller[] = ['key:x', 'key:y'].map((caller) => ({ firmId, caller, via: 'api-key' }));
    for (let i = 0; i < 3; i++) await (await admitRun(keys[0]!, t + i)).release();
    const x = await refusal(admitRun(keys[0]!, t + 10));
    expect(x.retryAfter).toBe(30);
    // The firm allows 5: key x used 4 (3 admitted and 1 refused), so key y gets one more before the firm's limit.
    await (await admitRun(keys[1]!, t + 11)).release();
    const y = await refusal(admitRun(keys[1]!, t + 12));
    expect(y.message).toMatch(/^Your firm has started 5 runs this minute, the most allowed\. Try again in 30 seconds\./);
    // Next minute.
    await (await admitRun(keys[0]!, t + 30_000)).release();
  });

  it('ignores the lease of an instance that stopped once it expires', async () => {
    const firmId = await newFirm();
    const c: RunCaller = { firmId, caller: 'key:crashed', via: 'api-key' };
    const t = Date.UTC(2026, 11, 3, 10, 0, 0);
    await admitRun(c, t);
    await admitRun(c, t + 1);
    await refusal(admitRun(c, t + 2));
    // Leases last the time limit (10 s here) plus 30 s; later the runs no longer count (a minute on: a fresh rate window).
    await (await admitRun(c, t + 61_000)).release();
  });
});
