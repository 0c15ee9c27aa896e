import { describe, expect, it } from 'vitest';
import { evaluateCost, evaluateStack } from '@/lib/core/engine/analytic';
import { exampleCostRange, exampleLinearStack } from '@/lib/core/engine/examples';
import { validateModel, type CostRangeModel, type LinearStackModel } from '@/lib/core/engine/schema';
import { runModelSync } from '@/lib/core/engine/simulate';

/**
 * Worked stack-up from metricmech.com, "Tolerance stack-up: a worked example using worst-case
 * and RSS" (seen: the four dimensions A 40.00 +/-0.10, B 25.00 +/-0.05, C 2.00 +/-0.03,
 * D 10.00 +/-0.05, the loop A - B - C - D and the nominal gap 3.00 mm). The worst case
 * +/-0.23 and the RSS +/-0.1261 below are computed here from those inputs.
 */
const publishedStack = {
  schema: 'stochos.model/1',
  template: 'linear-stack',
  title: 'Retaining ring gap (published worked example)',
  unit: 'mm',
  settings: { trials: 200_000, seed: 'published-stack', normalMethod: 'ziggurat' },
  contributors: [
    { id: 'a', name: 'A: housing bore depth', nominal: 40, plusTol: 0.1, minusTol: 0.1, direction: 1, distribution: { type: 'normal', k: 3 } },
    { id: 'b', name: 'B: spacer length', nominal: 25, plusTol: 0.05, minusTol: 0.05, direction: -1, distribution: { type: 'normal', k: 3 } },
    { id: 'c', name: 'C: retaining ring thickness', nominal: 2, plusTol: 0.03, minusTol: 0.03, direction: -1, distribution: { type: 'normal', k: 3 } },
    { id: 'd', name: 'D: shoulder height', nominal: 10, plusTol: 0.05, minusTol: 0.05, direction: -1, distribution: { type: 'normal', k: 3 } },
  ],
  // Limits at the RSS band, so the fraction outside is the two-sided 3-sigma fallout.
  limits: { lower: 3 - Math.sqrt(0.0159), upper: 3 + Math.sqrt(0.0159) },
};

describe('linear stack', () => {
  it('worst case and RSS of the published worked example', () => {
    const v = validateModel(publishedStack);
    if (!v.ok) throw new Error(JSON.stringify(v.issues));
    const a = evaluateStack(v.model as LinearStackModel);
    expect(a.nominalGap).toBeCloseTo(3.0, 12); // seen
    expect(a.worstCase.min).toBeCloseTo(2.77, 12); // computed: 3.00 - 0.23
    expect(a.worstCase.max).toBeCloseTo(3.23, 12);
    expect(a.rss.halfWidth).toBeCloseTo(0.1260952, 7); // computed: sqrt(0.1^2 + 0.05^2 + 0.03^2 + 0.05^2)
    expect(a.rss.mean).toBeCloseTo(3.0, 12);
    // Normal with the tolerance at 3 sigma: sigma_gap = RSS / 3; shares sigma_i^2 / sum.
    expect(a.statistical.sd).toBeCloseTo(0.1260952 / 3, 7);
    expect(a.contributors.map((c) => +c.varianceShare.toFixed(4))).toEqual([0.6289, 0.1572, 0.0566, 0.1572]);
    // The fallout outside +/-3 sigma is 2699.796 ppm (check-values.md, computed).
    expect(a.statistical.ppmNormal).toBeCloseTo(2699.796, 2);
  });

  it('Monte Carlo agrees with the analytic stack within sampling error', () => {
    const r = runModelSync(publishedStack);
    const s = r.stack!;
    const n = 200_000;
    const sd = 0.1260952 / 3;
    expect(Math.abs((s.monteCarlo.mean as number) - 3)).toBeLessThan((5 * sd) / Math.sqrt(n));
    expect(Math.abs((s.monteCarlo.sd as number) / sd - 1)).toBeLessThan(5 / Math.sqrt(2 * n));
    const p = 2699.796e-6;
    expect(Math.abs((s.monteCarlo.ppmObserved as number) / 1e6 - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    expect(s.monteCarlo.pp).toBeCloseTo(1, 1); // limits at +/-3 sigma: Pp = 1 by construction
    // Ranked contributors. The Monte Carlo share is a normalised squared rank correlation: for normal
    // contributors of a normal sum the Pearson correlation is sqrt(share) and the rank correlation
    // (6/pi) asin(rho/2) (check-values.md, formula from memory), which fixes the expected MC share.
    expect(s.contributors.map((c) => c.id)).toEqual(['a', 'b', 'd', 'c']);
    const rs = s.contributors.map((c) => ((6 / Math.PI) * Math.asin(Math.sqrt(c.analyticShare) / 2)) ** 2);
    const total = rs.reduce((x, y) => x + y, 0);
    // Drivers use the first 25,000 trials; a share's standard error is then about 0.006, so allow five.
    expect(r.outputs[0].drivers.trials).toBe(25_000);
    s.contributors.forEach((c, i) => expect(Math.abs(c.monteCarloShare - rs[i] / total)).toBeLessThan(0.03));
  });

  it('the gearbox example: worst case fails, RSS passes, Monte Carlo reports the rest', () => {
    const v = validateModel(exampleLinearStack);
    if (!v.ok) throw new Error('invalid');
    const a = evaluateStack(v.model as LinearStackModel);
    expect(a.worstCaseWithinLimits).toBe(false);
    expect(a.rssWithinLimits).toBe(true);
    const r = runModelSync(exampleLinearStack);
    expect(r.stack!.analytic).toEqual(a);
    expect(r.outputs[0].limits!.pp).not.toBeNull();
  });
});

/**
 * Cost range after the two-item example in K. Melchiors, "Estimating Risk-Based Cost and
 * Contingency", Pharmaceutical Manufacturing, 5 Sep 2012 (seen: item A $70,000 to $85,000,
 * certain; item B $10,000 to $15,000 with an 80 % chance). The article gives no law for the
 * ranges; uniform is this test's assumption. Percentiles of A + 1{B occurs} B were computed
 * with mpmath 1.3.0 (numerical integration): P50 88.125, P80 93.75, P90 95.66987;
 * P(total > 95) = 0.133333; mean 87.5 (thousand dollars).
 */
const publishedCost = {
  schema: 'stochos.model/1',
  template: 'cost-range',
  title: 'Two-item capital budget (published example)',
  currency: 'k$',
  settings: { trials: 200_000, seed: 'published-cost' },
  items: [{ id: 'item_a', name: 'Item A', low: 70, mostLikely: 77.5, high: 85, distribution: 'uniform' }],
  riskEvents: [{ id: 'item_b', name: 'Item B', probability: 0.8, impact: { low: 10, mostLikely: 12.5, high: 15, distribution: 'uniform' } }],
  budget: 95,
  confidence: 0.8,
};

describe('cost range', () => {
  const r = runModelSync(publishedCost);
  const n = 200_000;

  it('analytic expectations', () => {
    const v = validateModel(publishedCost);
    if (!v.ok) throw new Error('invalid');
    const a = evaluateCost(v.model as CostRangeModel);
    expect(a.expectedTotal).toBeCloseTo(87.5, 12);
    expect(a.baseEstimate).toBe(77.5);
    expect(a.risks[0].expectedValue).toBeCloseTo(10, 12);
  });

  it('S-curve percentiles, contingency and budget overrun match the computed distribution', () => {
    const c = r.cost!;
    const covers = (pe: { ci: { low: number; high: number } | null }, v: number) => {
      expect(pe.ci).not.toBeNull();
      expect(pe.ci!.low).toBeLessThanOrEqual(v + 0.05);
      expect(pe.ci!.high).toBeGreaterThanOrEqual(v - 0.05);
    };
    const pct = (p: number) => r.outputs[0].percentiles.find((x) => x.p === p)!;
    covers(pct(0.5), 88.125);
    covers(pct(0.8), 93.75);
    covers(pct(0.9), 95.66987);
    expect(c.p80).toBe(pct(0.8).value);
    expect(c.contingency).toBeCloseTo(c.p80 - 77.5, 12);
    expect(Math.abs(c.contingency - 16.25)).toBeLessThan(0.1);
    const pOver = 0.1333333;
    expect(Math.abs(c.exceedBudget!.p - pOver)).toBeLessThan(5 * Math.sqrt((pOver * (1 - pOver)) / n));
    expect(c.exceedBudget!.ci.low).toBeLessThan(c.exceedBudget!.p);
    // Sum of most-likely values (77.5) sits at 0.2 * 0.5 = 0.1 on the S-curve (B absent, A below its midpoint).
    expect(Math.abs(c.sumMostLikelyRank - 0.1)).toBeLessThan(5 * Math.sqrt(0.09 / n));
    expect(r.outputs[0].drivers.items.map((d) => d.id).sort()).toEqual(['item_a', 'item_b']);
  });

  it('the footbridge example: P80 above the base, contingency and drivers reported', () => {
    const e = runModelSync(exampleCostRange);
    const c = e.cost!;
    expect(c.analytic.baseEstimate).toBe(522);
    expect(c.p10).toBeLessThan(c.p50);
    expect(c.p50).toBeLessThan(c.p80);
    expect(c.p80).toBeLessThan(c.p90);
    expect(c.atConfidence.p).toBe(0.8);
    expect(c.contingency).toBeGreaterThan(0);
    // The most-likely sum is well below the median: three-point ranges are skewed high and risks add.
    expect(c.sumMostLikelyRank).toBeLessThan(0.2);
    expect(e.outputs[0].drivers.items).toHaveLength(14);
    expect(e.outputs[0].drivers.items.reduce((s, d) => s + d.share, 0)).toBeCloseTo(1, 12);
    // The simulated mean agrees with the analytic expectation (correlation changes only the spread).
    expect(Math.abs((e.outputs[0].mean as number) - c.analytic.expectedTotal)).toBeLessThan((5 * (e.outputs[0].sd as number)) / Math.sqrt(20_000));
  });
});
