// lib/core/charts/polyline.ts writes out the straight-segment paths the charts used to take from d3-shape, so that
// pages with charts need not carry d3-shape and d3-path. Reference: d3-shape 3.2.0 itself (line() and area() with
// their default linear curve and 3 digits), on random and hand-picked points: the strings must be identical.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { area, line } from 'd3-shape';
import { areaPath, linePath } from '@/lib/core/charts/polyline';

type P = readonly [number, number];
const coord = fc.oneof(
  fc.double({ min: -1e4, max: 1e4, noNaN: true }),
  fc.integer({ min: -500, max: 500 }).map((n) => n / 100),
  fc.constantFrom(0, -0, 0.0005, 0.0015, 2.675, 1e-9),
);
const points = fc.array(fc.tuple(coord, coord), { maxLength: 40 });

const d3Line = (pts: readonly P[]) => line<P>()(pts as P[]) ?? '';
const d3Area = (pts: readonly P[], base: number) =>
  area<P>()
    .x((d) => d[0])
    .y0(base)
    .y1((d) => d[1])(pts as P[]) ?? '';

describe('straight-segment paths, as d3-shape draws them', () => {
  it('a polyline through random points', () => {
    fc.assert(fc.property(points, (pts) => linePath(pts) === d3Line(pts)), { numRuns: 400 });
  });

  it('the area between random points and a base line', () => {
    fc.assert(fc.property(points, coord, (pts, base) => areaPath(pts, base) === d3Area(pts, base)), { numRuns: 400 });
  });

  it('hand-picked cases: none, one point, rounding to 3 digits', () => {
    const cases: P[][] = [[], [[1, 2]], [[0.12345, 9.8765], [3, 4]], [[10, 0], [20, 50.5], [30, 100]]];
    for (const c of cases) {
      expect(linePath(c)).toBe(d3Line(c));
      expect(areaPath(c, 120)).toBe(d3Area(c, 120));
    }
    expect(linePath([[1, 2]])).toBe('M1,2Z');
    expect(linePath([[0.12345, 9.8765], [3, 4]])).toBe('M0.123,9.877L3,4');
    expect(areaPath([[10, 0], [20, 50.5]], 120)).toBe('M10,0L20,50.5L20,120L10,120Z');
  });
});
