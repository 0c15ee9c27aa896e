// Straight-segment SVG paths for the curves, written out so that pages with charts need not carry d3-shape and
// d3-path (about 2 KiB of the embed page, compressed). The strings are the ones d3-shape 3.2's line() and area()
// give with their default linear curve and 3 decimal digits (tests/unit/charts/polyline.test.ts compares them).

type Point = readonly [x: number, y: number];

const round3 = (v: number) => Math.round(v * 1000) / 1000;

function through(points: readonly Point[]): string {
  let d = '';
  for (let i = 0; i < points.length; i++) d += `${i ? 'L' : 'M'}${round3(points[i][0])},${round3(points[i][1])}`;
  return d;
}

/** A polyline through the points ('' for none; a lone point is a closed move, as d3 draws it). */
export function linePath(points: readonly Point[]): string {
  if (!points.length) return '';
  return points.length === 1 ? `${through(points)}Z` : through(points);
}

/** The closed area between the polyline and the horizontal line y = base. */
export function areaPath(points: readonly Point[], base: number): string {
  if (!points.length) return '';
  let d = through(points);
  for (let i = points.length - 1; i >= 0; i--) d += `L${round3(points[i][0])},${round3(base)}`;
  return `${d}Z`;
}
