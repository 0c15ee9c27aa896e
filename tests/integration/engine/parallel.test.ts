/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants */
/**
 * Chunked determinism: the same model, dial values, seed and trials give bit-identical
 * results on 1, 2 or 4 Node worker threads and on one thread (runModelSync, what the server
 * runs), and the external checks hold for runs made in parallel.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { CHUNK_SIZE, ChunkRunner, chunkCount, mergeMoments, momentsOf } from '@/lib/core/engine/chunks';
import { prepareRun, runChunks } from '@/lib/core/engine/prepare-run';
import { EXAMPLE_MODELS, exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { mergeChunks, mergeParts, runModelSync } from '@/lib/core/engine/simulate';
import { RankStore } from '@/lib/core/engine/stats';
import { fingerprint, ksCritical001, ksStatistic } from '@/tests/support/engine-helpers';
import { createNodeEnginePool, type NodeEnginePool } from '@/tests/support/node-engine-pool';

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));
function variant(model: object, settings: object, trials = 60_000) {
  const m = clone(model) as any;
  m.settings = { ...m.settings, ...settings, trials };
  return m;
}

// 60,000 trials: three full chunks of 16,384 and a short one.
const MODELS: Record<string, object> = {
  stack: variant(exampleLinearStack, {}),
  cost: variant(exampleCostRange, {}),
  formula: variant(exampleFormula, {}),
  'stack, Latin hypercube': variant(exampleLinearStack, { design: 'latin-hypercube' }),
  'cost, Iman-Conover, ziggurat': variant(exampleCostRange, { correlationMethod: 'iman-conover', normalMethod: 'ziggurat' }),
  'formula, ziggurat, Latin hypercube': variant(exampleFormula, { normalMethod: 'ziggurat', design: 'latin-hypercube' }),
};

const pools: Record<number, NodeEnginePool> = {};
beforeAll(async () => {
  for (const n of [1, 2, 4]) pools[n] = await createNodeEnginePool(n);
}, 120_000);
afterAll(async () => {
  for (const p of Object.values(pools)) await p.close();
});

describe('bit-identical across 1, 2 and 4 worker threads', () => {
  it.each(Object.entries(MODELS))('%s', async (_name, model) => {
    const single = fingerprint(runModelSync(model, { samples: 'all' }));
    for (const n of [1, 2, 4]) {
      const r = fingerprint(await pools[n].run(model, { samples: 'all' }));
      expect({ workers: n, columns: r.columns }).toEqual({ workers: n, columns: single.columns });
      expect(r.stats).toBe(single.stats);
    }
    // Without sample columns the statistics are the same too (the merge needs only a window of the inputs).
    const lean = await pools[2].run(model, { dialValues: {}, samples: 'none' });
    expect(fingerprint(lean).stats).toBe(fingerprint(runModelSync(model)).stats);
  });

  it('chunks run in any order and any grouping merge to the same result (runChunks + mergeChunks)', () => {
    const model = MODELS.cost;
    const count = chunkCount(60_000);
    const order = [3, 0, 2, 1];
    expect(count).toBe(4);
    const parts = [...runChunks(model, { lead_paint_p: 0.5 }, null, null, order.slice(0, 2), { inputWindow: 60_000 }), ...runChunks(model, { lead_paint_p: 0.5 }, null, null, order.slice(2), { inputWindow: 60_000 })];
    const merged = mergeChunks(model, { lead_paint_p: 0.5 }, null, null, parts, { samples: 'all' });
    expect(fingerprint(merged)).toEqual(fingerprint(runModelSync(model, { samples: 'all', dialValues: { lead_paint_p: 0.5 } })));
    // Seed and trials passed explicitly replace the model's.
    const other = mergeChunks(model, {}, 'other seed', 20_000, runChunks(model, {}, 'other seed', 20_000, [0, 1]));
    const m2 = clone(model) as any;
    m2.settings.seed = 'other seed';
    m2.settings.trials = 20_000;
    expect(fingerprint(other).stats).toBe(fingerprint(runModelSync(m2)).stats);
    expect(() => mergeChunks(model, {}, null, null, parts.slice(1))).toThrow(/Chunk \d of 4 is missing/);
  });

  it('a runner that keeps unchanged columns gives, after dial moves, exactly a fresh run', () => {
    const runner = new ChunkRunner({ cache: true });
    const ranks = new RankStore();
    const model = variant(exampleLinearStack, {}, 50_000);
    const dial = model.dials[0];
    for (const v of [dial.default, dial.min, dial.max, dial.default]) {
      const prep = prepareRun(model, { [dial.id]: v });
      runner.beginRun();
      ranks.beginRun();
      const parts = runner.run(prep, [0, 1, 2, 3], { inputWindow: 50_000 });
      const cached = mergeParts(prep, parts, { samples: 'all' }, { ranks });
      expect(fingerprint(cached)).toEqual(fingerprint(runModelSync(model, { samples: 'all', dialValues: { [dial.id]: v } })));
    }
  });
});

describe('moments merged by the pairwise update (Chan, Golub & LeVeque 1979)', () => {
  it('equal the two-pass moments of the whole column to rounding', () => {
    const x = new Float64Array(100_003);
    for (let i = 0; i < x.length; i++) x[i] = 1e6 + Math.sin(i) * 3 + (i % 7);
    let m = momentsOf(x.subarray(0, 0));
    for (let s = 0; s < x.length; s += CHUNK_SIZE) m = mergeMoments(m, momentsOf(x.subarray(s, Math.min(x.length, s + CHUNK_SIZE))));
    const whole = momentsOf(x);
    expect(m.n).toBe(whole.n);
    expect(Math.abs(m.mean - whole.mean) / whole.mean).toBeLessThan(1e-14);
    expect(Math.abs(m.m2 - whole.m2) / whole.m2).toBeLessThan(1e-10);
  });
});

describe('external checks on runs made by 2 worker threads', () => {
  it('each input column passes a KS test against jstat 1.9.6 (alpha = 0.001)', async () => {
    const n = 100_000;
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'KS through the pool',
      settings: { trials: n, seed: 'parallel-ks' },
      inputs: [
        { id: 'u', name: 'U', distribution: { type: 'uniform', min: 2, max: 5 } },
        { id: 't', name: 'T', distribution: { type: 'triangular', min: 1, mode: 5, max: 11 } },
        { id: 'z', name: 'Z', distribution: { type: 'normal', mean: 10, sd: 2 } },
        { id: 'w', name: 'W', distribution: { type: 'weibull', shape: 1.7, scale: 3 } },
        { id: 'l', name: 'L', distribution: { type: 'lognormal', mu: 0.5, sigma: 0.4 } },
      ],
      outputs: [{ id: 'y', name: 'Y', formula: 'u + t + z + w + l' }],
    };
    const r = await pools[2].run(model, { samples: 'all' });
    const cdfs: Record<string, (x: number) => number> = {
      u: (x) => jStat.uniform.cdf(x, 2, 5),
      t: (x) => jStat.triangular.cdf(x, 1, 11, 5),
      z: (x) => jStat.normal.cdf(x, 10, 2),
      w: (x) => jStat.weibull.cdf(x, 3, 1.7),
      l: (x) => jStat.lognormal.cdf(x, 0.5, 0.4),
    };
    for (const [id, cdf] of Object.entries(cdfs)) expect({ id, d: ksStatistic(r.samples!.inputs[id], cdf) < ksCritical001(n) }).toEqual({ id, d: true });
  });

  it('the demo examples agree with their closed forms in parallel mode', async () => {
    // Sum of N(10, 1), N(20, 2), N(-5, 2): mean 25, sd 3 (closed form); P(Y > 31) = 1 - Phi(2) = 0.0227501 (check-values.md).
    const n = 200_000;
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Normal sum',
      settings: { trials: n, seed: 'normal-sum', normalMethod: 'ziggurat' },
      inputs: [
        { id: 'x1', name: 'X1', distribution: { type: 'normal', mean: 10, sd: 1 } },
        { id: 'x2', name: 'X2', distribution: { type: 'normal', mean: 20, sd: 2 } },
        { id: 'x3', name: 'X3', distribution: { type: 'normal', mean: -5, sd: 2 } },
      ],
      outputs: [{ id: 's', name: 'Sum', formula: 'sum(x1, x2, x3)', upper: 31 }],
    };
    const s = (await pools[4].run(model)).outputs[0];
    expect(Math.abs((s.mean as number) - 25)).toBeLessThan((5 * 3) / Math.sqrt(n));
    expect(Math.abs((s.sd as number) - 3)).toBeLessThan(5 * (3 / Math.sqrt(2 * n)));
    const pAbove = 1 - 0.9772498680518208;
    expect(Math.abs(s.limits!.above!.p - pAbove)).toBeLessThan(5 * Math.sqrt((pAbove * (1 - pAbove)) / n));
    // And the examples the published checks use run identically on the threads.
    for (const m of Object.values(EXAMPLE_MODELS)) expect(fingerprint(await pools[2].run(m)).stats).toBe(fingerprint(runModelSync(m)).stats);
  });
});
