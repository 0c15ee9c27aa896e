import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import seedrandom from 'seedrandom';
import {
  cumulativeGeometry,
  cumulativeScene,
  ecdfAt,
  quantileAt,
  readoutAtPixel,
  readoutAtProbability,
  readoutAtValue,
  stepReadout,
  thinEcdf,
  type CurvePoint,
  type EcdfPoint,
} from '@/lib/core/charts/cumulative';

/** ECDF points of a sample the way the engine reports them: p = rank / n at evenly spaced ranks. */
function ecdfOf(values: number[], maxPoints = 201): EcdfPoint[] {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  const out: EcdfPoint[] = [];
  for (let i = 0; i < maxPoints; i++) {
    let r = Math.round((i * (n - 1)) / (maxPoints - 1));
    // Like the engine: step to the last of a run of equal values, so p is the ECDF there.
    while (r + 1 < n && s[r + 1] === s[r]) r++;
    if (out.length && out[out.length - 1].x === s[r]) continue;
    out.push({ x: s[r], p: (r + 1) / n });
  }
  return out;
}

/** Type 6 percentile (Hyndman & Fan 1996), as pinned by the engine. */
function type6(sorted: number[], p: number): number {
  const n = sorted.length;
  const h = p * (n + 1);
  if (h <= 1) return sorted[0];
  if (h >= n) return sorted[n - 1];
  const j = Math.floor(h);
  return sorted[j - 1] + (h - j) * (sorted[j] - sorted[j - 1]);
}

const rng = seedrandom('cost');
const costs = Array.from({ length: 20000 }, () => 10e6 + 2e6 * (rng() + rng() + rng()) / 3 + (rng() < 0.3 ? 1.5e6 * rng() : 0));
const sorted = [...costs].sort((a, b) => a - b);
const ecdf = ecdfOf(costs);
const percentiles = [0.1, 0.5, 0.8, 0.9].map((p) => ({ p, value: type6(sorted, p) }));
const g = cumulativeGeometry({ ecdf, name: 'Total cost', unit: 'EUR', percentiles, markers: [{ value: 11.4e6, label: 'Budget', kind: 'budget' }], width: 720 });

function pathPoints(d: string): Array<[number, number]> {
  return [...d.matchAll(/[ML]([-\d.]+),([-\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

describe('S-curve path', () => {
  it('is monotone: x increases and the curve never falls', () => {
    const pts = pathPoints(g.path);
    expect(pts.length).toBeGreaterThan(20);
    for (let i = 1; i < pts.length; i++) {
      expect(pts[i][0]).toBeGreaterThan(pts[i - 1][0]);
      // SVG y grows downwards: a rising share means a y that never increases.
      expect(pts[i][1]).toBeLessThanOrEqual(pts[i - 1][1]);
    }
  });

  it('spans the plot: bottom-left near 0 %, top-right at 100 %', () => {
    const pts = pathPoints(g.path);
    expect(pts[pts.length - 1][1]).toBeCloseTo(0, 1);
    expect(pts[0][1]).toBeGreaterThan(g.box.innerHeight * 0.99);
    for (const [x] of pts) {
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThanOrEqual(g.box.innerWidth);
    }
  });

  it('thinning keeps the curve a non-decreasing function with the end points', () => {
    fc.assert(
      // Doubles (denormals included) and small integers (many ties).
      fc.property(fc.array(fc.oneof(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.integer({ min: -3, max: 3 })), { minLength: 2, maxLength: 300 }), fc.integer({ min: 50, max: 1200 }), (vals, px) => {
        const e = ecdfOf(vals, 101);
        const t = thinEcdf(e, Math.max(...vals) - Math.min(...vals) || 1, px);
        for (let i = 1; i < t.length; i++) {
          expect(t[i].value).toBeGreaterThan(t[i - 1].value);
          expect(t[i].p).toBeGreaterThanOrEqual(t[i - 1].p);
        }
        expect(t[0].value).toBe(e[0].x);
        expect(t[t.length - 1].value).toBe(e[e.length - 1].x);
        expect(t[t.length - 1].p).toBe(1);
      }),
      { numRuns: 300 },
    );
  });
});

describe('percentile markers', () => {
  it('sit at the x of the engine value and the y of their level', () => {
    const x = (v: number) => ((v - g.xDomain[0]) / (g.xDomain[1] - g.xDomain[0])) * g.box.innerWidth;
    expect(g.percentiles.map((m) => m.name)).toEqual(['P10', 'P50', 'P80', 'P90']);
    for (const m of g.percentiles) {
      const want = percentiles.find((q) => q.p === m.p)!.value;
      expect(m.value).toBe(want);
      expect(m.x).toBeCloseTo(x(want), 9);
      expect(m.y).toBeCloseTo((1 - m.p) * g.box.innerHeight, 9);
    }
  });

  it('lie on the drawn curve (within the gap between type-6 percentiles and the ECDF)', () => {
    for (const m of g.percentiles) {
      // The ECDF at the type-6 percentile differs from p by at most about 1/n plus one ECDF step (201 points).
      expect(Math.abs(ecdfAt(g.points, m.value) - m.p)).toBeLessThan(0.006);
    }
  });

  it('labels never run into each other vertically', () => {
    const ys = g.percentiles.map((m) => m.label.y);
    for (let i = 1; i < ys.length; i++) expect(ys[i - 1] - ys[i]).toBeGreaterThanOrEqual(13 - 1e-9);
  });

  it('place the budget where it meets the curve', () => {
    const r = g.references[0];
    const exact = sorted.filter((v) => v <= 11.4e6).length / sorted.length;
    expect(Math.abs(r.p - exact)).toBeLessThan(0.006);
    expect(r.label.text).toMatch(/^Budget €11\.4\u00a0M · P\d+$/);
    expect(cumulativeScene(g).description).toMatch(/P80 €/);
  });
});

describe('readout lookup', () => {
  const pts: CurvePoint[] = [
    { value: 0, p: 0.1 },
    { value: 10, p: 0.5 },
    { value: 20, p: 0.9 },
    { value: 30, p: 1 },
  ];

  it('interpolates the ECDF and its inverse consistently', () => {
    expect(ecdfAt(pts, -1)).toBe(0);
    expect(ecdfAt(pts, 5)).toBeCloseTo(0.3, 12);
    expect(ecdfAt(pts, 30)).toBe(1);
    expect(ecdfAt(pts, 99)).toBe(1);
    expect(quantileAt(pts, 0.7)).toBeCloseTo(15, 12);
    expect(quantileAt(pts, 0.05)).toBe(0);
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 1, noNaN: true }), (p) => {
        expect(ecdfAt(pts, quantileAt(pts, p))).toBeCloseTo(p, 9);
      }),
    );
  });

  it('reads the point under the pointer', () => {
    const px = g.box.innerWidth * 0.5;
    const r = readoutAtPixel(g, px)!;
    const value = g.xDomain[0] + 0.5 * (g.xDomain[1] - g.xDomain[0]);
    expect(r.value).toBeCloseTo(Math.max(g.points[0].value, Math.min(g.points[g.points.length - 1].value, value)), 3);
    expect(r.p).toBeCloseTo(ecdfAt(g.points, r.value), 12);
    expect(r.y).toBeCloseTo((1 - r.p) * g.box.innerHeight, 9);
    expect(r.text).toMatch(/chance of not exceeding €/);
    // Outside the curve the readout clamps to its ends.
    expect(readoutAtPixel(g, -50)!.value).toBe(g.points[0].value);
    expect(readoutAtPixel(g, 1e6)!.value).toBe(g.points[g.points.length - 1].value);
  });

  it('steps by keyboard: start at P50, arrows one point, Page keys ten, Home/End the ends', () => {
    let r = stepReadout(g, null, 'ArrowRight')!;
    expect(r.p).toBeCloseTo(0.5, 2);
    r = stepReadout(g, r, 'ArrowRight')!;
    expect(r.p).toBeCloseTo(0.51, 2);
    r = stepReadout(g, r, 'PageUp')!;
    expect(r.p).toBeCloseTo(0.61, 2);
    r = stepReadout(g, r, 'ArrowDown')!;
    expect(r.p).toBeCloseTo(0.6, 2);
    r = stepReadout(g, r, 'End')!;
    expect(r.p).toBeCloseTo(0.99, 2);
    r = stepReadout(g, r, 'PageUp')!;
    expect(r.p).toBeCloseTo(0.99, 2);
    r = stepReadout(g, r, 'Home')!;
    expect(r.p).toBeCloseTo(0.01, 2);
    const atP = readoutAtProbability(g, 0.8)!;
    expect(Math.abs(atP.value - percentiles[2].value) / percentiles[2].value).toBeLessThan(0.003);
  });

  it('reads the curve at a value, clamped to its range', () => {
    const r = readoutAtValue(g, percentiles[2].value)!;
    expect(r.value).toBe(percentiles[2].value);
    expect(Math.abs(r.p - 0.8)).toBeLessThan(0.006);
    expect(readoutAtValue(g, -1e12)!.value).toBe(g.points[0].value);
    expect(readoutAtValue(g, NaN)).toBeNull();
  });

  it('returns nothing for an empty curve', () => {
    const empty = cumulativeGeometry({ ecdf: [], name: 'Total', unit: 'EUR', width: 400 });
    expect(empty.path).toBe('');
    expect(readoutAtPixel(empty, 10)).toBeNull();
    expect(stepReadout(empty, null, 'Home')).toBeNull();
  });
});
