import { describe, expect, it } from 'vitest';
import xor4096 from 'seedrandom/lib/xor4096';
import { jStat } from 'jstat';
import { normalQuantile } from '@/lib/core/engine/special';
import {
  andersonDarling,
  estimate,
  fitAll,
  kolmogorovSmirnov,
  lawCdf,
  lawPdf,
  lawQuantile,
  qqPoints,
  TooFewValuesError,
  type FitOk,
  type Law,
  type LawParams,
} from '@/lib/core/datasets/fit';
import { digamma, logMinusDigamma, regLowerGamma, trigamma } from '@/lib/core/datasets/special';

// Seeded uniforms in (0, 1) for generating samples with known parameters.
function uniforms(seed: string, n: number): number[] {
  const r = xor4096(seed);
  return Array.from({ length: n }, () => {
    let u = r.double();
    while (u === 0) u = r.double();
    return u;
  });
}
const sample = (law: Law, p: LawParams, seed: string, n: number) => uniforms(seed, n).map((u) => lawQuantile(law, p, u));
const logLik = (law: Law, p: LawParams, x: number[]) => x.reduce((s, t) => s + Math.log(lawPdf(law, p, t)), 0);
const okFit = (law: Law, x: number[]) => {
  const e = estimate(law, x);
  return e;
};

// NIST/SEMATECH e-Handbook §7.2.6.2 example data (restated in reference/check-values.md).
const NIST12 = [95.1772, 95.1567, 95.1937, 95.1959, 95.1442, 95.061, 95.1591, 95.1195, 95.1065, 95.0925, 95.199, 95.1682];

describe('special functions for the fits', () => {
  it('digamma and trigamma at 1 and 1/2', () => {
    // Abramowitz & Stegun 6.3.2 and 6.3.3: ψ(1) = −γ, ψ(1/2) = −γ − 2 ln 2 (from memory)
    const euler = 0.5772156649015329;
    expect(digamma(1)).toBeCloseTo(-euler, 12);
    expect(digamma(0.5)).toBeCloseTo(-euler - 2 * Math.log(2), 12);
    // Abramowitz & Stegun 6.4.2: ψ'(1) = π²/6; ψ'(1/2) = π²/2 (from memory)
    expect(trigamma(1)).toBeCloseTo(Math.PI ** 2 / 6, 12);
    expect(trigamma(0.5)).toBeCloseTo(Math.PI ** 2 / 2, 12);
    // ln x − ψ(x) agrees with the direct difference where that is accurate, and tends to 1/(2x) (A&S 6.3.18)
    for (const x of [10, 37.5, 400]) expect(logMinusDigamma(x)).toBeCloseTo(Math.log(x) - digamma(x), 13);
    expect(logMinusDigamma(1e7) * 2e7).toBeCloseTo(1 + 1 / 6e7, 12);
  });

  it('regularised lower incomplete gamma: closed forms and jstat', () => {
    // P(1, x) = 1 − e^(−x) (exponential CDF; closed form)
    for (const x of [0.01, 0.5, 1, 3, 10]) expect(regLowerGamma(1, x)).toBeCloseTo(-Math.expm1(-x), 13);
    // P(1/2, x) = erf(√x) = 2Φ(√(2x)) − 1 (closed form)
    for (const x of [0.1, 1, 4]) expect(regLowerGamma(0.5, x)).toBeCloseTo(2 * jStat.normal.cdf(Math.sqrt(2 * x), 0, 1) - 1, 10);
    // jstat 1.9.6 lowRegGamma (MIT; its tests were checked against R)
    const low = (jStat as unknown as { lowRegGamma(a: number, x: number): number }).lowRegGamma;
    for (const [a, x] of [[2.5, 1], [2.5, 6], [10, 8], [0.3, 0.2], [40, 45], [5000, 5100]]) expect(regLowerGamma(a, x)).toBeCloseTo(low(a, x), 9);
    // Very large shapes (narrow positive data): P(a, a) → 1/2 + 1/(3√(2πa)) (Temme's uniform expansion; from memory)
    for (const a of [2e4, 1e6, 4e7]) expect(regLowerGamma(a, a)).toBeCloseTo(0.5 + 1 / (3 * Math.sqrt(2 * Math.PI * a)), 6);
    // Continuity where the method changes (series below 1e7, Wilson–Hilferty above).
    expect(Math.abs(regLowerGamma(1e7, 1.001e7) - regLowerGamma(1e7 + 1e-3, 1.001e7))).toBeLessThan(1e-6);
  });
});

describe('closed-form maximum-likelihood fits', () => {
  it('normal: μ̂ = x̄ and σ̂² = Σ(x − x̄)²/n; the likelihood is highest there', () => {
    // The normal MLE (any mathematical statistics text, e.g. Casella & Berger 2002, Example 7.2.11; from memory)
    const n = NIST12.length;
    const mean = NIST12.reduce((s, v) => s + v, 0) / n;
    const sd = Math.sqrt(NIST12.reduce((s, v) => s + (v - mean) ** 2, 0) / n);
    const e = okFit('normal', NIST12);
    expect(e.params.mean).toBeCloseTo(mean, 12);
    expect(e.params.sd).toBeCloseTo(sd, 12);
    expect(e.logLik).toBeCloseTo(logLik('normal', e.params, NIST12), 9);
    for (const [dm, ds] of [[1e-3, 0], [-1e-3, 0], [0, 1e-3], [0, -1e-3]]) {
      expect(logLik('normal', { mean: e.params.mean + dm, sd: e.params.sd + ds }, NIST12)).toBeLessThan(e.logLik);
    }
  });

  it('lognormal: the normal MLE of ln x (NIST e-Handbook §1.3.6.6.9, restated)', () => {
    const x = sample('lognormal', { mu: 1, sigma: 0.4 }, 'ln', 200);
    const logs = x.map(Math.log);
    const mu = logs.reduce((s, v) => s + v, 0) / logs.length;
    const sigma = Math.sqrt(logs.reduce((s, v) => s + (v - mu) ** 2, 0) / logs.length);
    const e = okFit('lognormal', x);
    expect(e.params.mu).toBeCloseTo(mu, 12);
    expect(e.params.sigma).toBeCloseTo(sigma, 12);
    expect(e.logLik).toBeCloseTo(logLik('lognormal', e.params, x), 8);
  });

  it('exponential: λ̂ = 1/x̄; uniform: the sample minimum and maximum', () => {
    // Both closed forms: e.g. Casella & Berger 2002, Examples 7.2.7 and 7.2.5 area (from memory)
    const x = sample('exponential', { rate: 0.5 }, 'ex', 300);
    const e = okFit('exponential', x);
    expect(e.params.rate).toBeCloseTo(x.length / x.reduce((s, v) => s + v, 0), 12);
    const u = okFit('uniform', NIST12);
    expect(u.params).toEqual({ min: 95.061, max: 95.199 });
    expect(u.logLik).toBeCloseTo(-12 * Math.log(95.199 - 95.061), 9);
  });
});

describe('iterative maximum-likelihood fits', () => {
  it('Weibull: recovers known parameters within four standard errors and zeroes the score', () => {
    // Asymptotic variances of the Weibull MLE: Var(k̂) ≈ 0.608 k²/n, Var(λ̂) ≈ 1.109 λ²/(k² n) (Cohen 1965, restated)
    const n = 2000;
    for (const [shape, scale] of [[2, 10], [0.8, 3], [6, 50]]) {
      const x = sample('weibull', { shape, scale }, `wb-${shape}`, n);
      const e = okFit('weibull', x);
      expect(Math.abs(e.params.shape - shape)).toBeLessThan(4 * Math.sqrt((0.608 * shape * shape) / n));
      expect(Math.abs(e.params.scale - scale)).toBeLessThan(4 * Math.sqrt((1.109 * scale * scale) / (shape * shape * n)));
      // The profile score equation holds at the estimate.
      const k = e.params.shape;
      const sk = x.reduce((s, t) => s + t ** k, 0);
      const skl = x.reduce((s, t) => s + t ** k * Math.log(t), 0);
      const ml = x.reduce((s, t) => s + Math.log(t), 0) / n;
      expect(skl / sk - 1 / k - ml).toBeCloseTo(0, 9);
      // jstat 1.9.6's Weibull density (scale, shape order) agrees at the estimate: the likelihood is the Weibull one.
      expect(e.logLik).toBeCloseTo(x.reduce((s, t) => s + Math.log(jStat.weibull.pdf(t, e.params.scale, e.params.shape)), 0), 6);
    }
  });

  it('gamma: Newton solves ln k − ψ(k) = ln x̄ − mean(ln x) (Choi & Wette 1969; Minka 2002) and recovers known parameters', () => {
    // Erlang samples: the sum of 3 exponentials of scale 2 is Gamma(3, 2) (closed form).
    const n = 3000;
    const u = uniforms('gamma', 3 * n);
    const x = Array.from({ length: n }, (_, i) => -2 * (Math.log(u[3 * i]) + Math.log(u[3 * i + 1]) + Math.log(u[3 * i + 2])));
    const e = okFit('gamma', x);
    const k = e.params.shape;
    const mean = x.reduce((s, v) => s + v, 0) / n;
    const s = Math.log(mean) - x.reduce((acc, v) => acc + Math.log(v), 0) / n;
    expect(Math.log(k) - digamma(k) - s).toBeCloseTo(0, 12);
    expect(e.params.scale * k).toBeCloseTo(mean, 10);
    // Fisher information for the shape with θ profiled out: Var(k̂) ≈ k / (n (k ψ'(k) − 1)) (Choi & Wette 1969, restated)
    expect(Math.abs(k - 3)).toBeLessThan(4 * Math.sqrt(3 / (n * (3 * trigamma(3) - 1))));
    expect(e.logLik).toBeCloseTo(x.reduce((acc, t) => acc + Math.log(lawPdf('gamma', e.params, t)), 0), 6);
    // Minka's closed-form start is already within a few per cent of the root; Newton then needs few steps.
    expect(e.iterations).toBeLessThan(8);
  });

  it('gamma on narrow data (huge shape) still matches the data: KS close to the normal fit', () => {
    const x = sample('normal', { mean: 12, sd: 0.01 }, 'narrow', 60);
    const r = fitAll(x).filter((f): f is FitOk => f.ok);
    const g = r.find((f) => f.law === 'gamma')!;
    const n = r.find((f) => f.law === 'normal')!;
    expect(g.params.shape).toBeGreaterThan(1e5);
    expect(Math.abs(g.ks - n.ks)).toBeLessThan(0.02);
  });

  it('a fit that does not converge is reported for that law, and the others are kept', () => {
    const x = sample('weibull', { shape: 2, scale: 10 }, 'nc', 60);
    const r = fitAll(x, { maxIterations: 1 });
    const wb = r.find((f) => f.law === 'weibull')!;
    expect(wb.ok).toBe(false);
    expect(!wb.ok && wb.reason).toMatch(/did not converge in 1 Newton steps/);
    const gm = r.find((f) => f.law === 'gamma')!;
    expect(gm.ok).toBe(false);
    expect(r.filter((f) => f.ok).map((f) => f.law).sort()).toEqual(['exponential', 'lognormal', 'normal', 'uniform']);
  });

  it('laws that need positive data say so; the normal and uniform still fit', () => {
    const x = sample('normal', { mean: 0, sd: 1 }, 'neg', 40);
    const r = fitAll(x);
    for (const law of ['lognormal', 'weibull', 'gamma', 'exponential'] as const) {
      const f = r.find((t) => t.law === law)!;
      expect(f.ok).toBe(false);
      expect(!f.ok && f.reason).toMatch(/above zero/);
    }
    expect(r.filter((f) => f.ok).map((f) => f.law).sort()).toEqual(['normal', 'uniform']);
  });

  it('refuses fitting below 10 numbers with a message', () => {
    expect(() => fitAll([1, 2, 3, 4, 5, 6, 7, 8, 9])).toThrow(TooFewValuesError);
    expect(() => fitAll([1, 2, 3, 4, 5, 6, 7, 8, 9])).toThrow(/at least 10 numbers; this column has 9/);
  });
});

describe('goodness of fit and ranking', () => {
  it('A² and D for one value: the formulas of Stephens (1974) and Massey (1951) reduce to closed forms', () => {
    // n = 1, F(x) = u: A² = −1 − ln u − ln(1 − u); D = max(1 − u, u)
    for (const u of [0.2, 0.5, 0.9]) {
      expect(andersonDarling([u], (t) => t)).toBeCloseTo(-1 - Math.log(u) - Math.log1p(-u), 12);
      expect(kolmogorovSmirnov([u], (t) => t)).toBeCloseTo(Math.max(1 - u, u), 12);
    }
  });

  it('with F fully specified, about 5 % of samples exceed the published 5 % critical values', () => {
    // A² 5 % point 2.492 (Stephens 1974, memory and restated); D ≈ 1.36/√n for n > 35 (Massey 1951, Table 1; memory)
    const reps = 2000;
    const n = 50;
    const u = uniforms('crit', reps * n);
    let adOver = 0;
    let ksOver = 0;
    for (let r = 0; r < reps; r++) {
      const x = u.slice(r * n, (r + 1) * n).sort((a, b) => a - b);
      if (andersonDarling(x, (t) => t) > 2.492) adOver++;
      if (kolmogorovSmirnov(x, (t) => t) > 1.36 / Math.sqrt(n)) ksOver++;
    }
    const band = 4 * Math.sqrt((0.05 * 0.95) / reps);
    expect(Math.abs(adOver / reps - 0.05)).toBeLessThan(band);
    expect(Math.abs(ksOver / reps - 0.05)).toBeLessThan(band);
  });

  it('with parameters estimated from the same data the critical values no longer hold (far fewer rejections)', () => {
    const reps = 1000;
    const n = 50;
    let over = 0;
    for (let r = 0; r < reps; r++) {
      const x = sample('normal', { mean: 5, sd: 2 }, `est-${r}`, n);
      const f = fitAll(x, { laws: ['normal'] })[0] as FitOk;
      if (f.ad! > 2.492) over++;
    }
    expect(over / reps).toBeLessThan(0.01);
  });

  it('ranks by AIC = 2k − 2 ln L and puts the generating law first for clear data', () => {
    const x = sample('lognormal', { mu: 0, sigma: 0.9 }, 'rank', 400);
    const r = fitAll(x).filter((f): f is FitOk => f.ok);
    expect(r.map((f) => f.rank)).toEqual(r.map((_, i) => i + 1));
    for (const f of r) expect(f.aic).toBeCloseTo(2 * f.k - 2 * f.logLik, 9);
    expect(r[0].law).toBe('lognormal');
    // The uniform's fitted support ends at the data: A² is not defined there.
    expect(r.find((f) => f.law === 'uniform')!.ad).toBeNull();
  });

  it('Q–Q points sit on the line for the law that generated the data', () => {
    const x = sample('normal', { mean: 20, sd: 0.05 }, 'qq', 500).sort((a, b) => a - b);
    const pts = qqPoints(x, 'normal', { mean: 20, sd: 0.05 });
    expect(pts[0].theoretical).toBeCloseTo(20 + 0.05 * normalQuantile(0.5 / 500), 12);
    const mid = pts.slice(25, 475);
    expect(Math.max(...mid.map((p) => Math.abs(p.observed - p.theoretical)))).toBeLessThan(0.02);
  });

  it('each law’s quantile inverts its CDF', () => {
    const cases: [Law, LawParams][] = [
      ['normal', { mean: 1, sd: 2 }],
      ['lognormal', { mu: 0.3, sigma: 0.5 }],
      ['weibull', { shape: 1.7, scale: 4 }],
      ['gamma', { shape: 2.5, scale: 1.5 }],
      ['exponential', { rate: 3 }],
      ['uniform', { min: -1, max: 2 }],
    ];
    for (const [law, p] of cases) for (const u of [0.01, 0.3, 0.5, 0.97]) expect(lawCdf(law, p, lawQuantile(law, p, u))).toBeCloseTo(u, 9);
    // jstat 1.9.6 gamma CDF (shape, scale)
    const g = (jStat as unknown as { gamma: { cdf(x: number, k: number, t: number): number } }).gamma;
    expect(lawCdf('gamma', { shape: 2.5, scale: 1.5 }, 3)).toBeCloseTo(g.cdf(3, 2.5, 1.5), 10);
  });
});
