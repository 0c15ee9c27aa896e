import { describe, expect, it } from 'vitest';
import { rangesGeometry, rangesScene } from '@/lib/core/charts/ranges';
import { cumulativeGeometry } from '@/lib/core/charts/cumulative';

describe('method ranges (worst case, RSS, Monte Carlo side by side)', () => {
  // Figures of the gearbox float example: worst case −0.07..0.51 mm, RSS 0.0988..0.3412 mm, limits 0.05..0.40 mm.
  const g = rangesGeometry({
    name: 'Gap',
    unit: 'mm',
    limits: { lower: 0.05, upper: 0.4 },
    rows: [
      { id: 'wc', label: 'Worst case', min: -0.07, max: 0.51, centre: 0.22 },
      { id: 'rss', label: 'RSS', min: 0.0988, max: 0.3412, centre: 0.22 },
      { id: 'mc', label: 'Monte Carlo, mean ± 3 s', min: 0.0780, max: 0.3410, centre: 0.2095 },
    ],
    width: 700,
  });
  const x = (v: number) => g.limits[0].x + ((v - 0.05) / 0.35) * (g.limits[1].x - g.limits[0].x);

  it('says which ranges fit inside the limits', () => {
    expect(g.bars.map((b) => b.within)).toEqual([false, true, true]);
  });

  it('hatches exactly the parts of a range beyond a limit', () => {
    const wc = g.bars[0];
    expect(wc.segments.map((s) => s.out)).toEqual([true, false, true]);
    expect(wc.segments[0].x).toBeCloseTo(x(-0.07), 6);
    expect(wc.segments[0].x + wc.segments[0].width).toBeCloseTo(x(0.05), 6);
    expect(wc.segments[2].x).toBeCloseTo(x(0.4), 6);
    expect(g.bars[1].segments).toHaveLength(1);
    expect(g.bars[1].segments[0].out).toBe(false);
  });

  it('draws every range on one scale that covers all of them and the limits', () => {
    for (const b of g.bars) for (const s of b.segments) {
      expect(s.x).toBeGreaterThanOrEqual(0);
      expect(s.x + s.width).toBeLessThanOrEqual(g.box.innerWidth + 1e-9);
    }
    expect(g.bars[2].centreX).toBeCloseTo(x(0.2095), 6);
    expect(rangesScene(g).description).toBe(
      'Predicted range of Gap by method. Worst case: \u22120.07\u00a0mm to 0.51\u00a0mm, beyond a limit. RSS: 0.0988\u00a0mm to 0.3412\u00a0mm, within the limits. Monte Carlo, mean ± 3 s: 0.078\u00a0mm to 0.341\u00a0mm, within the limits.',
    );
  });
});

describe('S-curve limit ranks', () => {
  it('adds where a budget falls on the curve to its label', () => {
    const ecdf = Array.from({ length: 101 }, (_, i) => ({ x: 500 + i, p: (i + 1) / 101 }));
    const g = cumulativeGeometry({ ecdf, name: 'Total', unit: 'kEUR', limits: { upper: 570, upperLabel: 'Budget' }, limitRanks: true, width: 600 });
    expect(g.limits[0].label.text).toBe('Budget €570\u00a0k · P70');
    const plain = cumulativeGeometry({ ecdf, name: 'Total', unit: 'kEUR', limits: { upper: 570, upperLabel: 'Budget' }, width: 600 });
    expect(plain.limits[0].label.text).toBe('Budget €570\u00a0k');
  });
});
