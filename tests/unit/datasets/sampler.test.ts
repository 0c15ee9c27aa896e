import { describe, expect, it } from 'vitest';
import xor4096 from 'seedrandom/lib/xor4096';
import { createMarginal } from '@/lib/core/engine';
import { dataCapability, summarise } from '@/lib/core/datasets/summary';
import { empiricalChoice, fittedChoice, lawToDistribution } from '@/lib/core/datasets/use';
import { distributionSchema } from '@/lib/core/engine/schema';

describe('the empirical distribution of a dataset', () => {
  it("samples within the KS band of the data's ECDF (the engine's inverse-ECDF sampler)", () => {
    const r = xor4096('data');
    const data = Array.from({ length: 60 }, () => 20 + r.double() * 0.2 + r.double() * 0.1);
    const m = createMarginal(empiricalChoice({ id: 'd', hash: 'h', name: 'n', values: data }).distribution);
    const draws = 20000;
    const s = xor4096('draws');
    const x = Float64Array.from({ length: draws }, () => {
      const p = s.double() || 0.5;
      return m.inv(p, 1 - p);
    }).sort();
    const sorted = [...data].sort((a, b) => a - b);
    // Data ECDF at v: fraction of data ≤ v.
    const ecdf = (v: number) => {
      let c = 0;
      while (c < sorted.length && sorted[c] <= v) c++;
      return c / sorted.length;
    };
    let d = 0;
    for (let i = 0; i < draws; i++) d = Math.max(d, Math.abs((i + 1) / draws - ecdf(x[i])), Math.abs(i / draws - ecdf(x[i])));
    // The sampler interpolates between data points, so its CDF is within 1/(n − 1) of the step ECDF; sampling adds
    // at most the KS α = 0.001 band 1.95/√m (Massey 1951 asymptotics; 1.949475 in Simard & L'Ecuyer 2011, computed).
    expect(d).toBeLessThan(1 / (data.length - 1) + 1.95 / Math.sqrt(draws));
    // And it stays inside the data's range.
    expect(x[0]).toBeGreaterThanOrEqual(sorted[0]);
    expect(x[draws - 1]).toBeLessThanOrEqual(sorted[59]);
  });

  it('fitted-law choices are valid engine distributions and carry the dataset hash', () => {
    const ds = { id: 'ds1', hash: 'abc', name: 'Spacer', values: [1, 2, 3] };
    const c = fittedChoice(ds, 'weibull', { shape: 2, scale: 3 });
    expect(distributionSchema.safeParse(c.distribution).success).toBe(true);
    expect(c.source).toEqual({ datasetId: 'ds1', hash: 'abc', name: 'Spacer', method: 'weibull' });
    expect(fittedChoice(ds, 'normal', { mean: 2, sd: 1 }).stackDistribution).toEqual({ type: 'normal-fit', data: [1, 2, 3] });
    // A gamma fit feeds a model with its shape and scale.
    expect(lawToDistribution('gamma', { shape: 2, scale: 1 })).toEqual({ type: 'gamma', shape: 2, scale: 1 });
    expect(distributionSchema.safeParse(fittedChoice(ds, 'gamma', { shape: 2.5, scale: 0.4 }).distribution).success).toBe(true);
    expect(distributionSchema.safeParse(empiricalChoice(ds).distribution).success).toBe(true);
  });
});

describe('summary and capability of measured data', () => {
  it('Pp/Ppk against a tolerance: NIST e-Handbook §6.1.6 worked example (USL 20, LSL 8, μ 16, σ 2 → 1.0 and 0.6667, restated)', () => {
    // Ten values at 16 ± d with sample sd exactly 2: d = 2√(9/10).
    const d = 2 * Math.sqrt(0.9);
    const values = Array.from({ length: 10 }, (_, i) => (i % 2 ? 16 + d : 16 - d));
    const c = dataCapability(values, 14, 6, 6);
    expect(c.sd).toBeCloseTo(2, 12);
    expect(c.pp).toBeCloseTo(1.0, 12);
    expect(c.ppk).toBeCloseTo(0.6667, 4);
    expect(c.outside).toBe(0);
  });

  it('percentiles follow Hyndman–Fan type 6: NIST e-Handbook §7.2.6.2 90th percentile 95.1981 (restated)', () => {
    const s = summarise([95.1772, 95.1567, 95.1937, 95.1959, 95.1442, 95.061, 95.1591, 95.1195, 95.1065, 95.0925, 95.199, 95.1682]);
    expect(s.percentiles.find((p) => p.p === 0.9)!.value).toBeCloseTo(95.1981, 4);
    expect(s.count).toBe(12);
    expect(s.min).toBe(95.061);
    expect(s.histogram.reduce((t, b) => t + b.count, 0)).toBe(12);
  });
});

describe('demo datasets', () => {
  it('are invented, fixed, and fit: spigot lengths near 12.006 mm, cost growth right-skewed', async () => {
    const { DEMO_SPIGOT_LENGTHS, DEMO_COST_GROWTH } = await import('@/lib/dev/seed/datasets');
    expect(DEMO_SPIGOT_LENGTHS).toHaveLength(60);
    expect(DEMO_COST_GROWTH).toHaveLength(30);
    const s = summarise(DEMO_SPIGOT_LENGTHS);
    expect(Math.abs(s.mean - 12.006)).toBeLessThan(4 * (0.008 / Math.sqrt(60)));
    // Against the demo stack's 12.00 ± 0.03 mm the data give a Ppk a consultant can act on (below 1.33).
    const c = dataCapability(DEMO_SPIGOT_LENGTHS, 12, 0.03, 0.03);
    expect(c.ppk!).toBeGreaterThan(0.6);
    expect(c.ppk!).toBeLessThan(1.33);
    expect(Math.min(...DEMO_COST_GROWTH)).toBeGreaterThan(0.7);
  });
});
