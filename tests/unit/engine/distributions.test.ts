import { describe, expect, it } from 'vitest';
import { jStat } from 'jstat';
import { createMarginal, pertShape, type DistributionSpec } from '@/lib/core/engine/distributions';
import { Stream } from '@/lib/core/engine/rng';
import { createColumnSampler, type SamplerContext } from '@/lib/core/engine/samplers';
import { regIncBeta } from '@/lib/core/engine/special';
import { ksCritical001, ksStatistic, mean, variance } from '@/tests/support/engine-helpers';

const N = 100_000;

function draw(spec: DistributionSpec, ctx: Partial<SamplerContext> = {}, n = N, id = 'x'): Float64Array {
  const full: SamplerContext = { seed: 'ks-tests', design: 'monte-carlo', normalMethod: 'box-muller', trials: n, ...ctx };
  const sampler = createColumnSampler(createMarginal(spec), full, id);
  const out = new Float64Array(n);
  sampler.fill(out, 0, n);
  return out;
}

/** Draws through the inverse CDF directly (the path used by the copula and LHS). */
function drawInverse(spec: DistributionSpec, n = N): Float64Array {
  const m = createMarginal(spec);
  const s = Stream.forInput('ks-inverse', 'x');
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const u = s.uniform();
    out[i] = m.inv(u, 1 - u);
  }
  return out;
}

const beta01 = (a: number, m: number, b: number) => {
  const { alpha, beta } = pertShape(a, m, b);
  return (x: number) => jStat.beta.cdf((x - a) / (b - a), alpha, beta);
};

// Reference CDFs from jstat 1.9.6 (its own tests compare with R).
const ksCases: [string, DistributionSpec, (x: number) => number, Partial<SamplerContext>?][] = [
  ['uniform(2, 5)', { type: 'uniform', min: 2, max: 5 }, (x) => jStat.uniform.cdf(x, 2, 5)],
  ['triangular(1, 5, 11)', { type: 'triangular', min: 1, mode: 5, max: 11 }, (x) => jStat.triangular.cdf(x, 1, 11, 5)],
  ['triangular with mode at the minimum', { type: 'triangular', min: 0, mode: 0, max: 4 }, (x) => jStat.triangular.cdf(x, 0, 4, 0)],
  ['triangular with mode at the maximum', { type: 'triangular', min: 0, mode: 4, max: 4 }, (x) => jStat.triangular.cdf(x, 0, 4, 4)],
  ['normal(10, 3), Box-Muller', { type: 'normal', mean: 10, sd: 3 }, (x) => jStat.normal.cdf(x, 10, 3)],
  ['normal(10, 3), ziggurat', { type: 'normal', mean: 10, sd: 3 }, (x) => jStat.normal.cdf(x, 10, 3), { normalMethod: 'ziggurat' }],
  ['normal(10, 3), Latin hypercube', { type: 'normal', mean: 10, sd: 3 }, (x) => jStat.normal.cdf(x, 10, 3), { design: 'latin-hypercube' }],
  [
    'normal(10, 3) truncated to [8, 15]',
    { type: 'normal', mean: 10, sd: 3, min: 8, max: 15 },
    (x) => (jStat.normal.cdf(x, 10, 3) - jStat.normal.cdf(8, 10, 3)) / (jStat.normal.cdf(15, 10, 3) - jStat.normal.cdf(8, 10, 3)),
  ],
  [
    'normal(0, 1) truncated to its upper tail [3, inf)',
    { type: 'normal', mean: 0, sd: 1, min: 3 },
    (x) => (x < 3 ? 0 : 1 - (1 - jStat.normal.cdf(x, 0, 1)) / (1 - jStat.normal.cdf(3, 0, 1))),
  ],
  ['lognormal(0.5, 0.4)', { type: 'lognormal', mu: 0.5, sigma: 0.4 }, (x) => jStat.lognormal.cdf(x, 0.5, 0.4)],
  [
    'lognormal(0.5, 0.4) truncated to [1, 3]',
    { type: 'lognormal', mu: 0.5, sigma: 0.4, min: 1, max: 3 },
    (x) => (jStat.lognormal.cdf(x, 0.5, 0.4) - jStat.lognormal.cdf(1, 0.5, 0.4)) / (jStat.lognormal.cdf(3, 0.5, 0.4) - jStat.lognormal.cdf(1, 0.5, 0.4)),
  ],
  ['exponential(rate 0.7)', { type: 'exponential', rate: 0.7 }, (x) => jStat.exponential.cdf(x, 0.7)],
  ['Weibull(shape 2, scale 1.5)', { type: 'weibull', shape: 2, scale: 1.5 }, (x) => jStat.weibull.cdf(x, 1.5, 2)],
  ['Weibull(shape 0.8, scale 3)', { type: 'weibull', shape: 0.8, scale: 3 }, (x) => jStat.weibull.cdf(x, 3, 0.8)],
  ['PERT(0, 5, 10) by rejection', { type: 'pert', min: 0, mode: 5, max: 10 }, beta01(0, 5, 10)],
  ['PERT(2, 3, 10) by rejection', { type: 'pert', min: 2, mode: 3, max: 10 }, beta01(2, 3, 10)],
  ['PERT(90, 100, 130) under Latin hypercube (inverse CDF)', { type: 'pert', min: 90, mode: 100, max: 130 }, beta01(90, 100, 130), { design: 'latin-hypercube' }],
];

describe('Kolmogorov-Smirnov against jstat CDFs (alpha = 0.001, n = 100,000)', () => {
  it.each(ksCases)('%s', (_name, spec, cdf, ctx) => {
    const x = draw(spec, ctx);
    expect(ksStatistic(x, cdf)).toBeLessThan(ksCritical001(N));
  });

  it.each([
    ['PERT(0, 5, 10)', { type: 'pert', min: 0, mode: 5, max: 10 } as DistributionSpec, beta01(0, 5, 10)],
    ['PERT(1, 1, 11), mode at the minimum', { type: 'pert', min: 1, mode: 1, max: 11 } as DistributionSpec, beta01(1, 1, 11)],
    ['PERT(10, 12, 20)', { type: 'pert', min: 10, mode: 12, max: 20 } as DistributionSpec, beta01(10, 12, 20)],
    ['PERT(0, 10, 10), mode at the maximum', { type: 'pert', min: 0, mode: 10, max: 10 } as DistributionSpec, beta01(0, 10, 10)],
  ])('%s through its tabulated inverse CDF', (_n, spec, cdf) => {
    expect(ksStatistic(drawInverse(spec), cdf)).toBeLessThan(ksCritical001(N));
  });

  it('a KS test this strict does reject a wrong law (normal sd 3 against sd 3.1)', () => {
    const x = draw({ type: 'normal', mean: 10, sd: 3 });
    expect(ksStatistic(x, (v) => jStat.normal.cdf(v, 10, 3.1))).toBeGreaterThan(ksCritical001(N));
  });

  it('empirical: linear interpolation of the inverse ECDF', () => {
    const data = [3.1, 2.4, 5.0, 4.2, 2.9, 3.3, 4.8, 3.9];
    const sorted = [...data].sort((a, b) => a - b);
    // Reference written independently: CDF is piecewise linear through (x_(i), i / (n - 1)).
    const ref = (x: number) => {
      if (x <= sorted[0]) return 0;
      if (x >= sorted[sorted.length - 1]) return 1;
      let i = 0;
      while (sorted[i + 1] < x) i++;
      return (i + (x - sorted[i]) / (sorted[i + 1] - sorted[i])) / (sorted.length - 1);
    };
    expect(ksStatistic(draw({ type: 'empirical', data }), ref)).toBeLessThan(ksCritical001(N));
  });

  it('author-drawn density by rejection and by its inverse CDF', () => {
    const points = [
      { x: 0, y: 0 },
      { x: 1, y: 2 },
      { x: 3, y: 1 },
      { x: 4, y: 0 },
    ];
    // Reference CDF by integrating the piecewise-linear density (trapezoids), written here.
    const area = 1 + 3 + 0.5;
    const ref = (x: number) => {
      let acc = 0;
      for (let i = 1; i < points.length; i++) {
        const p0 = points[i - 1];
        const p1 = points[i];
        if (x <= p0.x) break;
        const t = Math.min(x, p1.x) - p0.x;
        const slope = (p1.y - p0.y) / (p1.x - p0.x);
        acc += p0.y * t + (slope * t * t) / 2;
      }
      return Math.min(1, acc / area);
    };
    const spec: DistributionSpec = { type: 'drawn', points };
    expect(ksStatistic(draw(spec), ref)).toBeLessThan(ksCritical001(N));
    expect(ksStatistic(drawInverse(spec), ref)).toBeLessThan(ksCritical001(N));
  });
});

describe('discrete laws (chi-square goodness of fit)', () => {
  // Chi-square upper 0.1 % points: 3 d.f. 16.266, 1 d.f. 10.828 (Hines & Montgomery 1980, App. Table III,
  // as shipped in simple-statistics; restated).
  it('discrete values with probabilities', () => {
    const x = draw({ type: 'discrete', values: [10, 2, 7, 5], probabilities: [0.1, 0.4, 0.3, 0.2] });
    const probs: Record<number, number> = { 10: 0.1, 2: 0.4, 7: 0.3, 5: 0.2 };
    const counts: Record<number, number> = { 10: 0, 2: 0, 7: 0, 5: 0 };
    for (const v of x) counts[v]++;
    const chi2 = Object.keys(probs).reduce((s, k) => s + (counts[+k] - N * probs[+k]) ** 2 / (N * probs[+k]), 0);
    expect(chi2).toBeLessThan(16.266);
  });
  it('Bernoulli risk occurrence', () => {
    const x = draw({ type: 'bernoulli', p: 0.23 });
    const ones = x.reduce((s, v) => s + v, 0);
    const chi2 = (ones - N * 0.23) ** 2 / (N * 0.23) + (N - ones - N * 0.77) ** 2 / (N * 0.77);
    expect(chi2).toBeLessThan(10.828);
    expect(draw({ type: 'bernoulli', p: 0 }, {}, 1000).every((v) => v === 0)).toBe(true);
    expect(draw({ type: 'bernoulli', p: 1 }, {}, 1000).every((v) => v === 1)).toBe(true);
  });
});

describe('moments against closed forms', () => {
  it('analytic moments reproduce the published check values', () => {
    // Lognormal(0, 1): mean 1.6487, variance 4.6708 (NIST e-Handbook §1.3.6.6.9, from memory).
    const ln = createMarginal({ type: 'lognormal', mu: 0, sigma: 1 });
    expect(ln.mean).toBeCloseTo(1.6487, 4);
    expect(ln.variance).toBeCloseTo(4.6708, 4);
    // Weibull k = 2, lambda = 1: 0.8862269255 and 0.2146018366 (NIST e-Handbook §1.3.6.6.8, restated).
    const wb = createMarginal({ type: 'weibull', shape: 2, scale: 1 });
    expect(wb.mean).toBeCloseTo(0.8862269255, 9);
    expect(wb.variance).toBeCloseTo(0.2146018366, 9);
    // Beta-PERT exact variance (mu - a)(b - mu) / 7 (Herrerias-Velasco et al. 2011, restated; values computed).
    const pertCases: [number, number, number, number, number][] = [
      [0, 5, 10, 5, 3.571429],
      [1, 5, 11, 5.333333, 3.507937],
      [2, 3, 10, 4, 1.714286],
      [10, 12, 20, 13, 3.0],
    ];
    for (const [a, m, b, mu, v] of pertCases) {
      const p = createMarginal({ type: 'pert', min: a, mode: m, max: b });
      expect(p.mean).toBeCloseTo(mu, 6);
      expect(p.variance).toBeCloseTo(v, 6);
      // The same variance from the beta law itself (jstat): (b - a)^2 alpha beta / ((alpha + beta)^2 (alpha + beta + 1)).
      const { alpha, beta } = pertShape(a, m, b);
      expect(p.variance).toBeCloseTo((b - a) ** 2 * jStat.beta.variance(alpha, beta), 10);
    }
    // Triangular (Evans, Hastings & Peacock, ch. 40, restated); uniform (NIST §1.3.6.6.2, from memory).
    const tri = createMarginal({ type: 'triangular', min: 1, mode: 5, max: 11 });
    expect(tri.mean).toBeCloseTo(17 / 3, 12);
    expect(tri.variance).toBeCloseTo((1 + 121 + 25 - 11 - 5 - 55) / 18, 12);
    const un = createMarginal({ type: 'uniform', min: 2, max: 5 });
    expect(un.variance).toBeCloseTo(9 / 12, 12);
  });

  it.each([
    ['normal(10, 3)', { type: 'normal', mean: 10, sd: 3 } as DistributionSpec],
    ['truncated normal(10, 3, [8, 15])', { type: 'normal', mean: 10, sd: 3, min: 8, max: 15 } as DistributionSpec],
    ['lognormal(0, 1)', { type: 'lognormal', mu: 0, sigma: 1 } as DistributionSpec],
    ['truncated lognormal(0.5, 0.4, [1, 3])', { type: 'lognormal', mu: 0.5, sigma: 0.4, min: 1, max: 3 } as DistributionSpec],
    ['Weibull(2, 1)', { type: 'weibull', shape: 2, scale: 1 } as DistributionSpec],
    ['exponential(2)', { type: 'exponential', rate: 2 } as DistributionSpec],
    ['PERT(2, 3, 10)', { type: 'pert', min: 2, mode: 3, max: 10 } as DistributionSpec],
    ['triangular(1, 5, 11)', { type: 'triangular', min: 1, mode: 5, max: 11 } as DistributionSpec],
    ['discrete', { type: 'discrete', values: [1, 2, 9], probabilities: [0.5, 0.3, 0.2] } as DistributionSpec],
    ['empirical', { type: 'empirical', data: [1, 4, 2, 8, 5] } as DistributionSpec],
    ['drawn', { type: 'drawn', points: [{ x: 0, y: 1 }, { x: 2, y: 3 }, { x: 5, y: 0 }] } as DistributionSpec],
  ])('sample mean and variance of %s match the closed form (5 standard errors)', (_n, spec) => {
    const m = createMarginal(spec);
    const x = draw(spec);
    const se = Math.sqrt(m.variance / N);
    expect(Math.abs(mean(x) - m.mean)).toBeLessThan(5 * se);
    // Variance: relative band 4 % (SE of a variance is sigma^2 sqrt((kurtosis - 1) / n), below 1 % here).
    expect(Math.abs(variance(x) / m.variance - 1)).toBeLessThan(0.04);
  });

  it('mu + sigma Z takes sigma, not sigma squared', () => {
    const x = draw({ type: 'normal', mean: 5, sd: 2 });
    expect(Math.sqrt(variance(x))).toBeGreaterThan(1.97);
    expect(Math.sqrt(variance(x))).toBeLessThan(2.03);
  });
});

describe('inverse CDFs', () => {
  it('reproduce the values shipped in jstat 1.9.6 tests (checked there against R)', () => {
    const tri = createMarginal({ type: 'triangular', min: 1, mode: 5, max: 11 });
    expect(tri.cdf(7)).toBeCloseTo(0.7333333333, 10);
    expect(tri.inv(0.5, 0.5)).toBeCloseTo(5.522774425, 9);
    expect(createMarginal({ type: 'normal', mean: 10, sd: 3 }).inv(0.05, 0.95)).toBeCloseTo(5.065439, 6);
    expect(createMarginal({ type: 'lognormal', mu: 4, sigma: 5 }).cdf(4)).toBeCloseTo(0.3005772067, 10);
  });

  it('the tabulated beta-PERT inverse is accurate to 1e-10 in probability', () => {
    for (const [a, m, b] of [
      [0, 5, 10],
      [90, 100, 130],
      [1, 1, 11],
      [0, 10, 10],
      [2, 3, 10],
    ]) {
      const marg = createMarginal({ type: 'pert', min: a, mode: m, max: b });
      const { alpha, beta } = pertShape(a, m, b);
      const ps = [1e-12, 1e-9, 1e-6, 1e-3, 0.01, 0.1, 0.25, 0.5, 0.77, 0.9, 0.99, 0.999, 1 - 1e-6, 1 - 1e-9];
      for (let k = 1; k < 1000; k++) ps.push(k / 1000 + 0.0003);
      for (const p of ps) {
        const x = marg.inv(p, 1 - p);
        expect(x).toBeGreaterThanOrEqual(a);
        expect(x).toBeLessThanOrEqual(b);
        expect(Math.abs(regIncBeta((x - a) / (b - a), alpha, beta) - p)).toBeLessThan(1e-10);
      }
    }
  });

  it('are finite and inside the support at the most extreme uniforms the generator can give', () => {
    const pMin = 2 ** -33;
    const specs: DistributionSpec[] = [
      { type: 'normal', mean: 0, sd: 1 },
      { type: 'normal', mean: 0, sd: 1, min: -1, max: 2 },
      { type: 'lognormal', mu: 0, sigma: 1 },
      { type: 'exponential', rate: 1 },
      { type: 'weibull', shape: 1.5, scale: 2 },
      { type: 'pert', min: 0, mode: 1, max: 4 },
      { type: 'triangular', min: 0, mode: 1, max: 4 },
      { type: 'drawn', points: [{ x: 0, y: 0 }, { x: 1, y: 1 }, { x: 2, y: 0 }] },
      { type: 'empirical', data: [1, 2, 3] },
    ];
    for (const spec of specs) {
      const m = createMarginal(spec);
      for (const [p, q] of [
        [pMin, 1 - pMin],
        [1 - pMin, pMin],
        [1e-300, 1],
        [1, 1e-300],
      ]) {
        const x = m.inv(p, q);
        expect(Number.isFinite(x)).toBe(true);
        expect(x).toBeGreaterThanOrEqual(m.lower);
        expect(x).toBeLessThanOrEqual(m.upper);
      }
    }
    // An unbounded law at p = 0 exactly is -infinity: the generator never hands it p = 0.
    expect(createMarginal({ type: 'normal', mean: 0, sd: 1 }).inv(0, 1)).toBe(-Infinity);
  });
});
