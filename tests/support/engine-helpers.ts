/** Shared helpers for the engine tests (no Node-only imports: also bundled for the browser). */
import type { RunResult } from '@/lib/core/engine/simulate';

/**
 * One-sample Kolmogorov-Smirnov statistic D = sup |F_n(x) - F(x)| of samples against a
 * fully specified CDF.
 */
export function ksStatistic(samples: Float64Array, cdf: (x: number) => number): number {
  const x = Float64Array.from(samples).sort();
  const n = x.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(x[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}

/**
 * Critical value of D at alpha = 0.001 for large n: 1.949475 / sqrt(n)
 * (asymptotic Kolmogorov distribution; the constant is listed in
 * /work/shared/reference/check-values.md as computed, Simard & L'Ecuyer 2011).
 */
export function ksCritical001(n: number): number {
  return 1.949475 / Math.sqrt(n);
}

export function mean(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s / a.length;
}

export function variance(a: ArrayLike<number>): number {
  const m = mean(a);
  let s = 0;
  for (let i = 0; i < a.length; i++) s += (a[i] - m) ** 2;
  return s / (a.length - 1);
}

/** 64-bit FNV-1a over the bytes of typed arrays, as hex (compares sample columns bit for bit). */
export function hashArrays(arrays: ArrayLike<number>[] | Float64Array[]): string {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193 ^ 0x5bd1e995;
  for (const a of arrays as Float64Array[]) {
    const bytes = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
    for (let i = 0; i < bytes.length; i++) {
      h1 = Math.imul(h1 ^ bytes[i], 0x01000193) >>> 0;
      h2 = Math.imul(h2 ^ bytes[i], 0x5bd1e995) >>> 0;
    }
  }
  return h1.toString(16).padStart(8, '0') + h2.toString(16).padStart(8, '0');
}

export interface Fingerprint {
  /** Every reproducible statistic, as JSON (timing and samples left out). */
  stats: string;
  /** Hash of every sample column. */
  samples: string;
  sampleKinds: string[];
  /** Hash of each sample column by name (to locate a difference). */
  columns: Record<string, string>;
}

/** What must agree bit for bit between two runs of the same model, dials, seed and trials. */
export function fingerprint(r: RunResult): Fingerprint {
  const rest: Partial<RunResult> = { ...r };
  delete rest.timing;
  delete rest.samples;
  const samples = r.samples;
  const cols = samples
    ? [...Object.keys(samples.outputs).sort().map((k) => samples.outputs[k]), ...Object.keys(samples.inputs).sort().map((k) => samples.inputs[k])]
    : [];
  const columns: Record<string, string> = {};
  if (samples) {
    for (const [k, v] of Object.entries(samples.outputs)) columns[`output:${k}`] = hashArrays([v]);
    for (const [k, v] of Object.entries(samples.inputs)) columns[`input:${k}`] = hashArrays([v]);
  }
  return { stats: JSON.stringify(rest), samples: hashArrays(cols), sampleKinds: cols.map((c) => Object.prototype.toString.call(c)), columns };
}
