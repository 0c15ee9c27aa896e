import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import seedrandom from 'seedrandom';
import { binValues, spreadGeometry, spreadScene, PATTERN_OUT_BAR, PATTERN_OUT_ZONE, type HistogramBin } from '@/lib/core/charts/spread';
import type { SceneNode } from '@/lib/core/charts/scene';

function normals(n: number, seed: string, mean = 0, sd = 1): number[] {
  const rng = seedrandom(seed);
  const out: number[] = [];
  while (out.length < n) {
    // Box & Muller (1958), u1 in (0, 1].
    const u1 = 1 - rng();
    const u2 = rng();
    const r = Math.sqrt(-2 * Math.log(u1));
    out.push(mean + sd * r * Math.cos(2 * Math.PI * u2), mean + sd * r * Math.sin(2 * Math.PI * u2));
  }
  return out.slice(0, n);
}

function flatten(nodes: SceneNode[]): SceneNode[] {
  return nodes.flatMap((n) => (n.type === 'group' ? flatten(n.children) : [n]));
}

describe('binValues', () => {
  it('bins cover every value and count each once, with or without limits to align to', () => {
    fc.assert(
      fc.property(
        // Doubles (denormals included), small integers (ties) and limits anywhere, even far from the data.
        fc.array(fc.oneof(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: -3, max: 3 })), { minLength: 1, maxLength: 300 }),
        fc.integer({ min: 1, max: 50 }),
        fc.option(fc.double({ min: -1e6, max: 1e6, noNaN: true })),
        fc.option(fc.double({ min: 0, max: 1e6, noNaN: true })),
        (values, count, lower, width) => {
          const limits = lower === null ? undefined : { lower, upper: width === null ? undefined : lower + width };
          const bins = binValues(values, { count, limits });
          expect(bins.reduce((s, b) => s + b.count, 0)).toBe(values.length);
          expect(bins[0].x0).toBeLessThanOrEqual(Math.min(...values));
          expect(bins[bins.length - 1].x1).toBeGreaterThanOrEqual(Math.max(...values));
          expect(bins.length).toBeLessThanOrEqual(2 * count + 2);
          for (let i = 1; i < bins.length; i++) expect(bins[i].x0).toBe(bins[i - 1].x1);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('puts both limits on bin edges, so no bar straddles a limit', () => {
    const values = normals(5000, 'edges', 0.15, 0.03);
    const bins = binValues(values, { count: 40, limits: { lower: 0.08, upper: 0.22 } });
    expect(bins.reduce((s, b) => s + b.count, 0)).toBe(5000);
    const edges = bins.flatMap((b) => [b.x0, b.x1]);
    expect(edges.some((e) => Math.abs(e - 0.08) < 1e-12)).toBe(true);
    expect(edges.some((e) => Math.abs(e - 0.22) < 1e-12)).toBe(true);
    // The count below the limit read off the bins equals the exact count.
    const exact = values.filter((v) => v < 0.08).length;
    const fromBins = bins.filter((b) => b.x1 <= 0.08 + 1e-12).reduce((s, b) => s + b.count, 0);
    expect(fromBins).toBe(exact);
  });

  it('skips non-finite values and handles a constant output', () => {
    expect(binValues([NaN, Infinity, 3, 3, 3])).toEqual([{ x0: 3, x1: 3, count: 3 }]);
    expect(binValues([])).toEqual([]);
  });
});

describe('spreadGeometry', () => {
  const values = normals(20000, 'spread', 0.15, 0.03);
  const limits = { lower: 0.08, upper: 0.22 };
  const bins = binValues(values, { count: 30 });
  const g = spreadGeometry({ bins, name: 'Gap', unit: 'mm', limits, width: 720 });
  const x = (v: number) => ((v - g.xDomain[0]) / (g.xDomain[1] - g.xDomain[0])) * g.box.innerWidth;

  it('maps the limits to the right pixels and keeps them inside the plot', () => {
    expect(g.limits.map((l) => l.side)).toEqual(['lower', 'upper']);
    expect(g.limits[0].x).toBeCloseTo(x(0.08), 9);
    expect(g.limits[1].x).toBeCloseTo(x(0.22), 9);
    for (const l of g.limits) {
      expect(l.x).toBeGreaterThan(0);
      expect(l.x).toBeLessThan(g.box.innerWidth);
    }
    expect(g.xDomain[0]).toBeLessThanOrEqual(bins[0].x0);
    expect(g.xDomain[1]).toBeGreaterThanOrEqual(bins[bins.length - 1].x1);
  });

  it('extends the x range to a limit far outside the data', () => {
    const far = spreadGeometry({ bins, name: 'Gap', unit: 'mm', limits: { upper: 0.6 }, width: 500 });
    expect(far.xDomain[1]).toBeGreaterThan(0.6);
    expect(far.limits[0].x).toBeLessThan(far.box.innerWidth);
  });

  it('hatches exactly the parts of bars beyond a limit', () => {
    for (const b of g.bars) {
      for (const s of b.segments) {
        const v0 = g.xDomain[0] + ((s.x - 0.5) / g.box.innerWidth) * (g.xDomain[1] - g.xDomain[0]);
        const v1 = g.xDomain[0] + ((s.x + s.width + 0.5) / g.box.innerWidth) * (g.xDomain[1] - g.xDomain[0]);
        const mid = (v0 + v1) / 2;
        expect(s.out).toBe(mid < limits.lower || mid > limits.upper);
      }
      // A bar cut by a limit is split there.
      if (b.x0 < limits.lower && b.x1 > limits.lower && b.count > 0) {
        expect(b.segments.length).toBe(2);
        expect(b.segments[0].x + b.segments[0].width).toBeCloseTo(x(limits.lower), 6);
      }
    }
    expect(g.bars.some((b) => b.segments.some((s) => s.out))).toBe(true);
    expect(g.bars.some((b) => b.segments.some((s) => !s.out))).toBe(true);
  });

  it('bar heights are proportional to counts and the y axis covers the tallest', () => {
    const tallest = g.bars.reduce((a, b) => (b.count > a.count ? b : a));
    expect(tallest.fraction).toBeLessThanOrEqual(g.yMax);
    const ratio = tallest.segments[0].height / tallest.fraction;
    for (const b of g.bars) for (const s of b.segments) expect(s.height).toBeCloseTo(b.fraction * ratio, 6);
    expect(g.total).toBe(20000);
  });

  it('estimates the share beyond the limits close to the exact count', () => {
    const exact = values.filter((v) => v < 0.08 || v > 0.22).length / values.length;
    // Uniform-within-bin estimate: within a few tenths of a percent here (bins of about 0.008 mm).
    expect(Math.abs(g.outShare.below + g.outShare.above - exact)).toBeLessThan(0.004);
  });

  it('marks out-of-spec areas with a pattern as well as colour', () => {
    const scene = spreadScene(g);
    const nodes = flatten(scene.nodes);
    const zones = nodes.filter((n) => n.type === 'rect' && typeof n.fill === 'object' && n.fill.pattern === PATTERN_OUT_ZONE);
    const outBars = nodes.filter((n) => n.type === 'rect' && typeof n.fill === 'object' && n.fill.pattern === PATTERN_OUT_BAR);
    expect(zones).toHaveLength(2);
    expect(outBars.length).toBeGreaterThan(0);
    expect(scene.patterns.map((p) => p.id).sort()).toEqual([PATTERN_OUT_BAR, PATTERN_OUT_ZONE].sort());
    // Limit lines are dashed (a second non-colour cue).
    const limitLines = nodes.filter((n) => n.type === 'line' && n.key?.startsWith('lim-'));
    expect(limitLines).toHaveLength(2);
    for (const l of limitLines) expect(l.type === 'line' && l.dash).toBeTruthy();
    expect(scene.description).toMatch(/Lower limit 0\.08/);
    expect(scene.description).toMatch(/beyond the limits/);
    // Exact shares from the engine replace the estimate, in ppm when small.
    const exact = spreadGeometry({ bins, name: 'Gap', unit: 'mm', limits, width: 720, outShare: { below: 0.00004, above: 0.00002 } });
    expect(exact.outShare).toEqual({ below: 0.00004, above: 0.00002 });
    expect(spreadScene(exact).description).toMatch(/60(\.0)?\u00a0ppm of trials fall beyond the limits \(hatched\)\.$/);
  });

  it('places label rows so limit labels never overlap', () => {
    const narrow = spreadGeometry({ bins, name: 'Gap', unit: 'mm', limits: { lower: 0.149, upper: 0.151 }, markers: [{ value: 0.15, label: 'Mean 0.150 mm', kind: 'mean' }], width: 360 });
    const labels = [...narrow.limits.map((l) => l.label), ...narrow.markers.map((m) => m.label)];
    for (let i = 0; i < labels.length; i++)
      for (let j = i + 1; j < labels.length; j++) {
        const a = labels[i];
        const b = labels[j];
        const overlap = a.row === b.row && a.left < b.left + b.width && b.left < a.left + a.width;
        expect(overlap).toBe(false);
      }
    for (const l of labels) {
      expect(l.left).toBeGreaterThanOrEqual(0);
      expect(l.left + l.width).toBeLessThanOrEqual(narrow.box.innerWidth);
    }
  });

  it('draws nothing misleading for empty input', () => {
    const empty = spreadGeometry({ bins: [] as HistogramBin[], name: 'Gap', unit: 'mm', width: 400 });
    expect(empty.bars).toEqual([]);
    expect(spreadScene(empty).description).toMatch(/No results/);
  });
});

describe('the noun of a histogram', () => {
  it('says trials for a simulation and takes the caller’s noun for measured data', async () => {
    const { describeSpread } = await import('@/lib/core/charts/spread');
    const bins = binValues(normals(400, 'noun', 12, 0.02));
    const sim = spreadGeometry({ bins, name: 'Gap', unit: 'mm', width: 600, limits: { lower: 11.97 } });
    expect(sim.yAxis.title).toBe('Share of trials');
    expect(describeSpread(sim)).toMatch(/% of trials\./);
    const data = spreadGeometry({ bins, name: 'Bore', unit: 'mm', width: 600, noun: 'measurements', limits: { lower: 11.97 } });
    expect(data.yAxis.title).toBe('Share of measurements');
    expect(describeSpread(data)).toMatch(/% of measurements\./);
    expect(describeSpread(data)).toMatch(/of measurements fall beyond the limit/);
    expect(describeSpread(data)).not.toMatch(/trials/);
  });
});
