/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants */
// A runner that reuses the columns of chunks outside the input window (no cache) gives exactly what a
// fresh runner gives: every sampler, formula and reordering writes all of a reused column.
import { describe, expect, it } from 'vitest';
import { CHUNK_SIZE, ChunkRunner, inputWindow } from '@/lib/core/engine/chunks';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { mergeParts } from '@/lib/core/engine/merge';
import { prepareRun } from '@/lib/core/engine/prepare-run';

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));
// Eight full chunks: the last lies outside the window of 100,000 trials a correlated model keeps, the last six
// outside the drivers' window of 25,000 of the others.
const TRIALS = 8 * CHUNK_SIZE;

function variant(model: object, settings: object, edit?: (m: any) => void) {
  const m = clone(model) as any;
  m.settings = { ...m.settings, ...settings, trials: TRIALS };
  edit?.(m);
  return m;
}

const everyLaw = variant(EXAMPLE_MODELS.formula, { normalMethod: 'ziggurat' }, (m) => {
  m.inputs.push(
    { id: 'k0', name: 'Constant', distribution: { type: 'constant', value: 2.5 } },
    { id: 'lgn', name: 'Lognormal', distribution: { type: 'lognormal', mu: 0.2, sigma: 0.4 } },
    { id: 'ex', name: 'Exponential', distribution: { type: 'exponential', rate: 0.5 } },
    { id: 'wb', name: 'Weibull', distribution: { type: 'weibull', shape: 1.5, scale: 2 } },
    { id: 'ga', name: 'Gamma', distribution: { type: 'gamma', shape: 2.2, scale: 0.7 } },
    { id: 'di', name: 'Discrete', distribution: { type: 'discrete', values: [1, 2, 5], probabilities: [0.2, 0.5, 0.3] } },
    { id: 'be', name: 'Bernoulli', distribution: { type: 'bernoulli', p: 0.3 } },
    { id: 'em', name: 'Empirical', distribution: { type: 'empirical', data: [1, 1.5, 2.25, 3, 4.5] } },
  );
  m.outputs.push({ id: 'mix', name: 'Mix', formula: 'k0 + lgn + ex + wb + ga + di + be + em + shaft_kw' });
});

const MODELS: Record<string, object> = {
  'linear stack': variant(EXAMPLE_MODELS['linear-stack'], {}),
  'cost range, copula': variant(EXAMPLE_MODELS['cost-range'], {}),
  'cost range, Iman-Conover': variant(EXAMPLE_MODELS['cost-range'], { correlationMethod: 'iman-conover', normalMethod: 'ziggurat' }),
  'stack, Latin hypercube': variant(EXAMPLE_MODELS['linear-stack'], { design: 'latin-hypercube' }),
  'formula, every law': everyLaw,
};

function result(runner: ChunkRunner, model: object) {
  const prep = prepareRun(model);
  runner.beginRun();
  const parts = runner.run(prep, Array.from({ length: prep.chunkCount }, (_, k) => k), { inputWindow: inputWindow(prep) });
  const r = mergeParts(prep, parts);
  r.timing = { samplingMs: 0, statisticsMs: 0, totalMs: 0 };
  return JSON.stringify(r);
}

describe('ChunkRunner reusing columns outside the input window', () => {
  it.each(Object.keys(MODELS))('%s: the same result as a fresh runner, after runs of other models', (name) => {
    const model = MODELS[name];
    const reused = new ChunkRunner();
    // Fill the spare columns with other values first: another seed, then another model.
    result(reused, variant(model, { seed: 'something else' }));
    result(reused, everyLaw === model ? MODELS['linear stack'] : everyLaw);
    expect((reused as unknown as { spare: Float64Array[] }).spare.length).toBeGreaterThan(0);
    expect(result(reused, model)).toBe(result(new ChunkRunner(), model));
  });
});

describe('output statistics of a chunk', () => {
  it('count no invalid trial when every value is finite but their sum overflows', () => {
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Huge values',
      settings: { trials: 3000, seed: 'huge' },
      inputs: [{ id: 'x', name: 'X', distribution: { type: 'uniform', min: 1, max: 1.5 } }],
      outputs: [
        { id: 'big', name: 'Big', formula: 'x * 1e308' },
        { id: 'mixed', name: 'Mixed', formula: 'if(x < 1.1, 1 / 0, x)' },
      ],
    };
    const prep = prepareRun(model);
    const [part] = new ChunkRunner().run(prep, [0]);
    expect(part.outputs.big.every((v) => Number.isFinite(v))).toBe(true);
    expect(part.outputMoments.big).toMatchObject({ n: 3000, nan: 0, positiveInfinity: 0, negativeInfinity: 0 });
    const inf = part.outputs.mixed.filter((v) => v === Infinity).length;
    expect(inf).toBeGreaterThan(100);
    expect(part.outputMoments.mixed).toMatchObject({ n: 3000 - inf, nan: 0, positiveInfinity: inf, negativeInfinity: 0 });
    expect(Number.isFinite(part.outputMoments.mixed.mean)).toBe(true);
  });
});
