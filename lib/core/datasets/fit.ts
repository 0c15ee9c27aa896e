/**
 * Maximum-likelihood fits of candidate laws to measured data, ranked by AIC with Anderson–Darling and
 * Kolmogorov–Smirnov statistics beside each. Pure functions: used by the API, the pages and the tests.
 */
import { lgamma, normalCdf, normalQuantile } from '@/lib/core/engine/special';
import { logMinusDigamma, regLowerGamma, trigamma } from './special';

export const LAWS = ['normal', 'lognormal', 'weibull', 'gamma', 'exponential', 'uniform'] as const;
export type Law = (typeof LAWS)[number];

export const LAW_LABELS: Record<Law, string> = {
  normal: 'Normal',
  lognormal: 'Lognormal',
  weibull: 'Weibull',
  gamma: 'Gamma',
  exponential: 'Exponential',
  uniform: 'Uniform',
};

/** Parameter names per law (engine names where the engine has the law). */
export type LawParams = Record<string, number>;

/** Fitting is refused below this many values: the ranking would say nothing. */
export const MIN_FIT_COUNT = 10;

export const CRITICAL_VALUE_NOTE =
  'The parameters are estimated from the same data, so the published critical values of the Anderson–Darling and ' +
  'Kolmogorov–Smirnov tests (which assume a fully specified law) do not hold: they would accept a poor fit too often. ' +
  'Use the statistics to compare the laws, not as a pass/fail test.';

export interface FitOk {
  ok: true;
  law: Law;
  params: LawParams;
  /** Number of fitted parameters (for AIC). */
  k: number;
  logLik: number;
  /** AIC = 2k − 2 ln L (Akaike 1974). */
  aic: number;
  /** Anderson–Darling A² against the fitted CDF; null where the fitted support ends at the data (uniform). */
  ad: number | null;
  /** Kolmogorov–Smirnov D against the fitted CDF. */
  ks: number;
  iterations: number;
  rank: number;
}

export interface FitFailed {
  ok: false;
  law: Law;
  reason: string;
}

export type FitResult = FitOk | FitFailed;

export interface FitOptions {
  /** Newton iteration cap (Weibull shape, gamma shape). */
  maxIterations?: number;
  laws?: readonly Law[];
}

// ---- CDF, density and quantile of each law ------------------------------------------------------

export function lawCdf(law: Law, p: LawParams, x: number): number {
  switch (law) {
    case 'normal':
      return normalCdf((x - p.mean) / p.sd);
    case 'lognormal':
      return x <= 0 ? 0 : normalCdf((Math.log(x) - p.mu) / p.sigma);
    case 'weibull':
      return x <= 0 ? 0 : -Math.expm1(-Math.pow(x / p.scale, p.shape));
    case 'gamma':
      return regLowerGamma(p.shape, x / p.scale);
    case 'exponential':
      return x <= 0 ? 0 : -Math.expm1(-p.rate * x);
    case 'uniform':
      return x <= p.min ? 0 : x >= p.max ? 1 : (x - p.min) / (p.max - p.min);
  }
}

export function lawPdf(law: Law, p: LawParams, x: number): number {
  switch (law) {
    case 'normal': {
      const z = (x - p.mean) / p.sd;
      return Math.exp(-0.5 * z * z) / (p.sd * Math.sqrt(2 * Math.PI));
    }
    case 'lognormal': {
      if (x <= 0) return 0;
      const z = (Math.log(x) - p.mu) / p.sigma;
      return Math.exp(-0.5 * z * z) / (x * p.sigma * Math.sqrt(2 * Math.PI));
    }
    case 'weibull': {
      if (x < 0) return 0;
      const t = x / p.scale;
      return (p.shape / p.scale) * Math.pow(t, p.shape - 1) * Math.exp(-Math.pow(t, p.shape));
    }
    case 'gamma':
      if (x <= 0) return 0;
      return Math.exp((p.shape - 1) * Math.log(x) - x / p.scale - p.shape * Math.log(p.scale) - lgamma(p.shape));
    case 'exponential':
      return x < 0 ? 0 : p.rate * Math.exp(-p.rate * x);
    case 'uniform':
      return x < p.min || x > p.max ? 0 : 1 / (p.max - p.min);
  }
}

export function lawQuantile(law: Law, p: LawParams, u: number): number {
  switch (law) {
    case 'normal':
      return p.mean + p.sd * normalQuantile(u);
    case 'lognormal':
      return Math.exp(p.mu + p.sigma * normalQuantile(u));
    case 'weibull':
      return p.scale * Math.pow(-Math.log1p(-u), 1 / p.shape);
    case 'exponential':
      return -Math.log1p(-u) / p.rate;
    case 'uniform':
      return p.min + u * (p.max - p.min);
    case 'gamma': {
      // No closed form: bisect the CDF (monotone) between brackets that hold u.
      let lo = 0;
      let hi = p.shape * p.scale;
      while (lawCdf('gamma', p, hi) < u) hi *= 2;
      for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
        const mid = (lo + hi) / 2;
        if (lawCdf('gamma', p, mid) < u) lo = mid;
        else hi = mid;
      }
      return (lo + hi) / 2;
    }
  }
}

// ---- Goodness-of-fit statistics -----------------------------------------------------------------

/** A² = −n − (1/n) Σ (2i − 1)[ln F(x₍ᵢ₎) + ln(1 − F(x₍ₙ₊₁₋ᵢ₎))] (Stephens 1974, JASA 69(347)). */
export function andersonDarling(sorted: ArrayLike<number>, cdf: (x: number) => number): number {
  const n = sorted.length;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const lo = cdf(sorted[i]);
    const hi = cdf(sorted[n - 1 - i]);
    if (!(lo > 0) || !(hi < 1)) return Infinity;
    s += (2 * i + 1) * (Math.log(lo) + Math.log1p(-hi));
  }
  return -n - s / n;
}

/** D = max over i of max(i/n − F(x₍ᵢ₎), F(x₍ᵢ₎) − (i − 1)/n) (Massey 1951, JASA 46(253)). */
export function kolmogorovSmirnov(sorted: ArrayLike<number>, cdf: (x: number) => number): number {
  const n = sorted.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(sorted[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}

// ---- Maximum-likelihood estimates ---------------------------------------------------------------

interface Est {
  params: LawParams;
  k: number;
  logLik: number;
  iterations: number;
}

class FitError extends Error {}

const sum = (xs: ArrayLike<number>, f: (x: number) => number = (x) => x) => {
  let s = 0;
  for (let i = 0; i < xs.length; i++) s += f(xs[i]);
  return s;
};

function requirePositive(x: ArrayLike<number>, law: string): void {
  for (let i = 0; i < x.length; i++) if (!(x[i] > 0)) throw new FitError(`${law} needs every value above zero (found ${x[i]}).`);
}

function requireSpread(x: ArrayLike<number>): void {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < x.length; i++) {
    lo = Math.min(lo, x[i]);
    hi = Math.max(hi, x[i]);
  }
  if (!(hi > lo)) throw new FitError('All values are equal: there is no spread to fit.');
}

/** Normal: μ̂ = x̄, σ̂² = Σ(x − x̄)²/n (the MLE divides by n). */
function fitNormal(x: ArrayLike<number>): Est {
  requireSpread(x);
  const n = x.length;
  const mean = sum(x) / n;
  const v = sum(x, (t) => (t - mean) ** 2) / n;
  const sd = Math.sqrt(v);
  return { params: { mean, sd }, k: 2, logLik: -0.5 * n * (Math.log(2 * Math.PI * v) + 1), iterations: 0 };
}

/** Lognormal: the normal MLE of ln x; ln L gains −Σ ln x from the Jacobian. */
function fitLognormal(x: ArrayLike<number>): Est {
  requirePositive(x, 'The lognormal law');
  const logs = Array.from(x, Math.log);
  const e = fitNormal(logs);
  return { params: { mu: e.params.mean, sigma: e.params.sd }, k: 2, logLik: e.logLik - sum(logs), iterations: 0 };
}

function fitExponential(x: ArrayLike<number>): Est {
  requirePositive(x, 'The exponential law');
  const n = x.length;
  const rate = n / sum(x);
  return { params: { rate }, k: 1, logLik: n * Math.log(rate) - n, iterations: 0 };
}

/** Uniform: the MLE of the end points is the sample minimum and maximum. */
function fitUniform(x: ArrayLike<number>): Est {
  requireSpread(x);
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < x.length; i++) {
    min = Math.min(min, x[i]);
    max = Math.max(max, x[i]);
  }
  return { params: { min, max }, k: 2, logLik: -x.length * Math.log(max - min), iterations: 0 };
}

/**
 * Weibull: Newton on the profile equation for the shape k,
 *   g(k) = Σ xᵏ ln x / Σ xᵏ − 1/k − mean(ln x) = 0,
 * then λ = (Σ xᵏ / n)^(1/k) (Cohen 1965, Technometrics 7(4):579–588). Data are scaled by their maximum first.
 */
function fitWeibull(x: ArrayLike<number>, maxIter: number): Est {
  requirePositive(x, 'The Weibull law');
  requireSpread(x);
  const n = x.length;
  let top = 0;
  for (let i = 0; i < n; i++) top = Math.max(top, x[i]);
  const y = Array.from(x, (t) => t / top);
  const ly = y.map(Math.log);
  const meanLog = sum(ly) / n;
  // Start from the log-moment estimate: sd(ln x) ≈ π / (k √6).
  const sdLog = Math.sqrt(sum(ly, (t) => (t - meanLog) ** 2) / n);
  let k = Math.min(200, Math.max(0.05, Math.PI / (sdLog * Math.sqrt(6))));
  for (let it = 1; it <= maxIter; it++) {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const yk = Math.pow(y[i], k);
      s0 += yk;
      s1 += yk * ly[i];
      s2 += yk * ly[i] * ly[i];
    }
    const g = s1 / s0 - 1 / k - meanLog;
    const dg = (s2 * s0 - s1 * s1) / (s0 * s0) + 1 / (k * k);
    let next = k - g / dg;
    if (!(next > 0)) next = k / 2;
    if (!Number.isFinite(next)) break;
    const done = Math.abs(next - k) <= 1e-12 * k;
    k = next;
    if (done) {
      const scale = top * Math.pow(sum(y, (t) => Math.pow(t, k)) / n, 1 / k);
      const p = { shape: k, scale };
      const logLik = sum(x, (t) => Math.log(lawPdf('weibull', p, t)));
      if (!Number.isFinite(logLik)) break;
      return { params: p, k: 2, logLik, iterations: it };
    }
  }
  throw new FitError(`The Weibull shape did not converge in ${maxIter} Newton steps.`);
}

/**
 * Gamma: Newton on ln k − ψ(k) = ln x̄ − mean(ln x) from the closed-form start of Minka (2002, "Estimating a
 * Gamma distribution"); the equation is that of Choi & Wette (1969, Technometrics 11(4):683–690). θ = x̄ / k.
 */
function fitGamma(x: ArrayLike<number>, maxIter: number): Est {
  requirePositive(x, 'The gamma law');
  requireSpread(x);
  const n = x.length;
  const mean = sum(x) / n;
  const s = Math.log(mean) - sum(x, Math.log) / n;
  if (!(s > 0)) throw new FitError('The gamma shape equation has no solution for these data.');
  let k = (3 - s + Math.sqrt((s - 3) ** 2 + 24 * s)) / (12 * s);
  for (let it = 1; it <= maxIter; it++) {
    const f = logMinusDigamma(k) - s;
    const df = 1 / k - trigamma(k);
    let next = k - f / df;
    if (!(next > 0)) next = k / 2;
    if (!Number.isFinite(next)) break;
    const done = Math.abs(next - k) <= 1e-11 * k;
    k = next;
    if (done) {
      const scale = mean / k;
      const logLik = (k - 1) * sum(x, Math.log) - n * mean / scale - n * k * Math.log(scale) - n * lgamma(k);
      return { params: { shape: k, scale }, k: 2, logLik, iterations: it };
    }
  }
  throw new FitError(`The gamma shape did not converge in ${maxIter} Newton steps.`);
}

export function estimate(law: Law, x: ArrayLike<number>, maxIter = 100): Est {
  switch (law) {
    case 'normal':
      return fitNormal(x);
    case 'lognormal':
      return fitLognormal(x);
    case 'weibull':
      return fitWeibull(x, maxIter);
    case 'gamma':
      return fitGamma(x, maxIter);
    case 'exponential':
      return fitExponential(x);
    case 'uniform':
      return fitUniform(x);
  }
}

export class TooFewValuesError extends Error {}

/** Fits every candidate law; failures are reported per law and the rest are ranked by AIC (lowest first). */
export function fitAll(data: readonly number[], opts: FitOptions = {}): FitResult[] {
  const n = data.length;
  if (n < MIN_FIT_COUNT) {
    throw new TooFewValuesError(`Fitting needs at least ${MIN_FIT_COUNT} numbers; this column has ${n}. Use the empirical distribution or add measurements.`);
  }
  const sorted = Float64Array.from(data).sort();
  const results: FitResult[] = [];
  for (const law of opts.laws ?? LAWS) {
    try {
      const e = estimate(law, sorted, opts.maxIterations ?? 100);
      const cdf = (t: number) => lawCdf(law, e.params, t);
      const ad = law === 'uniform' ? null : andersonDarling(sorted, cdf);
      results.push({
        ok: true,
        law,
        params: e.params,
        k: e.k,
        logLik: e.logLik,
        aic: 2 * e.k - 2 * e.logLik,
        ad: ad !== null && Number.isFinite(ad) ? ad : null,
        ks: kolmogorovSmirnov(sorted, cdf),
        iterations: e.iterations,
        rank: 0,
      });
    } catch (err) {
      if (!(err instanceof FitError)) throw err;
      results.push({ ok: false, law, reason: err.message });
    }
  }
  const ok = results.filter((r): r is FitOk => r.ok).sort((a, b) => a.aic - b.aic);
  ok.forEach((r, i) => (r.rank = i + 1));
  return [...ok, ...results.filter((r) => !r.ok)];
}

/** Plotting positions (i − 0.5)/n (Hazen) for Q–Q plots. */
export function qqPoints(sorted: ArrayLike<number>, law: Law, params: LawParams): { theoretical: number; observed: number }[] {
  const n = sorted.length;
  const out: { theoretical: number; observed: number }[] = [];
  for (let i = 0; i < n; i++) out.push({ theoretical: lawQuantile(law, params, (i + 0.5) / n), observed: sorted[i] });
  return out;
}
