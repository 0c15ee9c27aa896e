import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCostRange, exampleFormula, exampleLinearStack, runModelSync } from '@/lib/core/engine';
import { workOf } from '@/lib/server/simulate/budget';
import { resetRunLimits } from '@/lib/server/simulate/limits';
import { closePool, poolStats, runOnPool, RunQueueFullError, RunTimeoutError } from '@/lib/server/simulate/pool';
import { runTask } from '@/lib/server/simulate/pool-worker';

// The server's worker-thread pool (piscina) with the real bundled worker (built by tests/support/run-worker-setup.ts).

const withTrials = <T extends { settings: object }>(m: T, trials: number): T => ({ ...m, settings: { ...m.settings, trials } });
const withoutTiming = (body: Record<string, unknown>): Record<string, unknown> => ({ ...body, timing: null });
const MAX_WORK = 20_000_000;

beforeAll(() => {
  process.env.SIMULATE_THREADS = '2';
  resetRunLimits();
});
afterAll(async () => {
  await closePool();
  delete process.env.SIMULATE_THREADS;
  resetRunLimits();
});

describe('server run pool', () => {
  it('gives on a worker thread the very bytes the engine gives on this thread (worker = server), for every template', async () => {
    for (const model of [withTrials(exampleLinearStack, 10_000), withTrials(exampleCostRange, 10_000), withTrials(exampleFormula, 10_000)]) {
      const samples = { which: 'all' as const, limit: 500 };
      const reply = await runOnPool({ model, reply: 'json', samples, maxWork: MAX_WORK, percentiles: [0.025, 0.975] });
      if (!reply.ok || !('json' in reply)) throw new Error(`expected a JSON body, got ${JSON.stringify(reply)}`);
      const fromPool = JSON.parse(new TextDecoder().decode(reply.json)) as Record<string, unknown>;
      // The same task on this thread, and the engine called directly: identical apart from wall-clock timing.
      const here = runTask({ model, reply: 'json', samples, maxWork: MAX_WORK, percentiles: [0.025, 0.975] });
      if (!here.ok || !('json' in here)) throw new Error('expected a JSON body');
      expect(withoutTiming(fromPool)).toEqual(withoutTiming(JSON.parse(new TextDecoder().decode(here.json))));
      const direct = runModelSync(model, { samples: 'all', percentiles: [0.025, 0.975] });
      expect(JSON.stringify(withoutTiming(fromPool).outputs)).toBe(JSON.stringify(direct.outputs));
      expect((fromPool.samples as { outputs: Record<string, number[]> }).outputs[direct.outputs[0]!.id]).toEqual(Array.from(direct.samples!.outputs[direct.outputs[0]!.id]!.subarray(0, 500)));
    }
    // Snapshot re-runs take the RunResult itself.
    const m = withTrials(exampleLinearStack, 5000);
    const r = await runOnPool({ model: m, dialValues: {}, reply: 'result', maxWork: MAX_WORK });
    if (!r.ok || !('result' in r)) throw new Error('expected a result');
    expect(r.result.outputs).toEqual(runModelSync(m).outputs);
  });

  it('refuses a run over the work budget before allocating, naming trials × columns and the most trials allowed', async () => {
    const model = withTrials(exampleLinearStack, 2_000_000);
    const w = workOf(model)!;
    expect(w).toEqual({ trials: 2_000_000, columns: exampleLinearStack.contributors.length, work: 2_000_000 * exampleLinearStack.contributors.length });
    const reply = await runOnPool({ model, reply: 'json', maxWork: 1_000_000 });
    expect(reply).toEqual({ ok: false, failure: { kind: 'budget', message: expect.stringMatching(/at most 1,000,000.*model\.settings\.trials to 166,666 or fewer/) } });
  });

  it('reports model problems with their paths', async () => {
    const bad = structuredClone(withTrials(exampleLinearStack, 5000)) as unknown as { contributors: { minusTol: number }[] };
    bad.contributors[1]!.minusTol = -1;
    const reply = await runOnPool({ model: bad, reply: 'json', maxWork: MAX_WORK });
    expect(reply.ok).toBe(false);
    if (reply.ok || reply.failure.kind !== 'model') throw new Error('expected model issues');
    expect(reply.failure.issues.map((i) => i.path.join('.'))).toContain('contributors.1.minusTol');
  });

  it('stops a run over its time limit, frees the thread, and runs the next one', async () => {
    const big = withTrials(exampleFormula, 2_000_000);
    const t0 = performance.now();
    await expect(runOnPool({ model: big, reply: 'json', maxWork: 1e9 }, 150)).rejects.toBeInstanceOf(RunTimeoutError);
    // Refused at the limit, not when the run would have ended.
    expect(performance.now() - t0).toBeLessThan(1500);
    expect(poolStats()).toMatchObject({ running: 0, queued: 0 });
    // Two queued behind a stopped one: both cancelled, nothing left over.
    const results = await Promise.allSettled([1, 2, 3].map(() => runOnPool({ model: big, reply: 'json', maxWork: 1e9 }, 150)));
    expect(results.map((r) => r.status)).toEqual(['rejected', 'rejected', 'rejected']);
    expect(poolStats()).toMatchObject({ running: 0, queued: 0 });
    const small = await runOnPool({ model: withTrials(exampleFormula, 2000), reply: 'result', maxWork: MAX_WORK });
    expect(small.ok).toBe(true);
    expect(poolStats()).toMatchObject({ running: 0, queued: 0 });
    expect(poolStats().threads).toBeGreaterThanOrEqual(1);
  });

  it('drops a run that waits too long for a thread, unstarted, and leaves nothing behind', async () => {
    const big = withTrials(exampleFormula, 2_000_000);
    // Both threads busy (each run stopped after 1.5 s); a third may wait 100 ms only.
    const busy = [1, 2].map(() => runOnPool({ model: big, reply: 'json', maxWork: 1e9 }, 1500));
    await new Promise((r) => setTimeout(r, 300));
    const err = await runOnPool({ model: big, reply: 'json', maxWork: 1e9 }, 60_000, 100).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(RunQueueFullError);
    expect((err as RunQueueFullError).waitedMs).toBe(100);
    const settled = await Promise.allSettled(busy);
    expect(settled.map((r) => r.status === 'rejected' && r.reason instanceof RunTimeoutError)).toEqual([true, true]);
    expect(poolStats()).toMatchObject({ running: 0, queued: 0 });
  });
});
