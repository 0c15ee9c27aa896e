/**
 * Statistics of simulated outputs. Everything here is deterministic given the sample
 * columns (fixed summation orders), so a browser run and a server run agree bit for bit.
 */
import { lgamma, normalSf } from './special';
import { averageRanks, sortedCopy } from './sort';
import { orderStatistics } from './select';
import * as detMath from './det-math';
import * as wasm from './wasm-kernels';

// Bound once: module interop in some runtimes turns each imported call into a getter call.
const { exp, ln } = detMath;
const { LAYOUT: wasmLayout, wasmKernels, workspace } = wasm;

/** The one pinned percentile definition (shown in the UI and the PDF). */
export const PERCENTILE_DEFINITION = {
  id: 'hyndman-fan-6',
  name: 'Hyndman–Fan type 6',
  text:
    'Percentiles follow Hyndman & Fan (1996) definition 6: the p-th percentile lies at rank p(N + 1) of the N sorted ' +
    'valid trials, interpolating linearly between neighbouring trials and clamped to the smallest and largest trial. ' +
    'It is the definition used in the NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.6.2.',
} as const;

/** Confidence level of every interval the engine reports. */
export const CONFIDENCE_LEVEL = 0.95;
const Z975 = 1.959963984540054; // Phi^-1(0.975)

export interface Interval {
  low: number;
  high: number;
}

/** Running mean and variance (Welford 1962, Technometrics 4(3):419-420). */
export function welford(values: Float64Array): { n: number; mean: number; variance: number } {
  let n = 0;
  let mean = 0;
  let m2 = 0;
  for (let k = 0; k < values.length; k++) {
    const x = values[k];
    n++;
    const d = x - mean;
    mean += d / n;
    m2 += d * (x - mean);
  }
  // Sample variance with the n - 1 divisor.
  return { n, mean: n > 0 ? mean : NaN, variance: n > 1 ? m2 / (n - 1) : NaN };
}

/** Columns up to this length have their moments taken in the wasm kernels (larger ones would grow its memory). */
const MOMENTS_IN_WASM = 65_536;

/**
 * Count, mean and sum of squared deviations by the corrected two-pass formula (Chan, Golub & LeVeque 1983): the
 * second pass removes the rounding left in the mean; no division per element. Each sum runs in eight partial
 * sums (element k goes to sum k mod 8, the last n mod 8 elements to a ninth, one after another), combined as
 * ((p0 + p2) + (p4 + p6)) + ((p1 + p3) + (p5 + p7)) + p8: a fixed order, the same in the wasm SIMD kernels
 * (kernels.wat: sum, deviations; four f64x2 accumulators) and here, so every engine gives the same bits.
 */
export function twoPassMoments(values: Float64Array): { n: number; mean: number; m2: number } {
  const n = values.length;
  const k = wasmKernels();
  if (k && n >= 64 && n <= MOMENTS_IN_WASM) {
    const at = wasmLayout.scratch;
    const buf = workspace(k, 8 * n + 8);
    new Float64Array(buf, at, n).set(values);
    const mean = k.sum(at, n) / n;
    const ss = k.deviations(at, n, mean, at + 8 * n);
    const comp = new Float64Array(buf, at + 8 * n, 1)[0];
    return { n, mean, m2: ss - (comp * comp) / n };
  }
  const n8 = n - (n & 7);
  let p0 = 0;
  let p1 = 0;
  let p2 = 0;
  let p3 = 0;
  let p4 = 0;
  let p5 = 0;
  let p6 = 0;
  let p7 = 0;
  for (let i = 0; i < n8; i += 8) {
    p0 += values[i];
    p1 += values[i + 1];
    p2 += values[i + 2];
    p3 += values[i + 3];
    p4 += values[i + 4];
    p5 += values[i + 5];
    p6 += values[i + 6];
    p7 += values[i + 7];
  }
  let tail = 0;
  for (let i = n8; i < n; i++) tail += values[i];
  const mean = (p0 + p2 + (p4 + p6) + (p1 + p3 + (p5 + p7)) + tail) / n;
  let q0 = 0;
  let q1 = 0;
  let q2 = 0;
  let q3 = 0;
  let q4 = 0;
  let q5 = 0;
  let q6 = 0;
  let q7 = 0;
  let c0 = 0;
  let c1 = 0;
  let c2 = 0;
  let c3 = 0;
  let c4 = 0;
  let c5 = 0;
  let c6 = 0;
  let c7 = 0;
  for (let i = 0; i < n8; i += 8) {
    const d0 = values[i] - mean;
    q0 += d0 * d0;
    c0 += d0;
    const d1 = values[i + 1] - mean;
    q1 += d1 * d1;
    c1 += d1;
    const d2 = values[i + 2] - mean;
    q2 += d2 * d2;
    c2 += d2;
    const d3 = values[i + 3] - mean;
    q3 += d3 * d3;
    c3 += d3;
    const d4 = values[i + 4] - mean;
    q4 += d4 * d4;
    c4 += d4;
    const d5 = values[i + 5] - mean;
    q5 += d5 * d5;
    c5 += d5;
    const d6 = values[i + 6] - mean;
    q6 += d6 * d6;
    c6 += d6;
    const d7 = values[i + 7] - mean;
    q7 += d7 * d7;
    c7 += d7;
  }
  let tq = 0;
  let tc = 0;
  for (let i = n8; i < n; i++) {
    const d = values[i] - mean;
    tq += d * d;
    tc += d;
  }
  const ss = q0 + q2 + (q4 + q6) + (q1 + q3 + (q5 + q7)) + tq;
  const comp = c0 + c2 + (c4 + c6) + (c1 + c3 + (c5 + c7)) + tc;
  return { n, mean, m2: ss - (comp * comp) / n };
}

/** Mean and n - 1 variance by two passes (summaries of input columns). */
export function meanVariance(values: Float64Array): { n: number; mean: number; variance: number } {
  const { n, mean, m2 } = twoPassMoments(values);
  return { n, mean: n > 0 ? mean : NaN, variance: n > 1 ? m2 / (n - 1) : NaN };
}

/** Hyndman-Fan type 6 percentile of ascending data, p in [0, 1]. */
export function percentileSorted(sorted: Float64Array | number[], p: number): number {
  return percentileAt(sorted.length, p, (i) => sorted[i]);
}

/** 0-based ranks of the sorted data a type 6 percentile of n values reads. */
function percentileReads(n: number, p: number): number[] {
  const h = p * (n + 1);
  if (h <= 1) return [0];
  if (h >= n) return [n - 1];
  const j = Math.floor(h);
  return h - j === 0 ? [j - 1] : [j - 1, j];
}

/** Type 6 percentile of n values given the value at each 0-based rank of their sorted order. */
function percentileAt(n: number, p: number, at: (rank: number) => number): number {
  if (n === 0) return NaN;
  const h = p * (n + 1); // 1-based rank
  if (h <= 1) return at(0);
  if (h >= n) return at(n - 1);
  const j = Math.floor(h);
  const g = h - j;
  const lo = at(j - 1);
  const hi = at(j);
  return g === 0 ? lo : lo + g * (hi - lo);
}

/** Wilson score interval for a binomial proportion (Wilson 1927), 95 %. */
export function wilsonInterval(count: number, n: number, z = Z975): Interval {
  if (n <= 0) return { low: 0, high: 1 };
  const p = count / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denom;
  return { low: count <= 0 ? 0 : Math.max(0, centre - half), high: count >= n ? 1 : Math.min(1, centre + half) };
}

/**
 * Distribution-free confidence interval for the p-quantile from order statistics: with
 * B ~ Binomial(n, p) the number of trials below the true quantile, [X(l), X(u)] covers it
 * with probability P(l <= B < u). l is the largest rank with P(B < l) <= 2.5 % and u the
 * smallest with P(B >= u) <= 2.5 % (exact binomial sums). Ranks are 1-based; null when the
 * sample is too small for that side.
 */
export function orderStatisticRanks(n: number, p: number, conf = CONFIDENCE_LEVEL): { low: number | null; high: number | null } {
  if (n < 1 || !(p > 0 && p < 1)) return { low: null, high: null };
  const tail = (1 - conf) / 2;
  const q = 1 - p;
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const logMode = lgamma(n + 1) - lgamma(mode + 1) - lgamma(n - mode + 1) + mode * ln(p) + (n - mode) * ln(q);
  const pm = exp(logMode);
  // pmf below the mode (descending k) and above it.
  const below: number[] = [];
  let v = pm;
  for (let k = mode; k > 0; k--) {
    v *= (k / (n - k + 1)) * (q / p);
    if (v < 1e-300 || v < pm * 1e-18) break;
    below.push(v); // pmf(k - 1)
  }
  const above: number[] = [];
  v = pm;
  for (let k = mode; k < n; k++) {
    v *= ((n - k) / (k + 1)) * (p / q);
    if (v < 1e-300 || v < pm * 1e-18) break;
    above.push(v); // pmf(k + 1)
  }
  let total = pm;
  for (const b of below) total += b;
  for (const a of above) total += a;
  // Lower: accumulate P(B <= k) from the bottom of the window.
  let low: number | null = null;
  let cum = 0;
  const firstK = mode - below.length;
  for (let i = below.length - 1, k = firstK; i >= -1; i--, k++) {
    cum += (i >= 0 ? below[i] : pm) / total;
    if (cum > tail) break;
    low = k + 1; // P(B <= k) <= tail, so P(B < k + 1) <= tail
  }
  // Upper: accumulate P(B >= k) from the top.
  let high: number | null = null;
  cum = 0;
  const lastK = mode + above.length;
  for (let i = above.length - 1, k = lastK; i >= -1; i--, k--) {
    cum += (i >= 0 ? above[i] : pm) / total;
    if (cum > tail) break;
    high = k; // P(B >= k) <= tail
  }
  if (low !== null && low < 1) low = null;
  if (high !== null && high > n) high = null;
  return { low, high };
}

export interface PercentileEstimate {
  /** Probability level in [0, 1]. */
  p: number;
  value: number;
  /** 95 % distribution-free interval from order statistics, null when the sample is too small. */
  ci: Interval | null;
}

export function percentileEstimates(sorted: Float64Array, levels: number[]): PercentileEstimate[] {
  return estimatesFrom(sorted.length, levels, (i) => sorted[i]);
}

function estimatesFrom(n: number, levels: number[], at: (rank: number) => number, ranks = levels.map((p) => orderStatisticRanks(n, p))): PercentileEstimate[] {
  return levels.map((p, i) => {
    const r = ranks[i];
    return {
      p,
      value: percentileAt(n, p, at),
      ci: r.low !== null && r.high !== null ? { low: at(r.low - 1), high: at(r.high - 1) } : null,
    };
  });
}

/**
 * percentileEstimates of `values` (any order, no NaN) without sorting them: the few order
 * statistics the percentiles and their intervals read are found by selection (select.ts),
 * and are exactly the sorted column's values at those ranks, so the estimates are too.
 */
export function percentileEstimatesBySelection(values: Float64Array, levels: number[]): PercentileEstimate[] {
  const n = values.length;
  if (n === 0) return estimatesFrom(0, levels, () => NaN);
  const ranks = levels.map((p) => orderStatisticRanks(n, p));
  const wanted: number[] = [];
  levels.forEach((p, i) => {
    wanted.push(...percentileReads(n, p));
    const r = ranks[i];
    if (r.low !== null && r.high !== null) wanted.push(r.low - 1, r.high - 1);
  });
  const found = orderStatistics(values, wanted);
  const byRank = new Map<number, number>();
  wanted.forEach((r, i) => byRank.set(r, found[i]));
  return estimatesFrom(n, levels, (i) => byRank.get(i) as number, ranks);
}

export interface HistogramBin {
  x0: number;
  x1: number;
  count: number;
}

/** Equal-width bins over [min, max]; the maximum falls in the last bin. */
export function histogram(sorted: Float64Array, bins: number): HistogramBin[] {
  const n = sorted.length;
  if (n === 0) return [];
  const min = sorted[0];
  const max = sorted[n - 1];
  if (!(max > min)) return [{ x0: min, x1: max, count: n }];
  const width = (max - min) / bins;
  const out: HistogramBin[] = [];
  for (let b = 0; b < bins; b++) out.push({ x0: min + b * width, x1: b === bins - 1 ? max : min + (b + 1) * width, count: 0 });
  // Sorted input: walk once.
  let b = 0;
  for (let k = 0; k < n; k++) {
    const x = sorted[k];
    while (b < bins - 1 && x >= out[b].x1) b++;
    out[b].count++;
  }
  return out;
}

export interface EcdfPoint {
  x: number;
  /** Fraction of valid trials <= x. */
  p: number;
}

/** Empirical CDF downsampled to at most maxPoints points at evenly spaced ranks. */
export function ecdfPoints(sorted: Float64Array, maxPoints: number): EcdfPoint[] {
  const n = sorted.length;
  if (n === 0) return [];
  const m = Math.max(2, Math.min(maxPoints, n));
  const out: EcdfPoint[] = [];
  let prev = -1;
  for (let i = 0; i < m; i++) {
    let r = Math.round((i * (n - 1)) / (m - 1));
    if (r <= prev) continue;
    // Step to the last of a run of equal values so p is the ECDF value.
    while (r + 1 < n && sorted[r + 1] === sorted[r]) r++;
    if (r <= prev) continue;
    out.push({ x: sorted[r], p: (r + 1) / n });
    prev = r;
  }
  return out;
}

/** Fraction of ascending data <= v. */
export function fractionAtOrBelow(sorted: Float64Array, v: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo / n;
}

export function pearson(a: Float64Array, b: Float64Array): number {
  const n = a.length;
  let ma = 0;
  let mb = 0;
  for (let k = 0; k < n; k++) {
    ma += a[k];
    mb += b[k];
  }
  ma /= n;
  mb /= n;
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let k = 0; k < n; k++) {
    const da = a[k] - ma;
    const db = b[k] - mb;
    sab += da * db;
    saa += da * da;
    sbb += db * db;
  }
  return saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : NaN;
}

/** A column less its mean, and its sum of squared deviations (as pearson computes them). */
export interface Centred {
  dev: Float64Array;
  ss: number;
}

const centredByColumn = new WeakMap<Float64Array, Centred>();

/**
 * The column centred once and kept with it (ranks of unchanged inputs live across runs), so
 * Pearson's r of two columns is one dot product (pearsonCentred; the same formula as pearson,
 * its cross-product summed in four interleaved parts, so it may differ in the last bits).
 */
export function centred(a: Float64Array): Centred {
  let c = centredByColumn.get(a);
  if (c) return c;
  const n = a.length;
  let m = 0;
  for (let k = 0; k < n; k++) m += a[k];
  m /= n;
  const dev = new Float64Array(n);
  let ss = 0;
  for (let k = 0; k < n; k++) {
    const d = a[k] - m;
    dev[k] = d;
    ss += d * d;
  }
  c = { dev, ss };
  centredByColumn.set(a, c);
  return c;
}

export function pearsonCentred(a: Centred, b: Centred): number {
  const x = a.dev;
  const y = b.dev;
  const n = x.length;
  // Four running sums (no chain of dependent additions), combined in a fixed order.
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let k = 0;
  for (; k + 3 < n; k += 4) {
    s0 += x[k] * y[k];
    s1 += x[k + 1] * y[k + 1];
    s2 += x[k + 2] * y[k + 2];
    s3 += x[k + 3] * y[k + 3];
  }
  for (; k < n; k++) s0 += x[k] * y[k];
  const sab = s0 + s1 + (s2 + s3);
  return a.ss > 0 && b.ss > 0 ? sab / Math.sqrt(a.ss * b.ss) : NaN;
}

/** Pearson correlation matrix of several columns (each standardised once). */
export function correlationMatrix(cols: Float64Array[]): number[][] {
  const k = cols.length;
  const std = cols.map((x) => {
    const n = x.length;
    let m = 0;
    for (let t = 0; t < n; t++) m += x[t];
    m /= n;
    let ss = 0;
    for (let t = 0; t < n; t++) ss += (x[t] - m) * (x[t] - m);
    if (!(ss > 0)) return null;
    const inv = 1 / Math.sqrt(ss);
    const z = new Float64Array(n);
    for (let t = 0; t < n; t++) z[t] = (x[t] - m) * inv;
    return z;
  });
  const out: number[][] = cols.map((_, i) => cols.map((__, j) => (i === j ? 1 : 0)));
  for (let i = 0; i < k; i++)
    for (let j = i + 1; j < k; j++) {
      const a = std[i];
      const b = std[j];
      let d = 0;
      if (a && b) for (let t = 0; t < a.length; t++) d += a[t] * b[t];
      out[i][j] = out[j][i] = a && b ? Math.max(-1, Math.min(1, d)) : 0;
    }
  return out;
}

/**
 * Ranks kept between runs, keyed by what a column's values depend on: after a dial move
 * the unchanged inputs keep their ranks. Entries unused in the last run are dropped.
 */
export class RankStore {
  private readonly map = new Map<string, { ranks: Float64Array; used: number }>();
  private generation = 0;
  beginRun(): void {
    this.generation++;
    for (const [k, e] of this.map) if (e.used < this.generation - 1) this.map.delete(k);
  }
  get(key: string): Float64Array | undefined {
    const e = this.map.get(key);
    if (e) e.used = this.generation;
    return e?.ranks;
  }
  set(key: string, ranks: Float64Array): void {
    this.map.set(key, { ranks, used: this.generation });
  }
}

/** Average ranks of leading segments of columns, computed once per (column, length). */
export class RankCache {
  private readonly map = new Map<Float64Array, Map<number, Float64Array>>();
  private readonly keys = new Map<Float64Array, string>();
  constructor(private readonly store: RankStore | null = null) {}
  /** Name a column by what its values depend on, so its ranks can come from the store. */
  name(col: Float64Array, key: string): void {
    this.keys.set(col, key);
  }
  ranks(col: Float64Array, n: number): Float64Array {
    let byN = this.map.get(col);
    if (!byN) this.map.set(col, (byN = new Map()));
    let r = byN.get(n);
    if (!r) {
      const key = this.store ? this.keys.get(col) : undefined;
      const stored = key !== undefined ? this.store?.get(`${n}|${key}`) : undefined;
      r = stored ?? averageRanks(n === col.length ? col : col.subarray(0, n));
      if (key !== undefined && !stored) this.store?.set(`${n}|${key}`, r);
      byN.set(n, r);
    }
    return r;
  }
}

/** Spearman rank correlation (Pearson correlation of average ranks). */
export function spearman(a: Float64Array, b: Float64Array): number {
  return pearson(averageRanks(a), averageRanks(b));
}

export interface Capability {
  /** Pp = (USL - LSL) / 6 sigma, overall (long-term) variation; null unless both limits exist. */
  pp: number | null;
  /** Ppk = min(USL - mean, mean - LSL) / 3 sigma over the limits given. */
  ppk: number | null;
  /** Normal-theory fraction outside the limits, in ppm, from the mean and sd. */
  ppmNormal: number | null;
}

/** Pp / Ppk and normal-theory ppm (NIST e-Handbook §6.1.6 definitions, with overall sigma). */
export function capability(mean: number, sd: number, lower: number | null, upper: number | null): Capability {
  if (!(sd > 0) || (lower === null && upper === null)) return { pp: null, ppk: null, ppmNormal: null };
  const pp = lower !== null && upper !== null ? (upper - lower) / (6 * sd) : null;
  const sides: number[] = [];
  if (upper !== null) sides.push((upper - mean) / (3 * sd));
  if (lower !== null) sides.push((mean - lower) / (3 * sd));
  const ppk = Math.min(...sides);
  let frac = 0;
  if (lower !== null) frac += normalSf((mean - lower) / sd);
  if (upper !== null) frac += normalSf((upper - mean) / sd);
  return { pp, ppk, ppmNormal: frac * 1e6 };
}

/** Normal-theory fraction outside [lower, upper] for N(mean, sd), in ppm. */
export function normalPpmOutside(mean: number, sd: number, lower: number | null, upper: number | null): number {
  let frac = 0;
  if (lower !== null) frac += normalSf((mean - lower) / sd);
  if (upper !== null) frac += normalSf((upper - mean) / sd);
  return frac * 1e6;
}

export { averageRanks, sortedCopy };

/**
 * Hyndman-Fan type 6 percentiles by selection instead of a full sort: the two order
 * statistics each level reads are found by bucket selection (select.ts: a pass for the
 * range, one for the bucket counts, one gathering the few buckets that hold a wanted rank),
 * for every level at once. NaN must be removed by the caller. Returns exactly what
 * percentileSorted gives on the sorted data (-0 before +0, as sortedCopy orders them).
 */
export function percentilesBySelection(values: Float64Array, levels: number[]): number[] {
  const n = values.length;
  if (n === 0) return levels.map(() => NaN);
  const wanted = [...new Set(levels.flatMap((p) => percentileReads(n, p)))];
  const found = orderStatistics(values, wanted);
  const byRank = new Map<number, number>();
  wanted.forEach((r, i) => byRank.set(r, found[i]));
  return levels.map((p) => percentileAt(n, p, (r) => byRank.get(r) as number));
}
