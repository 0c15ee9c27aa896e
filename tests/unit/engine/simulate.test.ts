/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants and bad inputs */
import { describe, expect, it } from 'vitest';
import { RunCancelledError } from '@/lib/core/engine/errors';
import { EXAMPLE_MODELS, exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { runModel, runModelSync, Simulation, type Progress } from '@/lib/core/engine/simulate';
import { normalCdf, normalSf } from '@/lib/core/engine/special';
import { fingerprint, hashArrays } from '@/tests/support/engine-helpers';

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));


function withSettings(model: object, settings: object, trials = 20_000) {
  const m = clone(model) as any;
  m.settings = { ...m.settings, ...settings, trials };
  return m;
}

const variants: [string, object][] = [
  ...Object.entries(EXAMPLE_MODELS),
  ['stack, Latin hypercube', withSettings(exampleLinearStack, { design: 'latin-hypercube' })],
  ['cost, Iman-Conover, ziggurat', withSettings(exampleCostRange, { correlationMethod: 'iman-conover', normalMethod: 'ziggurat' })],
  ['formula, ziggurat', withSettings(exampleFormula, { normalMethod: 'ziggurat' })],
];

describe('reproducibility', () => {
  it.each(variants)('%s: same seed, same bits; another seed, other numbers', (_n, model) => {
    const a = fingerprint(runModelSync(model, { samples: 'all' }));
    const b = fingerprint(runModelSync(model, { samples: 'all' }));
    expect(b).toEqual(a);
    const other = clone(model) as any;
    other.settings.seed = 'another seed';
    expect(fingerprint(runModelSync(other, { samples: 'all' })).samples).not.toBe(a.samples);
  });

  it.each(variants)('%s: a run in uneven steps equals the run in one piece, bit for bit', (_n, model) => {
    const whole = fingerprint(runModelSync(model, { samples: 'all' }));
    const sim = new Simulation(model, { samples: 'all' });
    const sizes = [1, 7, 4095, 4097, 333, 10_000];
    let i = 0;
    while (sim.done < sim.total) sim.step(sizes[i++ % sizes.length]);
    expect(fingerprint(sim.finish())).toEqual(whole);
  });

  it('the async runner gives the same result, reports progress and can be cancelled', async () => {
    const model = withSettings(exampleCostRange, {}, 200_000);
    const progress: Progress[] = [];
    const r = await runModel(model, { samples: 'outputs', chunkSize: 997, progressIntervalMs: 0, onProgress: (p) => progress.push(p) });
    expect(fingerprint(r)).toEqual(fingerprint(runModelSync(model, { samples: 'outputs' })));
    // One progress event per chunk of 16,384 trials (13 chunks), plus start, statistics and done.
    expect(progress.length).toBeGreaterThan(10);
    for (let k = 1; k < progress.length; k++) expect(progress[k].done).toBeGreaterThanOrEqual(progress[k - 1].done);
    expect(progress.at(-1)).toMatchObject({ runPhase: 'done', done: 200_000, total: 200_000 });

    const controller = new AbortController();
    const p = runModel(model, {
      chunkSize: 500,
      progressIntervalMs: 0,
      signal: controller.signal,
      onProgress: (q) => {
        if (q.done >= 2000) controller.abort();
      },
    });
    await expect(p).rejects.toBeInstanceOf(RunCancelledError);
  });
});

describe('results are plain JSON', () => {
  it.each(variants)('%s: no NaN or infinity hides in the statistics', (_n, model) => {
    const r = runModelSync(model);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});

describe('common random numbers: one sub-stream per input', () => {
  it('changing one contributor leaves every other contributor column bit-identical (Monte Carlo and LHS)', () => {
    for (const design of ['monte-carlo', 'latin-hypercube']) {
      const base = withSettings(exampleLinearStack, { design }, 10_000);
      const moved = clone(base);
      moved.contributors[3].plusTol = 0.02; // bearing A
      moved.contributors[0].distribution = { type: 'uniform' }; // housing: another law altogether
      moved.dials = moved.dials.filter((d: any) => d.id !== 'housing_k');
      const a = runModelSync(base, { samples: 'all' }).samples!.inputs;
      const b = runModelSync(moved, { samples: 'all' }).samples!.inputs;
      for (const id of ['gasket', 'cover_spigot', 'spacer', 'bearing_b']) expect(hashArrays([b[id]])).toBe(hashArrays([a[id]]));
      expect(hashArrays([b.bearing_a])).not.toBe(hashArrays([a.bearing_a]));
      expect(hashArrays([b.housing_depth])).not.toBe(hashArrays([a.housing_depth]));
    }
  });

  it('moving a dial changes only what it targets; a limit or budget dial changes no sample at all', () => {
    const a = runModelSync(exampleCostRange, { samples: 'all' });
    const b = runModelSync(exampleCostRange, { samples: 'all', dialValues: { budget_dial: 650, confidence_dial: 0.9 } });
    expect(fingerprint(b).samples).toBe(fingerprint(a).samples);
    expect(b.cost!.exceedBudget!.p).toBeLessThan(a.cost!.exceedBudget!.p);
    expect(b.run.dialValues).toMatchObject({ budget_dial: 650, confidence_dial: 0.9, lead_paint_p: 0.3 });
    const c = runModelSync(exampleCostRange, { samples: 'all', dialValues: { lead_paint_p: 0.6 } });
    // The probability dial moves only the occurrence column of that risk; its impacts stay.
    expect(hashArrays([c.samples!.inputs['lead_paint#impact']])).toBe(hashArrays([a.samples!.inputs['lead_paint#impact']]));
    expect(hashArrays([c.samples!.inputs['lead_paint#occurs']])).not.toBe(hashArrays([a.samples!.inputs['lead_paint#occurs']]));
    for (const id of ['scaffold', 'blast', 'weather#occurs', 'section_loss#impact']) expect(hashArrays([c.samples!.inputs[id]])).toBe(hashArrays([a.samples!.inputs[id]]));
    // Raising the probability with common random numbers only adds occurrences.
    const occA = a.samples!.inputs['lead_paint#occurs'];
    const occC = c.samples!.inputs['lead_paint#occurs'];
    for (let i = 0; i < occA.length; i++) expect(occC[i]).toBeGreaterThanOrEqual(occA[i]);
  });
});

describe('Latin hypercube (McKay, Beckman & Conover 1979)', () => {
  it('puts exactly one trial in each of the n strata of every input', () => {
    const n = 10_000;
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Strata',
      settings: { trials: n, seed: 'lhs', design: 'latin-hypercube' },
      inputs: [
        { id: 'u', name: 'U', distribution: { type: 'uniform', min: 0, max: 1 } },
        { id: 'z', name: 'Z', distribution: { type: 'normal', mean: 0, sd: 1 } },
        { id: 'w', name: 'W', distribution: { type: 'uniform', min: 0, max: 1 } },
      ],
      outputs: [{ id: 'y', name: 'Y', formula: 'u + z + w' }],
    };
    const r = runModelSync(model, { samples: 'all' });
    const check = (x: Float64Array, toU: (v: number) => number) => {
      const seen = new Uint8Array(n);
      for (const v of x) seen[Math.floor(toU(v) * n)]++;
      expect(seen.every((c) => c === 1)).toBe(true);
    };
    check(r.samples!.inputs.u, (v) => v);
    check(r.samples!.inputs.w, (v) => v);
    // Normal scores: Phi(z) must be stratified too (jstat-free: use the engine's Phi through the marginal CDF).
    check(r.samples!.inputs.z, (v) => normalCdf(v));
    // Independent permutations per input: u and w are not in the same order.
    expect(hashArrays([r.samples!.inputs.u])).not.toBe(hashArrays([r.samples!.inputs.w]));
  });
});

describe('closed-form checks through the whole model path', () => {
  it('a sum of independent normals has the normal law of the sum', () => {
    // Sum of N(10, 1), N(20, 2), N(-5, 2): mean 25, sd 3 (closed form; status: computed).
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Normal sum',
      settings: { trials: 200_000, seed: 'normal-sum', normalMethod: 'ziggurat' },
      inputs: [
        { id: 'x1', name: 'X1', distribution: { type: 'normal', mean: 10, sd: 1 } },
        { id: 'x2', name: 'X2', distribution: { type: 'normal', mean: 20, sd: 2 } },
        { id: 'x3', name: 'X3', distribution: { type: 'normal', mean: -5, sd: 2 } },
      ],
      outputs: [{ id: 's', name: 'Sum', formula: 'sum(x1, x2, x3)', upper: 31 }],
    };
    const r = runModelSync(model);
    const s = r.outputs[0];
    const n = 200_000;
    expect(Math.abs((s.mean as number) - 25)).toBeLessThan((5 * 3) / Math.sqrt(n));
    expect(Math.abs((s.sd as number) - 3)).toBeLessThan(5 * (3 / Math.sqrt(2 * n)));
    // P95 = 25 + 3 * 1.6448536 (z from check-values.md); its order-statistic interval must cover it.
    const p95 = s.percentiles.find((p) => p.p === 0.95)!;
    expect(p95.ci!.low).toBeLessThan(25 + 3 * 1.6448536269514722 + 0.02);
    expect(p95.ci!.high).toBeGreaterThan(25 + 3 * 1.6448536269514722 - 0.02);
    // Fraction above 31 = 2 sd: upper tail at 2 = 0.0227501 (from Phi(2) in check-values.md).
    const pAbove = 1 - 0.9772498680518208;
    expect(Math.abs(s.limits!.above!.p - pAbove)).toBeLessThan(5 * Math.sqrt((pAbove * (1 - pAbove)) / n));
    // The normal-theory estimate uses the sample mean and sd.
    expect(s.limits!.ppmNormal).toBe(normalSf((31 - (s.mean as number)) / (s.sd as number)) * 1e6);
    expect(Math.abs((s.limits!.ppmNormal as number) / (pAbove * 1e6) - 1)).toBeLessThan(0.03);
    expect(s.convergence.enough).toBe(true);
    expect(s.convergence.verdict).toMatch(/^Enough trials: Every percentile from P5 to P95/);
  });

  it('flags too few trials for the percentiles it reports', () => {
    const m = withSettings(exampleFormula, {}, 1000);
    const r = runModelSync(m);
    expect(r.outputs[2].convergence.enough).toBe(false);
    expect(r.outputs[2].convergence.verdict).toMatch(/^Not enough trials: P\d+ is known only to ±/);
  });
});
