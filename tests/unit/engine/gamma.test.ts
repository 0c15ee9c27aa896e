import { describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { createMarginal, type DistributionSpec } from '@/lib/core/engine/distributions';
import { regGammaPQ, standardGammaInverse, LARGE_SHAPE } from '@/lib/core/engine/gamma';
import { createColumnSampler, type SamplerContext } from '@/lib/core/engine/samplers';
import { runModelSync } from '@/lib/core/engine/simulate';
import { validateModel } from '@/lib/core/engine/schema';
import { ksCritical001, ksStatistic, mean, variance } from '@/tests/support/engine-helpers';

const N = 100_000;

function draw(spec: DistributionSpec, ctx: Partial<SamplerContext> = {}, n = N): Float64Array {
  const full: SamplerContext = { seed: 'gamma-ks', design: 'monte-carlo', normalMethod: 'box-muller', trials: n, ...ctx };
  const out = new Float64Array(n);
  createColumnSampler(createMarginal(spec), full, 'g').fill(out, 0, n);
  return out;
}

describe('regularised incomplete gamma and its inverse', () => {
  it('P(a, x) agrees with jstat 1.9.6 gamma.cdf (its values are checked against R) from shape 0.3 to 5,000', () => {
    for (const a of [0.3, 1, 2.5, 10, 150, 5000]) {
      for (const u of [1e-6, 0.01, 0.3, 0.5, 0.9, 0.999]) {
        const x = jStat.gamma.inv(u, a, 1);
        const [p, q] = regGammaPQ(a, x);
        expect(Math.abs(p - jStat.gamma.cdf(x, a, 1))).toBeLessThan(1e-9);
        expect(p + q).toBeCloseTo(1, 14);
      }
    }
  });

  it('Q(a, x) keeps its digits in the upper tail, where 1 − P would be 0 (exponential case: Q(1, x) = e^−x, exact)', () => {
    // Shape 1 is the exponential law: Q(1, 40) = e^−40 ≈ 4.25e−18, below double precision's 1 − P.
    const [, q] = regGammaPQ(1, 40);
    expect(q / Math.exp(-40)).toBeCloseTo(1, 10);
  });

  it('the inverse returns the quantile: P(a, x(p)) = p to 1e−12 relative on the smaller tail', () => {
    for (const a of [0.3, 1, 2.5, 10, 150, 5000]) {
      for (const p of [1e-9, 1e-4, 0.05, 0.5, 0.95, 1 - 1e-7]) {
        const q = 1 - p;
        const x = standardGammaInverse(a, p, q);
        const [P, Q] = regGammaPQ(a, x);
        const err = p < 0.5 ? Math.abs(P - p) / p : Math.abs(Q - q) / q;
        expect(err).toBeLessThan(1e-6);
        // And jstat's quantile agrees.
        if (p >= 1e-4 && p <= 0.95) expect(x).toBeCloseTo(jStat.gamma.inv(p, a, 1), 6);
      }
    }
  });

  it('above the large-shape threshold the Wilson–Hilferty approximation stays within 1e−6 of jstat in CDF', () => {
    for (const a of [LARGE_SHAPE * 1.01, 1e6]) {
      for (const p of [0.001, 0.5, 0.999]) {
        const x = standardGammaInverse(a, p, 1 - p);
        expect(Math.abs(jStat.gamma.cdf(x, a, 1) - p)).toBeLessThan(1e-6);
      }
    }
  });
});

describe('gamma inputs are sampled from the right law', () => {
  // Reference CDF: jstat 1.9.6 gamma (shape, scale). KS at α = 0.001 (Massey 1951; 1.949475/√n, Simard & L'Ecuyer 2011, computed).
  const cases: [string, number, number, Partial<SamplerContext>][] = [
    ['shape 2.5, scale 0.4, Monte Carlo', 2.5, 0.4, {}],
    ['shape 0.6, scale 3, Monte Carlo', 0.6, 3, {}],
    ['shape 40, scale 0.05, Latin hypercube', 40, 0.05, { design: 'latin-hypercube' }],
  ];
  it.each(cases)('%s passes a KS test against jstat', (_n, k, theta, ctx) => {
    const x = draw({ type: 'gamma', shape: k, scale: theta }, ctx);
    expect(ksStatistic(x, (v) => jStat.gamma.cdf(v, k, theta))).toBeLessThan(ksCritical001(N));
    // Mean kθ, variance kθ² (jstat's own moments), within five standard errors.
    expect(Math.abs(mean(x) - jStat.gamma.mean(k, theta))).toBeLessThan(5 * Math.sqrt(jStat.gamma.variance(k, theta) / N));
    expect(variance(x) / jStat.gamma.variance(k, theta)).toBeGreaterThan(0.95);
    expect(variance(x) / jStat.gamma.variance(k, theta)).toBeLessThan(1.05);
  });

  it('the KS test is strict enough to reject a neighbouring law (shape 2.5 against 2.6)', () => {
    const x = draw({ type: 'gamma', shape: 2.5, scale: 0.4 });
    expect(ksStatistic(x, (v) => jStat.gamma.cdf(v, 2.6, 0.4))).toBeGreaterThan(ksCritical001(N));
  });

  it('a formula model takes a gamma input, in a correlated group too, and refuses a bad shape with its path', () => {
    const model = {
      schema: 'stochos.model/1',
      title: 'Gamma input',
      template: 'formula',
      settings: { trials: 20_000, seed: 7 },
      inputs: [
        { id: 'wait', name: 'Waiting time', distribution: { type: 'gamma', shape: 3, scale: 2 } },
        { id: 'other', name: 'Other', distribution: { type: 'normal', mean: 0, sd: 1 } },
      ],
      correlation: { inputs: ['wait', 'other'], matrix: [[1, 0.5], [0.5, 1]] },
      outputs: [{ id: 'y', name: 'y', formula: 'wait + other' }],
    };
    const r = runModelSync(model);
    const wait = r.inputs.find((i) => i.id === 'wait')!;
    expect(wait.distribution).toBe('gamma');
    expect(wait.analyticMean).toBeCloseTo(6, 12);
    expect(Math.abs(wait.mean - 6)).toBeLessThan(5 * Math.sqrt(12 / 20_000));
    const bad = validateModel({ ...model, inputs: [{ id: 'wait', name: 'Waiting time', distribution: { type: 'gamma', shape: 0, scale: 2 } }, model.inputs[1]] });
    expect(bad.ok).toBe(false);
    expect(bad.issues[0]).toMatchObject({ path: ['inputs', 0, 'distribution', 'shape'] });
    expect(bad.issues[0].message).toMatch(/shape must be positive/i);
  });
});
