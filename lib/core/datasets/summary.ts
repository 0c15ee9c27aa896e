/** Summary statistics of a dataset and its process capability against a tolerance. */
import { capability, ecdfPoints, histogram, percentileSorted, type EcdfPoint, type HistogramBin } from '@/lib/core/engine/stats';

export interface DatasetSummary {
  count: number;
  mean: number;
  /** Sample standard deviation (divides by n − 1). */
  sd: number;
  min: number;
  max: number;
  /** Percentiles by the engine's pinned definition (Hyndman & Fan type 6). */
  percentiles: { p: number; value: number }[];
  histogram: HistogramBin[];
  ecdf: EcdfPoint[];
}

export const SUMMARY_PERCENTILES = [0.01, 0.05, 0.1, 0.25, 0.5, 0.75, 0.9, 0.95, 0.99];

export function summarise(values: readonly number[]): DatasetSummary {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  let mean = 0;
  let m2 = 0;
  // Welford 1962: a stable running variance.
  for (let i = 0; i < n; i++) {
    const d = sorted[i] - mean;
    mean += d / (i + 1);
    m2 += d * (sorted[i] - mean);
  }
  const bins = Math.max(5, Math.min(40, Math.ceil(Math.log2(Math.max(n, 1)) + 1)));
  return {
    count: n,
    mean,
    sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0,
    min: n ? sorted[0] : NaN,
    max: n ? sorted[n - 1] : NaN,
    percentiles: n ? SUMMARY_PERCENTILES.map((p) => ({ p, value: percentileSorted(sorted, p) })) : [],
    histogram: histogram(sorted, bins),
    ecdf: ecdfPoints(sorted, 400),
  };
}

export interface DataCapability {
  mean: number;
  sd: number;
  lower: number;
  upper: number;
  pp: number | null;
  ppk: number | null;
  /** Measured values outside the tolerance (counted, not modelled). */
  outside: number;
}

/**
 * Pp/Ppk of measured data against a contributor's tolerance nominal −minus/+plus (overall sample sigma,
 * NIST e-Handbook §6.1.6 definitions).
 */
export function dataCapability(values: readonly number[], nominal: number, plusTol: number, minusTol: number): DataCapability {
  const s = summarise(values);
  const lower = nominal - minusTol;
  const upper = nominal + plusTol;
  const c = capability(s.mean, s.sd, lower, upper);
  return { mean: s.mean, sd: s.sd, lower, upper, pp: c.pp, ppk: c.ppk, outside: values.filter((v) => v < lower || v > upper).length };
}
