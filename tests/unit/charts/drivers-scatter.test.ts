import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { driversGeometry, rankDrivers, driversScene } from '@/lib/core/charts/drivers';
import { downsampleIndices, scatterGeometry, scatterGroups } from '@/lib/core/charts/scatter';

const drivers = [
  { id: 'c', label: 'Circlip groove', share: 0.06, correlation: -0.2 },
  { id: 'a', label: 'Housing bore depth', share: 0.41, correlation: 0.6 },
  { id: 'b', label: 'Shaft shoulder', share: 0.33, correlation: -0.52 },
  { id: 'd', label: 'Spacer ring', share: 0.2, correlation: 0.4 },
];

describe('drivers', () => {
  it('ranks by share of variance, largest first', () => {
    expect(rankDrivers(drivers).map((d) => d.id)).toEqual(['a', 'b', 'd', 'c']);
  });

  it('breaks ties by |correlation| and then by label, and drops non-finite shares', () => {
    const tied = [
      { id: 'x', label: 'Beta', share: 0.5, correlation: 0.3 },
      { id: 'y', label: 'Alpha', share: 0.5, correlation: 0.3 },
      { id: 'z', label: 'Gamma', share: 0.5, correlation: -0.7 },
      { id: 'n', label: 'Broken', share: NaN, correlation: 0 },
    ];
    expect(rankDrivers(tied).map((d) => d.id)).toEqual(['z', 'y', 'x']);
  });

  it('draws bars in rank order with widths proportional to share', () => {
    const g = driversGeometry({ drivers, name: 'Gap', width: 720 });
    expect(g.layout).toBe('side');
    expect(g.bars.map((b) => b.id)).toEqual(['a', 'b', 'd', 'c']);
    expect(g.bars.map((b) => b.rank)).toEqual([1, 2, 3, 4]);
    const k = g.bars[0].barWidth / g.bars[0].share;
    for (const b of g.bars) expect(b.barWidth).toBeCloseTo(b.share * k, 6);
    for (let i = 1; i < g.bars.length; i++) expect(g.bars[i].y).toBeGreaterThan(g.bars[i - 1].y);
    expect(g.bars[0].barWidth).toBeLessThanOrEqual(g.box.innerWidth);
  });

  it('shows direction by arrow text, not by colour alone', () => {
    const g = driversGeometry({ drivers, name: 'Gap', width: 720 });
    expect(g.bars.find((b) => b.id === 'a')!.valueText).toBe('41\u00a0% \u2191');
    expect(g.bars.find((b) => b.id === 'b')!.valueText).toBe('33\u00a0% \u2193');
    expect(driversScene(g).description).toMatch(/Housing bore depth 41\u00a0% \(raises it\); Shaft shoulder 33\u00a0% \(lowers it\)/);
  });

  it('stacks labels above bars on narrow screens and shortens long labels', () => {
    const long = [...drivers, { id: 'e', label: 'A very long contributor name that will not fit in a narrow column at all', share: 0.01, correlation: 0.1 }];
    const g = driversGeometry({ drivers: long, name: 'Gap', width: 360 });
    expect(g.layout).toBe('stacked');
    const e = g.bars.find((b) => b.id === 'e')!;
    expect(e.shownLabel.endsWith('…')).toBe(true);
    expect(e.shownLabel.length).toBeLessThan(e.label.length);
  });

  it('folds the tail into one "Other" bar', () => {
    const many = Array.from({ length: 12 }, (_, i) => ({ id: `i${i}`, label: `Item ${i}`, share: (12 - i) / 78, correlation: 0.1 }));
    const g = driversGeometry({ drivers: many, name: 'Total', width: 600, maxBars: 5 });
    expect(g.bars).toHaveLength(5);
    const other = g.bars[4];
    expect(other.other).toBe(true);
    expect(other.label).toBe('Other (8 inputs)');
    expect(other.share).toBeCloseTo((8 + 7 + 6 + 5 + 4 + 3 + 2 + 1) / 78, 12);
  });
});

describe('scatter', () => {
  it('downsamples deterministically to evenly spread, distinct trials', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 50000 }), fc.integer({ min: 1, max: 3000 }), (n, max) => {
        const idx = downsampleIndices(n, max);
        expect(idx.length).toBe(Math.min(n, max));
        let increasing = true;
        for (let i = 1; i < idx.length; i++) if (!(idx[i] > idx[i - 1])) increasing = false;
        expect(increasing).toBe(true);
        if (idx.length) {
          expect(idx[0]).toBe(0);
          expect(idx[idx.length - 1]).toBeLessThan(n);
        }
        expect(downsampleIndices(n, max)).toEqual(idx);
      }),
      { numRuns: 200 },
    );
  });

  it('maps points into the plot and marks those beyond the limits', () => {
    const n = 5000;
    const xs = Float64Array.from({ length: n }, (_, i) => i / n);
    const ys = Float64Array.from(xs, (v) => 2 * v + 1);
    const g = scatterGeometry({ x: xs, y: ys, xName: 'Width', xUnit: 'mm', yName: 'Gap', yUnit: 'mm', limits: { lower: 1.2, upper: 2.6 }, width: 500, maxPoints: 400 });
    expect(g.drawn).toBe(400);
    expect(g.total).toBe(n);
    for (const p of g.points) {
      expect(p.px).toBeGreaterThanOrEqual(0);
      expect(p.px).toBeLessThanOrEqual(g.box.innerWidth);
      expect(p.py).toBeGreaterThanOrEqual(0);
      expect(p.py).toBeLessThanOrEqual(g.box.innerHeight);
      expect(p.out).toBe(p.yv < 1.2 || p.yv > 2.6);
    }
    // The line y = 2x + 1 rises: larger x is drawn higher up.
    const first = g.points[0];
    const last = g.points[g.points.length - 1];
    expect(last.px).toBeGreaterThan(first.px);
    expect(last.py).toBeLessThan(first.py);
    const lower = g.limitLines.find((l) => l.side === 'lower')!;
    const upper = g.limitLines.find((l) => l.side === 'upper')!;
    expect(lower.y).toBeGreaterThan(upper.y);
    expect(g.outRegions).toHaveLength(2);
  });

  it('groups the input into equal-count bands for the table view', () => {
    const xs = Array.from({ length: 1000 }, (_, i) => (i * 7919) % 1000);
    const ys = xs.map((v) => (v < 100 ? -1 : v));
    const groups = scatterGroups(xs, ys, { lower: 0 }, 10);
    expect(groups).toHaveLength(10);
    expect(groups.reduce((s, g) => s + g.trials, 0)).toBe(1000);
    expect(groups[0].from).toBe(0);
    expect(groups[0].to).toBe(99);
    expect(groups[0].outShare).toBe(1);
    expect(groups[1].outShare).toBe(0);
    expect(groups[9].meanY).toBeCloseTo((900 + 999) / 2, 9);
  });
});

describe('scatter groups from a kept order', () => {
  it('equal the groups of a plain stable sort, with ties and non-finite values, and again after the output changes', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: -20, max: 20 }), fc.integer({ min: -50, max: 50 })), { minLength: 1, maxLength: 300 }), (pairs) => {
        const xs = Float64Array.from(pairs, ([x], i) => (i % 17 === 5 ? NaN : x / 4));
        const naive = (ys: Float64Array) => {
          const order = [...xs.keys()].filter((i) => Number.isFinite(xs[i]) && Number.isFinite(ys[i])).sort((a, b) => xs[a] - xs[b]);
          return order.map((i) => [xs[i], ys[i]]);
        };
        for (const shift of [0, 3]) {
          const ys = Float64Array.from(pairs, ([, y], i) => (i % 13 === 7 ? Infinity : y + shift));
          const got = scatterGroups(xs, ys, { upper: 10 }, 4);
          const rows = naive(ys);
          const g = Math.max(1, Math.min(4, rows.length));
          const want = [];
          for (let k = 0; k < g; k++) {
            const s = Math.floor((k * rows.length) / g);
            const e = Math.floor(((k + 1) * rows.length) / g);
            if (e <= s) continue;
            const part = rows.slice(s, e);
            want.push({ from: part[0][0], to: part[part.length - 1][0], trials: e - s, meanY: part.reduce((t, r) => t + r[1], 0) / (e - s), outShare: part.filter((r) => r[1] > 10).length / (e - s) });
          }
          expect(got).toEqual(want);
        }
      }),
    );
  });
});
