import { describe, expect, it } from 'vitest';
import { argsort, averageRanks, sortedCopy } from '@/lib/core/engine/sort';
import { Stream } from '@/lib/core/engine/rng';
import {
  capability,
  ecdfPoints,
  histogram,
  orderStatisticRanks,
  percentileSorted,
  percentilesBySelection,
  PERCENTILE_DEFINITION,
  spearman,
  twoPassMoments,
  welford,
  wilsonInterval,
} from '@/lib/core/engine/stats';
import { lgamma } from '@/lib/core/engine/special';

// NIST/SEMATECH e-Handbook §7.2.6.2, percentile example data (12 values).
const NIST = [95.1772, 95.1567, 95.1937, 95.1959, 95.1442, 95.061, 95.1591, 95.1195, 95.1065, 95.0925, 95.199, 95.1682];

describe('percentiles (Hyndman & Fan type 6)', () => {
  it('reproduces the NIST e-Handbook §7.2.6.2 90th percentile', () => {
    const sorted = Float64Array.from(NIST).sort();
    // NIST e-Handbook §7.2.6.2 uses rank p(N + 1): 90th percentile 95.1981 (restated).
    expect(percentileSorted(sorted, 0.9)).toBeCloseTo(95.1981, 4);
    // Type 7 would give 95.19568 (computed): the pinned definition is not type 7.
    expect(Math.abs(percentileSorted(sorted, 0.9) - 95.19568)).toBeGreaterThan(1e-3);
    expect(PERCENTILE_DEFINITION.id).toBe('hyndman-fan-6');
    expect(PERCENTILE_DEFINITION.text).toMatch(/p\(N \+ 1\)/);
  });
  it('interpolates between ranks and clamps at the ends', () => {
    const s = Float64Array.from([1, 2, 3, 4]);
    expect(percentileSorted(s, 0.5)).toBe(2.5); // rank 2.5
    expect(percentileSorted(s, 0.1)).toBe(1); // rank 0.5 -> clamp
    expect(percentileSorted(s, 0.95)).toBe(4); // rank 4.75 -> clamp
    expect(percentileSorted(s, 0.4)).toBe(2); // rank exactly 2
  });
});

describe('running mean and variance (Welford 1962)', () => {
  it('is stable with a large offset and uses n - 1', () => {
    const base = 1e9;
    const x = Float64Array.from([4, 7, 13, 16].map((v) => base + v));
    const w = welford(x);
    expect(w.mean).toBe(base + 10);
    expect(w.variance).toBe(30); // (36 + 9 + 9 + 36) / 3
    // The naive sum-of-squares formula loses everything here.
    const naive = (x.reduce((s, v) => s + v * v, 0) - (x.reduce((s, v) => s + v, 0) ** 2) / 4) / 3;
    expect(Math.abs(naive - 30)).toBeGreaterThan(1);
  });
});

describe('two-pass moments (corrected two-pass formula, four partial sums)', () => {
  // NIST StRD univariate summary statistics, datasets NumAcc1-4 and their certified mean and standard deviation
  // (data and values from memory): 3 or 1001 values around a large offset, the hard cases for a variance.
  const alternating = (first: number, a: number, b: number) => Float64Array.from([first, ...Array.from({ length: 1000 }, (_, i) => (i % 2 ? b : a))]);
  const cases: [string, Float64Array, number, number, number][] = [
    ['NumAcc1', Float64Array.from([10000001, 10000003, 10000002]), 10000002, 1, 14],
    ['NumAcc2', alternating(1.2, 1.1, 1.3), 1.2, 0.1, 14],
    ['NumAcc3', alternating(1000000.2, 1000000.1, 1000000.3), 1000000.2, 0.1, 9],
    ['NumAcc4', alternating(10000000.2, 10000000.1, 10000000.3), 10000000.2, 0.1, 8],
  ];
  // Log relative error: the number of correct significant digits.
  const lre = (x: number, c: number) => (x === c ? 17 : -Math.log10(Math.abs(x - c) / Math.abs(c)));
  it.each(cases)('%s: the certified mean to 14 digits, the standard deviation to the digits the data allow', (_, x, mean, sd, sdDigits) => {
    const m = twoPassMoments(x);
    expect(m.n).toBe(x.length);
    expect(lre(m.mean, mean)).toBeGreaterThanOrEqual(14);
    expect(lre(Math.sqrt(m.m2 / (m.n - 1)), sd)).toBeGreaterThanOrEqual(sdDigits);
  });
  it('lengths that are not multiples of four take their last values into the sums', () => {
    for (const n of [1, 2, 3, 5, 6, 7]) {
      const x = Float64Array.from({ length: n }, (_, i) => i + 1);
      const m = twoPassMoments(x);
      expect(m.mean).toBe((n + 1) / 2);
      expect(m.m2).toBeCloseTo((n * (n * n - 1)) / 12, 12);
    }
    expect(Number.isNaN(twoPassMoments(new Float64Array(0)).mean)).toBe(true);
  });
});

describe('binomial intervals', () => {
  it('Wilson score interval', () => {
    // Wilson (1927) score interval; 10 of 100 gives 0.0552291 to 0.1743657 (computed with SciPy 1.17
    // binomtest(10, 100).proportion_ci(method='wilson')).
    const w = wilsonInterval(10, 100);
    expect(w.low).toBeCloseTo(0.05523, 4);
    expect(w.high).toBeCloseTo(0.17437, 4);
    const z = wilsonInterval(0, 1000);
    expect(z.low).toBe(0);
    expect(z.high).toBeCloseTo(0.00383, 5); // about 3.84 / n for zero events
  });

  it('order-statistic ranks give at least 95 % coverage and are the tightest such (exact check)', () => {
    // Brute-force binomial CDF in log space, independent of the implementation.
    const cdf = (k: number, n: number, p: number) => {
      let s = 0;
      for (let i = 0; i <= k; i++) s += Math.exp(lgamma(n + 1) - lgamma(i + 1) - lgamma(n - i + 1) + i * Math.log(p) + (n - i) * Math.log(1 - p));
      return s;
    };
    for (const [n, p] of [
      [50, 0.5],
      [200, 0.1],
      [1000, 0.8],
      [400, 0.99],
    ]) {
      const r = orderStatisticRanks(n, p);
      if (r.low === null || r.high === null) throw new Error('expected both ranks');
      const below = cdf(r.low - 1, n, p); // P(B < l)
      const above = 1 - cdf(r.high - 1, n, p); // P(B >= u)
      expect(below).toBeLessThanOrEqual(0.025 + 1e-12);
      expect(above).toBeLessThanOrEqual(0.025 + 1e-12);
      expect(cdf(r.low, n, p)).toBeGreaterThan(0.025); // l + 1 would break the bound
      expect(1 - cdf(r.high - 2, n, p)).toBeGreaterThan(0.025);
    }
    // Too few trials for an upper bound on P99 from 100 trials.
    expect(orderStatisticRanks(100, 0.99).high).toBeNull();
  });
});

describe('capability and histogram', () => {
  it('Pp/Ppk follow the NIST §6.1.6 definitions (worked example USL 20, LSL 8, mean 16, sd 2)', () => {
    // NIST e-Handbook §6.1.6 (restated): Cp 1.0 and Cpk 0.6667 for this process.
    const c = capability(16, 2, 8, 20);
    expect(c.pp).toBeCloseTo(1.0, 12);
    expect(c.ppk).toBeCloseTo(0.6667, 4);
    expect(capability(16, 2, null, 20).pp).toBeNull();
    expect(capability(16, 2, null, 20).ppk).toBeCloseTo(0.6667, 4);
  });
  it('bins cover [min, max] and count every value once', () => {
    const s = Float64Array.from([0, 0.5, 1, 1, 2, 3.99, 4]).sort();
    const h = histogram(s, 4);
    expect(h.map((b) => b.count)).toEqual([2, 2, 1, 2]);
    expect(h[0].x0).toBe(0);
    expect(h[3].x1).toBe(4);
  });
  it('ECDF points are true ECDF values at evenly spaced ranks', () => {
    const s = Float64Array.from({ length: 1000 }, (_, i) => i);
    const e = ecdfPoints(s, 11);
    expect(e.length).toBe(11);
    expect(e[0]).toEqual({ x: 0, p: 0.001 });
    expect(e[10]).toEqual({ x: 999, p: 1 });
    const ties = ecdfPoints(Float64Array.from([1, 1, 1, 2]), 4);
    expect(ties).toEqual([
      { x: 1, p: 0.75 },
      { x: 2, p: 1 },
    ]);
  });
});

describe('sorting and ranks', () => {
  it('radix sort equals the native sort bit for bit, including negatives, zeros and duplicates', () => {
    const s = Stream.forInput('sort', 'x');
    const x = new Float64Array(300_000);
    for (let i = 0; i < x.length; i++) x[i] = (s.uniform() - 0.4) * 10 ** Math.floor(s.uniform() * 12 - 6);
    x[5] = 0;
    x[6] = -0;
    x[7] = x[8];
    const a = sortedCopy(x);
    const b = Float64Array.from(x).sort();
    expect(Buffer.from(a.buffer).equals(Buffer.from(b.buffer))).toBe(true);
    const order = argsort(x);
    for (let i = 1; i < order.length; i++) expect(x[order[i - 1]] <= x[order[i]]).toBe(true);
  });
  it('average ranks for ties, Spearman of a monotone map is 1', () => {
    expect(Array.from(averageRanks(Float64Array.from([10, 20, 20, 5])))).toEqual([2, 3.5, 3.5, 1]);
    const a = Float64Array.from({ length: 100 }, (_, i) => Math.sin(i));
    const b = a.map((v) => Math.exp(3 * v));
    expect(spearman(a, b)).toBeCloseTo(1, 14);
    expect(spearman(a, b.map((v) => -v))).toBeCloseTo(-1, 14);
  });
});

describe('percentiles by selection', () => {
  it('equal the sorted-data percentiles exactly, with ties, negatives and tiny samples', () => {
    const s = Stream.forInput('select', 'x');
    const cases: Float64Array[] = [
      Float64Array.from({ length: 100_001 }, () => s.uniform() * 10 - 5),
      Float64Array.from({ length: 50_000 }, () => Math.floor(s.uniform() * 3)),
      new Float64Array(20_000).fill(2.5),
      Float64Array.from([3, 1, 2]),
      Float64Array.from([7]),
      Float64Array.from([4, -1]),
      // A heavy right tail: most values in the first few buckets of the range.
      Float64Array.from({ length: 200_000 }, () => Math.exp(8 * s.uniform() ** 4)),
      // Zeros of both signs around the wanted ranks, and infinite values.
      Float64Array.from({ length: 1_001 }, (_, i) => (i % 3 === 0 ? -0 : i % 3 === 1 ? 0 : i % 7 === 0 ? -1 : 1)),
      Float64Array.from({ length: 999 }, (_, i) => (i % 2 ? -0 : 0)),
      Float64Array.from({ length: 5_000 }, (_, i) => (i === 17 ? Infinity : i === 3 ? -Infinity : s.uniform())),
    ];
    const levels = [0.95, 0.01, 0.5, 0.05, 0.999, 0.25, 0.0001];
    for (const x of cases) {
      const sorted = Float64Array.from(x).sort();
      const got = percentilesBySelection(x, levels);
      const want = levels.map((p) => percentileSorted(sorted, p));
      // Object.is per level: -0 and +0 differ, NaN equals NaN.
      got.forEach((v, i) => expect(Object.is(v, want[i]), `n ${x.length}, level ${levels[i]}: ${v} vs ${want[i]}`).toBe(true));
    }
  });
});

describe('percentiles by selection on the NIST data', () => {
  it('give the NIST/SEMATECH e-Handbook §7.2.6.2 90th percentile, 95.1981', () => {
    expect(percentilesBySelection(Float64Array.from(NIST), [0.9])[0]).toBeCloseTo(95.1981, 4);
  });
});
