/**
 * Summary of one simulated output: moments, percentiles with order-statistic intervals,
 * histogram, ECDF, limits (observed and normal-theory), drivers and a convergence verdict.
 */
import { averageRanks, sortedCopy } from './sort';
import {
  RankCache,
  capability,
  ecdfPoints,
  histogram,
  centred,
  pearsonCentred,
  percentileEstimatesBySelection,
  welford,
  wilsonInterval,
  type EcdfPoint,
  type HistogramBin,
  type Interval,
  type PercentileEstimate,
} from './stats';

export const DEFAULT_PERCENTILES = [0.01, 0.05, 0.1, 0.25, 0.5, 0.75, 0.8, 0.9, 0.95, 0.99];
export const DEFAULT_HISTOGRAM_BINS = 40;
export const DEFAULT_ECDF_POINTS = 201;
/**
 * Drivers use at most this many trials (the first ones): a rank correlation from 25,000
 * trials has a standard error near 0.006, ample for ranking what moves the output, and
 * ranking every column of a long run would cost more than the run.
 */
export const DRIVER_TRIAL_LIMIT = 25_000;
/** Achieved correlations (reported beside the targets) use at most this many trials. */
export const RANK_TRIAL_LIMIT = 100_000;
/** Verdict thresholds. */
export const CONVERGENCE_RULES = {
  minTrials: 1000,
  /** Each reported percentile between P5 and P95: 95 % interval half-width at most this share of the sd. */
  percentileHalfWidthOverSd: 0.05,
  /** Out-of-limit counts below this are "rough". */
  minTailCount: 10,
} as const;

export interface ProbabilityEstimate {
  count: number;
  n: number;
  p: number;
  /** 95 % Wilson score interval. */
  ci: Interval;
  method: 'wilson';
}

export interface LimitReport {
  lower: number | null;
  upper: number | null;
  below: ProbabilityEstimate | null;
  above: ProbabilityEstimate | null;
  outside: ProbabilityEstimate;
  ppmObserved: number;
  ppmObservedCi: Interval;
  /** From the mean and sd, assuming a normal output. */
  ppmNormal: number | null;
  /** Overall-variation capability (Monte Carlo output): Pp and Ppk, not Cp/Cpk. */
  pp: number | null;
  ppk: number | null;
}

export interface DriverItem {
  id: string;
  label: string;
  /** Spearman rank correlation with the output. */
  spearman: number;
  /** Squared rank correlation normalised over all drivers. */
  share: number;
}

export interface DriverReport {
  method: 'spearman';
  trials: number;
  items: DriverItem[];
}

export interface Convergence {
  /** Standard error of the mean. */
  sem: number | null;
  /** Largest 95 % half-width among percentiles P5..P95, as a share of the sd. */
  worstPercentileHalfWidth: number | null;
  enough: boolean;
  reasons: string[];
  verdict: string;
}

export interface OutputSummary {
  id: string;
  label: string;
  unit: string;
  trials: number;
  valid: number;
  invalid: { nan: number; positiveInfinity: number; negativeInfinity: number; total: number };
  mean: number | null;
  sd: number | null;
  sem: number | null;
  min: number | null;
  max: number | null;
  percentiles: PercentileEstimate[];
  histogram: HistogramBin[];
  ecdf: EcdfPoint[];
  limits: LimitReport | null;
  drivers: DriverReport;
  convergence: Convergence;
}

export interface SummaryOptions {
  percentiles: number[];
  histogramBins: number;
  ecdfPoints: number;
  lower: number | null;
  upper: number | null;
  /** Report Pp/Ppk (tolerances) or not (costs). */
  capability: boolean;
  drivers: { id: string; label: string; column: Float64Array }[];
  /** Shared ranks (drivers and achieved correlations rank the same columns). */
  rankCache?: RankCache;
  /** Mean and n - 1 variance of the finite values, when already known (merged chunk moments). */
  moments?: { n: number; mean: number; variance: number };
}

function prob(count: number, n: number): ProbabilityEstimate {
  return { count, n, p: n > 0 ? count / n : 0, ci: wilsonInterval(count, n), method: 'wilson' };
}

const fmtN = (x: number) => x.toLocaleString('en-US');
const fmtG = (x: number) => (Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(2) : +x.toPrecision(3) + '');

export interface OutputSummaryWithSorted {
  summary: OutputSummary;
  sorted: Float64Array;
}

/** Everything summarizeOutput does, in the order a viewer needs it. */
export interface OutputStages {
  /** Moments, percentiles (by selection), limits and convergence; histogram, ECDF and drivers empty. */
  headline: OutputSummary;
  /** The finite values of the column (the column itself when all are finite). */
  valid: Float64Array;
  /** The headline with the histogram and ECDF (sorts the valid values). */
  charts(from: OutputSummary): { summary: OutputSummary; sorted: Float64Array };
  /** A summary with its drivers. */
  drivers(from: OutputSummary): OutputSummary;
}

export const NO_DRIVERS_YET: DriverReport = { method: 'spearman', trials: 0, items: [] };

/** Smallest and largest value as the ascending sort orders them (-0 before +0). */
function extremes(values: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < values.length; k++) {
    const x = values[k];
    if (x < min) min = x;
    if (x > max) max = x;
  }
  if (min === 0 || max === 0) {
    let negZero = false;
    let posZero = false;
    for (let k = 0; k < values.length; k++) {
      if (values[k] !== 0) continue;
      if (Object.is(values[k], -0)) negZero = true;
      else posZero = true;
    }
    if (min === 0) min = negZero ? -0 : 0;
    if (max === 0) max = posZero ? 0 : -0;
  }
  return { min, max };
}

export function summarizeOutput(id: string, label: string, unit: string, column: Float64Array, opts: SummaryOptions): OutputSummaryWithSorted {
  const stages = summarizeOutputStaged(id, label, unit, column, opts);
  const { summary, sorted } = stages.charts(stages.headline);
  return { summary: stages.drivers(summary), sorted };
}

/**
 * The summary of one output in three steps: the headline figures need no sort (selection
 * for the percentiles, counts for the limits); the charts sort the column once; drivers
 * rank it. Each step gives the same numbers whatever ran before.
 */
export function summarizeOutputStaged(id: string, label: string, unit: string, column: Float64Array, opts: SummaryOptions): OutputStages {
  const n = column.length;
  let nan = 0;
  let pinf = 0;
  let ninf = 0;
  for (let k = 0; k < n; k++) {
    const x = column[k];
    if (x !== x) nan++;
    else if (x === Infinity) pinf++;
    else if (x === -Infinity) ninf++;
  }
  const invalidTotal = nan + pinf + ninf;
  let valid: Float64Array;
  if (invalidTotal === 0) valid = column;
  else {
    valid = new Float64Array(n - invalidTotal);
    let j = 0;
    for (let k = 0; k < n; k++) {
      const x = column[k];
      if (x - x === 0) valid[j++] = x;
    }
  }
  const m = valid.length;
  const w = opts.moments && opts.moments.n === m ? opts.moments : welford(valid);
  const mean = m > 0 ? w.mean : null;
  const sd = m > 1 ? Math.sqrt(w.variance) : null;
  const sem = sd !== null ? sd / Math.sqrt(m) : null;
  const percentiles = m > 0 ? percentileEstimatesBySelection(valid, opts.percentiles) : [];

  // Limits: counts are exact comparisons on the valid trials.
  let limits: LimitReport | null = null;
  if (opts.lower !== null || opts.upper !== null) {
    let below = 0;
    let above = 0;
    for (let k = 0; k < m; k++) {
      const x = valid[k];
      if (opts.lower !== null && x < opts.lower) below++;
      else if (opts.upper !== null && x > opts.upper) above++;
    }
    const outside = prob(below + above, m);
    const cap = opts.capability && mean !== null && sd !== null ? capability(mean, sd, opts.lower, opts.upper) : null;
    const normalOnly = !opts.capability && mean !== null && sd !== null ? capability(mean, sd, opts.lower, opts.upper) : null;
    limits = {
      lower: opts.lower,
      upper: opts.upper,
      below: opts.lower !== null ? prob(below, m) : null,
      above: opts.upper !== null ? prob(above, m) : null,
      outside,
      ppmObserved: outside.p * 1e6,
      ppmObservedCi: { low: outside.ci.low * 1e6, high: outside.ci.high * 1e6 },
      ppmNormal: (cap ?? normalOnly)?.ppmNormal ?? null,
      pp: cap?.pp ?? null,
      ppk: cap?.ppk ?? null,
    };
  }

  // Convergence verdict.
  const reasons: string[] = [];
  let enough = true;
  if (m < CONVERGENCE_RULES.minTrials) {
    enough = false;
    reasons.push(`Only ${fmtN(m)} valid trials; at least ${fmtN(CONVERGENCE_RULES.minTrials)} are needed for stable percentiles.`);
  }
  let worst: number | null = null;
  if (sd !== null && sd > 0) {
    for (const pe of percentiles) {
      if (pe.p < 0.05 - 1e-12 || pe.p > 0.95 + 1e-12) continue;
      const hw = pe.ci ? (pe.ci.high - pe.ci.low) / 2 / sd : null;
      if (hw !== null && (worst === null || hw > worst)) worst = hw;
      if (hw === null || hw > CONVERGENCE_RULES.percentileHalfWidthOverSd) {
        enough = false;
        reasons.push(
          pe.ci
            ? `P${+(pe.p * 100).toFixed(2)} is known only to ±${fmtG((pe.ci.high - pe.ci.low) / 2)}${unit ? ' ' + unit : ''} (95 % interval), more than ${CONVERGENCE_RULES.percentileHalfWidthOverSd * 100} % of the standard deviation.`
            : `Too few trials to put an interval on P${+(pe.p * 100).toFixed(2)}.`,
        );
      }
    }
  }
  if (limits) {
    const c = limits.outside.count;
    if (c > 0 && c < CONVERGENCE_RULES.minTailCount) {
      enough = false;
      const target = Math.ceil((CONVERGENCE_RULES.minTailCount * 2) / Math.max(limits.outside.p, 1e-12));
      reasons.push(
        `Only ${c} trial${c === 1 ? '' : 's'} fell outside the limits, so the observed ${fmtG(limits.ppmObserved)} ppm is rough ` +
          `(95 % interval ${fmtG(limits.ppmObservedCi.low)}–${fmtG(limits.ppmObservedCi.high)} ppm); about ${fmtN(target)} trials would give a firm figure` +
          (limits.ppmNormal !== null ? `, or read the normal-theory estimate (${fmtG(limits.ppmNormal)} ppm).` : '.'),
      );
    } else if (c === 0 && m > 0) {
      reasons.push(
        `No trial fell outside the limits: the fraction outside is below ${fmtG(limits.ppmObservedCi.high)} ppm (95 % upper bound)` +
          (limits.ppmNormal !== null ? `; the normal-theory estimate is ${fmtG(limits.ppmNormal)} ppm.` : '.'),
      );
    }
  }
  if (invalidTotal > 0) {
    reasons.push(`${fmtN(invalidTotal)} trial${invalidTotal === 1 ? '' : 's'} gave no number (${nan} NaN, ${pinf + ninf} infinite) and ${invalidTotal === 1 ? 'is' : 'are'} excluded from the statistics.`);
  }
  if (enough && worst !== null) {
    reasons.unshift(`Every percentile from P5 to P95 is known to within ±${(worst * 100).toFixed(1)} % of the standard deviation (95 % intervals).`);
  }
  const verdict = m === 0 ? 'No valid trials: every trial gave NaN or an infinite value.' : `${enough ? 'Enough trials' : 'Not enough trials'}: ${reasons[0] ?? 'the output is constant.'}`;

  const ends = m > 0 ? extremes(valid) : null;
  const headline: OutputSummary = {
    id,
    label,
    unit,
    trials: n,
    valid: m,
    invalid: { nan, positiveInfinity: pinf, negativeInfinity: ninf, total: invalidTotal },
    mean,
    sd,
    sem,
    min: ends ? ends.min : null,
    max: ends ? ends.max : null,
    percentiles,
    histogram: [],
    ecdf: [],
    limits,
    drivers: NO_DRIVERS_YET,
    convergence: { sem, worstPercentileHalfWidth: worst, enough: m > 0 && enough, reasons, verdict },
  };
  return {
    headline,
    valid,
    charts(from) {
      const sorted = sortedCopy(valid);
      return { summary: { ...from, histogram: histogram(sorted, opts.histogramBins), ecdf: ecdfPoints(sorted, opts.ecdfPoints) }, sorted };
    },
    drivers(from) {
      return { ...from, drivers: computeDrivers(column, opts.drivers, opts.rankCache) };
    },
  };
}

/**
 * Drivers: Spearman rank correlation of each driver column with the output over the first
 * DRIVER_TRIAL_LIMIT trials with a finite output; share of variance = rho^2 / sum rho^2.
 */
export function computeDrivers(output: Float64Array, drivers: { id: string; label: string; column: Float64Array }[], cache: RankCache = new RankCache()): DriverReport {
  const limit = Math.min(output.length, DRIVER_TRIAL_LIMIT);
  let m = 0;
  for (let k = 0; k < limit; k++) if (output[k] - output[k] === 0) m++;
  // Indices of the finite outputs, needed only when some are not.
  const keep = new Uint32Array(m === limit ? 0 : m);
  if (m !== limit) for (let k = 0, j = 0; k < limit; k++) if (output[k] - output[k] === 0) keep[j++] = k;
  if (m < 3 || drivers.length === 0) return { method: 'spearman', trials: m, items: drivers.map((d) => ({ id: d.id, label: d.label, spearman: 0, share: 0 })) };
  // Every trial in the window is valid: rank the leading segment (shared with other reports).
  const ranksOf = (col: Float64Array) => {
    if (m === limit) return cache.ranks(col, limit);
    const out = new Float64Array(m);
    for (let i = 0; i < m; i++) out[i] = col[keep[i]];
    return averageRanks(out);
  };
  // Centred ranks are kept with the ranks of unchanged inputs: each rho is one dot product.
  const yr = centred(ranksOf(output));
  const rhos = drivers.map((d) => {
    const r = pearsonCentred(centred(ranksOf(d.column)), yr);
    return Number.isFinite(r) ? r : 0;
  });
  const total = rhos.reduce((s, r) => s + r * r, 0);
  const items = drivers.map((d, i) => ({ id: d.id, label: d.label, spearman: rhos[i], share: total > 0 ? (rhos[i] * rhos[i]) / total : 0 }));
  items.sort((a, b) => b.share - a.share || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return { method: 'spearman', trials: m, items };
}

