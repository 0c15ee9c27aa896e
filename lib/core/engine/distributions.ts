/**
 * Marginal distributions: inverse CDF, CDF, analytic moments and, for bounded densities,
 * the box envelope used by rejection sampling.
 *
 * Every inverse CDF takes the lower probability p and its complement q = 1 - p, so the
 * upper tail keeps its precision when p comes from Phi(z) of a large z (Gaussian copula).
 */
import * as special from './special';
import * as detMath from './det-math';
import { gammaMoments, regGammaPQ, standardGammaInverse } from './gamma';

// Bound once (see det-math): hot loops call these per sample.
const { gamma, lbeta, normalCdfPair, normalCdfPairUpper, normalPdf, normalQuantilePQ, regIncBeta } = special;

// Bound once: module interop in some runtimes turns each imported call into a getter call.
const { cos, exp, expm1, ln, log1p } = detMath;

export type DistributionSpec =
  | { type: 'constant'; value: number }
  | { type: 'uniform'; min: number; max: number }
  | { type: 'triangular'; min: number; mode: number; max: number }
  | { type: 'pert'; min: number; mode: number; max: number }
  | { type: 'normal'; mean: number; sd: number; min?: number; max?: number }
  | { type: 'lognormal'; mu: number; sigma: number; min?: number; max?: number }
  | { type: 'exponential'; rate: number }
  | { type: 'weibull'; shape: number; scale: number }
  | { type: 'gamma'; shape: number; scale: number }
  | { type: 'discrete'; values: number[]; probabilities: number[] }
  | { type: 'bernoulli'; p: number }
  | { type: 'empirical'; data: number[] }
  | { type: 'drawn'; points: { x: number; y: number }[] };

export type DistributionType = DistributionSpec['type'];

/** How an input is sampled when it is not driven by a correlated normal score. */
export type NaturalMethod = 'constant' | 'normal' | 'lognormal' | 'rejection' | 'inverse-cdf';

export interface RejectionEnvelope {
  /** Support [a, b] of the density. */
  a: number;
  b: number;
  /** Box height: the density's maximum. */
  M: number;
  /** Normalised density. */
  density(x: number): number;
  /** 1 / (M (b - a)): the acceptance rate the box gives. */
  expectedAcceptance: number;
  /**
   * Points inside (a, b) where the density may turn (mode, vertices): with the cell edges
   * they bound the density on each cell, which lets the sampler decide most candidates
   * without evaluating it (a squeeze; the decisions are the same).
   */
  turningPoints?: number[];
}

export interface Marginal {
  readonly spec: DistributionSpec;
  readonly lower: number;
  readonly upper: number;
  /** Analytic mean and variance (NaN where no closed form is used). */
  readonly mean: number;
  readonly variance: number;
  readonly natural: NaturalMethod;
  readonly envelope: RejectionEnvelope | null;
  /** Inverse CDF at lower probability p with complement q = 1 - p; p, q in (0, 1). */
  inv(p: number, q: number): number;
  cdf(x: number): number;
  /** Normal and lognormal without truncation map a standard normal score directly. */
  fromZ: ((z: number) => number) | null;
  /** The same map as coefficients: x = a + b z (normal) or exp(a + b z) (lognormal). */
  affine?: { a: number; b: number; log: boolean };
}

// ---------------------------------------------------------------------------------------

function constant(value: number, spec: DistributionSpec): Marginal {
  return {
    spec,
    lower: value,
    upper: value,
    mean: value,
    variance: 0,
    natural: 'constant',
    envelope: null,
    inv: () => value,
    cdf: (x) => (x < value ? 0 : 1),
    fromZ: null,
  };
}

function uniform(a: number, b: number, spec: DistributionSpec): Marginal {
  const w = b - a;
  return {
    spec,
    lower: a,
    upper: b,
    mean: (a + b) / 2,
    variance: (w * w) / 12,
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p) => a + p * w,
    cdf: (x) => (x <= a ? 0 : x >= b ? 1 : (x - a) / w),
    fromZ: null,
  };
}

/** Triangular inverse: a + sqrt(p (b-a)(c-a)) below the mode, b - sqrt(q (b-a)(b-c)) above. */
function triangular(a: number, c: number, b: number, spec: DistributionSpec): Marginal {
  const w = b - a;
  const fc = (c - a) / w;
  const left = w * (c - a);
  const right = w * (b - c);
  return {
    spec,
    lower: a,
    upper: b,
    mean: (a + b + c) / 3,
    variance: (a * a + b * b + c * c - a * b - a * c - b * c) / 18,
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => (p < fc ? a + Math.sqrt(p * left) : b - Math.sqrt(q * right)),
    cdf: (x) => {
      if (x <= a) return 0;
      if (x >= b) return 1;
      if (x <= c) return ((x - a) * (x - a)) / left;
      return 1 - ((b - x) * (b - x)) / right;
    },
    fromZ: null,
  };
}

/**
 * Inverse of a smooth CDF on [a, b] from a table of exact CDF and density values at
 * Chebyshev-clustered nodes, inverted cell by cell as a cubic Hermite polynomial (exact
 * slopes from the density). The few cells at each end, where a beta density can have an
 * unbounded derivative, are inverted exactly by safeguarded Newton steps on the CDF.
 */
export class TabulatedInverse {
  private readonly xs: Float64Array;
  private readonly Fs: Float64Array;
  private readonly fs: Float64Array;
  private readonly guide: Int32Array;
  private readonly n: number;
  private readonly exactCells: number;

  constructor(
    private readonly a: number,
    private readonly b: number,
    private readonly cdf: (x: number) => number,
    private readonly pdf: (x: number) => number,
    n = 1024,
    exactCells = 8,
  ) {
    this.n = n;
    this.exactCells = exactCells;
    const xs = new Float64Array(n + 1);
    const Fs = new Float64Array(n + 1);
    const fs = new Float64Array(n + 1);
    for (let k = 0; k <= n; k++) {
      const x = k === 0 ? a : k === n ? b : a + ((b - a) * (1 - cos((Math.PI * k) / n))) / 2;
      xs[k] = x;
      Fs[k] = k === 0 ? 0 : k === n ? 1 : cdf(x);
      fs[k] = pdf(x);
    }
    this.xs = xs;
    this.Fs = Fs;
    this.fs = fs;
    // Guide table: guide[g] = last cell whose left CDF value is <= g / n.
    const guide = new Int32Array(n + 1);
    let cell = 0;
    for (let g = 0; g <= n; g++) {
      const t = g / n;
      while (cell < n - 1 && Fs[cell + 1] <= t) cell++;
      guide[g] = cell;
    }
    this.guide = guide;
  }

  private findCell(p: number): number {
    const n = this.n;
    let k = this.guide[Math.floor(p * n)];
    const Fs = this.Fs;
    while (k < n - 1 && Fs[k + 1] <= p) k++;
    return k;
  }

  inv(p: number): number {
    if (!(p > 0)) return this.a;
    if (!(p < 1)) return this.b;
    const k = this.findCell(p);
    const x0 = this.xs[k];
    const x1 = this.xs[k + 1];
    if (k < this.exactCells || k >= this.n - this.exactCells) return this.exact(p, x0, x1);
    const F0 = this.Fs[k];
    const dF = this.Fs[k + 1] - F0;
    if (!(dF > 0)) return x0;
    const h = x1 - x0;
    const d0 = this.fs[k] * h;
    const d1 = this.fs[k + 1] * h;
    const c2 = 3 * dF - 2 * d0 - d1;
    const c3 = d0 + d1 - 2 * dF;
    const target = p - F0;
    let s = target / dF;
    for (let it = 0; it < 6; it++) {
      const g = ((c3 * s + c2) * s + d0) * s - target;
      const dg = (3 * c3 * s + 2 * c2) * s + d0;
      if (!(dg > 0)) {
        s = -1;
        break;
      }
      const step = g / dg;
      s -= step;
      if (s < 0 || s > 1) break;
      if (Math.abs(step) < 1e-15) break;
    }
    if (!(s >= 0 && s <= 1)) {
      // Bisection on the cubic: it is monotone on the cell for any sensible table.
      let lo = 0;
      let hi = 1;
      for (let it = 0; it < 60; it++) {
        const mid = 0.5 * (lo + hi);
        const g = ((c3 * mid + c2) * mid + d0) * mid - target;
        if (g < 0) lo = mid;
        else hi = mid;
      }
      s = 0.5 * (lo + hi);
    }
    return x0 + s * h;
  }

  /** Safeguarded Newton on the exact CDF inside [lo, hi]. */
  private exact(p: number, lo: number, hi: number): number {
    let x = 0.5 * (lo + hi);
    for (let it = 0; it < 100; it++) {
      const F = this.cdf(x);
      if (F < p) lo = x;
      else hi = x;
      const f = this.pdf(x);
      let next = f > 0 ? x - (F - p) / f : NaN;
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      if (Math.abs(next - x) <= 1e-15 * Math.max(1, Math.abs(x)) || hi - lo <= 1e-15 * Math.max(1, Math.abs(hi))) {
        return next;
      }
      x = next;
    }
    return x;
  }
}

/** Beta-PERT: alpha = 1 + 4(m-a)/(b-a), beta = 1 + 4(b-m)/(b-a) (Malcolm et al. 1959). */
export function pertShape(a: number, m: number, b: number): { alpha: number; beta: number } {
  return { alpha: 1 + (4 * (m - a)) / (b - a), beta: 1 + (4 * (b - m)) / (b - a) };
}

function pert(a: number, m: number, b: number, spec: DistributionSpec): Marginal {
  const w = b - a;
  const { alpha, beta } = pertShape(a, m, b);
  const mean = (a + 4 * m + b) / 6;
  const cdf = (x: number) => (x <= a ? 0 : x >= b ? 1 : regIncBeta((x - a) / w, alpha, beta));
  // Normalising constant computed once: the density is evaluated for every rejection candidate.
  const scale = exp(-lbeta(alpha, beta)) / w;
  const am1 = alpha - 1;
  const bm1 = beta - 1;
  const density = (x: number) => {
    if (x < a || x > b) return 0;
    const t = (x - a) / w;
    // t^(alpha-1) (1-t)^(beta-1) through ln/exp (cheaper than two pow calls); a zero power
    // term is 1, which gives the right endpoint value when a shape parameter is 1.
    const left = am1 === 0 ? 0 : t > 0 ? am1 * ln(t) : -Infinity;
    const right = bm1 === 0 ? 0 : t < 1 ? bm1 * ln(1 - t) : -Infinity;
    return scale * exp(left + right);
  };
  // Both shape parameters are >= 1, so the density is bounded and peaks at the mode.
  const M = density(m);
  let table: TabulatedInverse | null = null;
  return {
    spec,
    lower: a,
    upper: b,
    mean,
    variance: ((mean - a) * (b - mean)) / 7,
    natural: 'rejection',
    envelope: { a, b, M, density, expectedAcceptance: 1 / (M * w), turningPoints: [m] },
    inv: (p) => {
      if (!table) table = new TabulatedInverse(a, b, cdf, density);
      return table.inv(p);
    },
    cdf,
    fromZ: null,
  };
}

/** Truncation weights of a standard normal on [alpha, beta]. */
function truncation(alpha: number, beta: number) {
  const pa = normalCdfPair(alpha);
  const qa = normalCdfPairUpper();
  const pb = normalCdfPair(beta);
  const qb = normalCdfPairUpper();
  // Mass between the bounds, from the side where it is computed without cancellation.
  const w = alpha > 0 ? qa - qb : beta < 0 ? pb - pa : 1 - pa - qb;
  return { pa, qb, w };
}

/** Standard normal restricted to [alpha, beta] (either may be infinite): inverse and CDF. */
function truncatedStd(alpha: number, beta: number) {
  const { pa, qb, w } = truncation(alpha, beta);
  const inv = (p: number, q: number) => {
    const lowerP = pa + p * w;
    const upperP = qb + q * w;
    const z = lowerP < upperP ? normalQuantilePQ(lowerP, 1 - lowerP) : -normalQuantilePQ(upperP, 1 - upperP);
    return z < alpha ? alpha : z > beta ? beta : z;
  };
  const cdf = (z: number) => {
    if (z <= alpha) return 0;
    if (z >= beta) return 1;
    const p = normalCdfPair(z);
    const q = normalCdfPairUpper();
    return p < 0.5 ? (p - pa) / w : 1 - (q - qb) / w;
  };
  return { inv, cdf, w };
}

function normal(mu: number, sd: number, lo: number | undefined, hi: number | undefined, spec: DistributionSpec): Marginal {
  const truncated = lo !== undefined || hi !== undefined;
  if (!truncated) {
    return {
      spec,
      lower: -Infinity,
      upper: Infinity,
      mean: mu,
      variance: sd * sd,
      natural: 'normal',
      envelope: null,
      inv: (p, q) => mu + sd * normalQuantilePQ(p, q),
      cdf: (x) => normalCdfPair((x - mu) / sd),
      fromZ: (z) => mu + sd * z,
      affine: { a: mu, b: sd, log: false },
    };
  }
  const alpha = lo === undefined ? -Infinity : (lo - mu) / sd;
  const beta = hi === undefined ? Infinity : (hi - mu) / sd;
  const t = truncatedStd(alpha, beta);
  const phiA = Number.isFinite(alpha) ? normalPdf(alpha) : 0;
  const phiB = Number.isFinite(beta) ? normalPdf(beta) : 0;
  const aPhiA = Number.isFinite(alpha) ? alpha * phiA : 0;
  const bPhiB = Number.isFinite(beta) ? beta * phiB : 0;
  const r = (phiA - phiB) / t.w;
  return {
    spec,
    lower: lo ?? -Infinity,
    upper: hi ?? Infinity,
    mean: mu + sd * r,
    variance: sd * sd * (1 + (aPhiA - bPhiB) / t.w - r * r),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => {
      const x = mu + sd * t.inv(p, q);
      return lo !== undefined && x < lo ? lo : hi !== undefined && x > hi ? hi : x;
    },
    cdf: (x) => t.cdf((x - mu) / sd),
    fromZ: null,
  };
}

function lognormal(mu: number, sigma: number, lo: number | undefined, hi: number | undefined, spec: DistributionSpec): Marginal {
  const loLog = lo !== undefined && lo > 0 ? ln(lo) : undefined;
  const hiLog = hi !== undefined ? ln(hi) : undefined;
  const truncated = loLog !== undefined || hiLog !== undefined;
  const s2 = sigma * sigma;
  if (!truncated) {
    return {
      spec,
      lower: 0,
      upper: Infinity,
      mean: exp(mu + s2 / 2),
      variance: expm1(s2) * exp(2 * mu + s2),
      natural: 'lognormal',
      envelope: null,
      inv: (p, q) => exp(mu + sigma * normalQuantilePQ(p, q)),
      cdf: (x) => (x <= 0 ? 0 : normalCdfPair((ln(x) - mu) / sigma)),
      fromZ: (z) => exp(mu + sigma * z),
      affine: { a: mu, b: sigma, log: true },
    };
  }
  const alpha = loLog === undefined ? -Infinity : (loLog - mu) / sigma;
  const beta = hiLog === undefined ? Infinity : (hiLog - mu) / sigma;
  const t = truncatedStd(alpha, beta);
  // Partial moments: E[X^k; a < X < b] = exp(k mu + k^2 s2 / 2) [Phi(beta - k sigma) - Phi(alpha - k sigma)].
  const partial = (k: number) => {
    const w = truncation(alpha - k * sigma, beta - k * sigma).w;
    return exp(k * mu + (k * k * s2) / 2) * w;
  };
  const m1 = partial(1) / t.w;
  const m2 = partial(2) / t.w;
  return {
    spec,
    lower: lo !== undefined && lo > 0 ? lo : 0,
    upper: hi ?? Infinity,
    mean: m1,
    variance: m2 - m1 * m1,
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => {
      const x = exp(mu + sigma * t.inv(p, q));
      return lo !== undefined && x < lo ? lo : hi !== undefined && x > hi ? hi : x;
    },
    cdf: (x) => (x <= 0 ? 0 : t.cdf((ln(x) - mu) / sigma)),
    fromZ: null,
  };
}

/** -ln(q) computed from whichever of p, q = 1 - p is small. */
function minusLogQ(p: number, q: number): number {
  return p < 0.5 ? -log1p(-p) : -ln(q);
}

function exponential(rate: number, spec: DistributionSpec): Marginal {
  return {
    spec,
    lower: 0,
    upper: Infinity,
    mean: 1 / rate,
    variance: 1 / (rate * rate),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => minusLogQ(p, q) / rate,
    cdf: (x) => (x <= 0 ? 0 : -expm1(-rate * x)),
    fromZ: null,
  };
}

function weibull(k: number, lambda: number, spec: DistributionSpec): Marginal {
  const g1 = gamma(1 + 1 / k);
  const g2 = gamma(1 + 2 / k);
  return {
    spec,
    lower: 0,
    upper: Infinity,
    mean: lambda * g1,
    variance: lambda * lambda * (g2 - g1 * g1),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => lambda * exp(ln(minusLogQ(p, q)) / k),
    cdf: (x) => (x <= 0 ? 0 : -expm1(-exp(k * ln(x / lambda)))),
    fromZ: null,
  };
}

/** Gamma(shape k, scale θ) by its inverse CDF (lib/core/engine/gamma.ts). */
function gammaLaw(k: number, theta: number, spec: DistributionSpec): Marginal {
  const { mean, variance } = gammaMoments(k, theta);
  return {
    spec,
    lower: 0,
    upper: Infinity,
    mean,
    variance,
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p, q) => theta * standardGammaInverse(k, p, q),
    cdf: (x) => (x <= 0 ? 0 : regGammaPQ(k, x / theta)[0]),
    fromZ: null,
  };
}

function discrete(values: number[], probabilities: number[], spec: DistributionSpec): Marginal {
  // Sort by value so the inverse CDF is monotone (needed by copula and LHS).
  const order = values.map((_, i) => i).sort((i, j) => values[i] - values[j]);
  const v = Float64Array.from(order, (i) => values[i]);
  const total = probabilities.reduce((s, p) => s + p, 0);
  const pr = Float64Array.from(order, (i) => probabilities[i] / total);
  const cum = new Float64Array(v.length);
  let s = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < v.length; i++) {
    s += pr[i];
    cum[i] = s;
    mean += pr[i] * v[i];
    m2 += pr[i] * v[i] * v[i];
  }
  cum[v.length - 1] = 1;
  const last = v.length - 1;
  return {
    spec,
    lower: v[0],
    upper: v[last],
    mean,
    variance: Math.max(0, m2 - mean * mean),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p) => {
      // First index whose cumulative probability exceeds p.
      let lo = 0;
      let hi = last;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (cum[mid] > p) hi = mid;
        else lo = mid + 1;
      }
      return v[lo];
    },
    cdf: (x) => {
      let c = 0;
      for (let i = 0; i < v.length && v[i] <= x; i++) c = cum[i];
      return c;
    },
    fromZ: null,
  };
}

/** Bernoulli(p) for risk events: 1 when the complement q falls below p (monotone in p). */
function bernoulli(prob: number, spec: DistributionSpec): Marginal {
  return {
    spec,
    lower: 0,
    upper: 1,
    mean: prob,
    variance: prob * (1 - prob),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (_p, q) => (q < prob ? 1 : 0),
    cdf: (x) => (x < 0 ? 0 : x < 1 ? 1 - prob : 1),
    fromZ: null,
  };
}

/** Empirical: inverse ECDF by linear interpolation between sorted data, rank h = p (n - 1). */
function empirical(data: number[], spec: DistributionSpec): Marginal {
  const x = Float64Array.from(data).sort();
  const n = x.length;
  const last = n - 1;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < last; i++) {
    mean += (x[i] + x[i + 1]) / 2;
    m2 += (x[i] * x[i] + x[i] * x[i + 1] + x[i + 1] * x[i + 1]) / 3;
  }
  mean /= last;
  m2 /= last;
  return {
    spec,
    lower: x[0],
    upper: x[last],
    mean,
    variance: Math.max(0, m2 - mean * mean),
    natural: 'inverse-cdf',
    envelope: null,
    inv: (p) => {
      const h = p * last;
      const j = Math.floor(h);
      if (j >= last) return x[last];
      return x[j] + (h - j) * (x[j + 1] - x[j]);
    },
    cdf: (v) => {
      if (v < x[0]) return 0;
      if (v >= x[last]) return 1;
      // Last index with x[i] <= v.
      let lo = 0;
      let hi = last;
      while (lo < hi) {
        const mid = (lo + hi + 1) >>> 1;
        if (x[mid] <= v) lo = mid;
        else hi = mid - 1;
      }
      const gap = x[lo + 1] - x[lo];
      return (lo + (gap > 0 ? (v - x[lo]) / gap : 0)) / last;
    },
    fromZ: null,
  };
}

/** Author-drawn density: piecewise linear through points (x ascending, y >= 0). */
function drawn(points: { x: number; y: number }[], spec: DistributionSpec): Marginal {
  const n = points.length;
  const xs = Float64Array.from(points, (p) => p.x);
  const ys = Float64Array.from(points, (p) => p.y);
  const cum = new Float64Array(n); // unnormalised area up to each point
  let maxY = 0;
  let m1 = 0;
  let m2 = 0;
  for (let i = 0; i < n; i++) maxY = Math.max(maxY, ys[i]);
  for (let i = 1; i < n; i++) {
    const h = xs[i] - xs[i - 1];
    cum[i] = cum[i - 1] + (h * (ys[i - 1] + ys[i])) / 2;
    // Simpson's rule is exact for x * linear and x^2 * linear.
    const xm = (xs[i - 1] + xs[i]) / 2;
    const ym = (ys[i - 1] + ys[i]) / 2;
    m1 += (h / 6) * (xs[i - 1] * ys[i - 1] + 4 * xm * ym + xs[i] * ys[i]);
    m2 += (h / 6) * (xs[i - 1] ** 2 * ys[i - 1] + 4 * xm * xm * ym + xs[i] ** 2 * ys[i]);
  }
  const area = cum[n - 1];
  const a = xs[0];
  const b = xs[n - 1];
  const mean = m1 / area;
  /** Index i of the segment [xs[i-1], xs[i]] holding x (first with xs[i] >= x). */
  const segment = (x: number) => {
    let lo = 1;
    let hi = n - 1;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (xs[mid] < x) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const density = (x: number) => {
    if (x < a || x > b) return 0;
    const i = segment(x);
    const h = xs[i] - xs[i - 1];
    const y = h > 0 ? ys[i - 1] + ((ys[i] - ys[i - 1]) * (x - xs[i - 1])) / h : Math.max(ys[i - 1], ys[i]);
    return y / area;
  };
  const M = maxY / area;
  return {
    spec,
    lower: a,
    upper: b,
    mean,
    variance: Math.max(0, m2 / area - mean * mean),
    natural: 'rejection',
    envelope: { a, b, M, density, expectedAcceptance: 1 / (M * (b - a)), turningPoints: Array.from(xs) },
    inv: (p) => {
      const target = p * area;
      // Segment i (between points i-1 and i) with cum[i-1] <= target < cum[i].
      let lo = 1;
      let hi = n - 1;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (cum[mid] > target) hi = mid;
        else lo = mid + 1;
      }
      const i = lo;
      const h = xs[i] - xs[i - 1];
      const c = target - cum[i - 1];
      const y0 = ys[i - 1];
      const slope = h > 0 ? (ys[i] - ys[i - 1]) / h : 0;
      // Solve y0 t + slope t^2 / 2 = c for t in [0, h] (stable root).
      const disc = y0 * y0 + 2 * slope * c;
      const t = c > 0 ? (2 * c) / (y0 + Math.sqrt(Math.max(0, disc))) : 0;
      const x = xs[i - 1] + (Number.isFinite(t) ? Math.min(Math.max(t, 0), h) : 0);
      return x;
    },
    cdf: (x) => {
      if (x <= a) return 0;
      if (x >= b) return 1;
      const i = segment(x);
      const h = xs[i] - xs[i - 1];
      const t = x - xs[i - 1];
      const slope = h > 0 ? (ys[i] - ys[i - 1]) / h : 0;
      return (cum[i - 1] + ys[i - 1] * t + (slope * t * t) / 2) / area;
    },
    fromZ: null,
  };
}

/**
 * out[k] = inverse CDF at p[k] (complement q[k], or 1 - p[k] when q is null) for k in
 * [start, start + count); out may be p. One loop per law, so each loop's call site only
 * ever sees that law's inverse and the engine can inline it.
 */
export function fillInverse(m: Marginal, p: Float64Array, q: Float64Array | null, out: Float64Array, start: number, count: number): void {
  const inv = m.inv;
  const end = start + count;
  switch (m.spec.type) {
    case 'constant':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'uniform':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'triangular':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'pert':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'normal':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'lognormal':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'exponential':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'weibull':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'gamma':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'discrete':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'bernoulli':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'empirical':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
    case 'drawn':
      for (let k = start; k < end; k++) {
        const pk = p[k];
        out[k] = inv(pk, q ? q[k] : 1 - pk);
      }
      return;
  }
}

/** Build the marginal for a (validated) distribution spec. */
export function createMarginal(spec: DistributionSpec): Marginal {
  switch (spec.type) {
    case 'constant':
      return constant(spec.value, spec);
    case 'uniform':
      return uniform(spec.min, spec.max, spec);
    case 'triangular':
      return triangular(spec.min, spec.mode, spec.max, spec);
    case 'pert':
      return pert(spec.min, spec.mode, spec.max, spec);
    case 'normal':
      return normal(spec.mean, spec.sd, spec.min, spec.max, spec);
    case 'lognormal':
      return lognormal(spec.mu, spec.sigma, spec.min, spec.max, spec);
    case 'exponential':
      return exponential(spec.rate, spec);
    case 'weibull':
      return weibull(spec.shape, spec.scale, spec);
    case 'gamma':
      return gammaLaw(spec.shape, spec.scale, spec);
    case 'discrete':
      return discrete(spec.values, spec.probabilities, spec);
    case 'bernoulli':
      return bernoulli(spec.p, spec);
    case 'empirical':
      return empirical(spec.data, spec);
    case 'drawn':
      return drawn(spec.points, spec);
  }
}
