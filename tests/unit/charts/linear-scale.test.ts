// lib/core/charts/axis.ts linear() writes out the part of d3-scale's scaleLinear the charts use (positions, inverse,
// ticks, nice bounds), so that pages with charts need not carry d3-scale. Reference: d3-scale 4.0.2 itself, on
// random and hand-picked domains and ranges: every figure must be the same number, bit for bit.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { scaleLinear } from 'd3-scale';
import { linear } from '@/lib/core/charts/axis';

// Chart values: finite, and not subnormal (d3-array's ticks itself fails on a domain of subnormal numbers).
const finite = fc.tuple(fc.integer({ min: -1e9, max: 1e9 }), fc.constantFrom(1, 7, 1e3, 1e6, 1e9)).map(([n, d]) => n / d);
const pair = fc.tuple(finite, finite) as fc.Arbitrary<[number, number]>;
const HAND: [number, number][] = [
  [0, 1],
  [1, 0],
  [0.03, 0.27],
  [7.9e6, 14.2e6],
  [-0.4, 0.4],
  [5, 5],
  [0, 0],
  [-1e-9, 3e-9],
  [123.456, 123.457],
];

function compare(domain: [number, number], range: [number, number], count: number, probes: number[]) {
  const ours = linear(domain, range);
  const ref = scaleLinear().domain(domain).range(range);
  expect(ours.domain()).toEqual(ref.domain());
  expect(ours.ticks(count)).toEqual(ref.ticks(count));
  for (const x of probes) {
    expect(Object.is(ours(x), ref(x))).toBe(true);
    expect(Object.is(ours.invert(x), ref.invert(x))).toBe(true);
  }
  ours.nice(count);
  ref.nice(count);
  expect(ours.domain()).toEqual(ref.domain());
  expect(ours.ticks(count)).toEqual(ref.ticks(count));
  for (const x of probes) expect(Object.is(ours(x), ref(x))).toBe(true);
}

describe('linear(): the same figures as d3-scale scaleLinear', () => {
  it('on hand-picked domains, including reversed and empty ones', () => {
    for (const d of HAND) for (const r of [[0, 600], [200, 0], [0.5, 359.5]] as [number, number][]) for (const c of [3, 4, 6, 10]) compare(d, r, c, [d[0], d[1], (d[0] + d[1]) / 2, d[0] - 1, 0, 1e6]);
  });

  it('on random domains, ranges, counts and probes', () => {
    fc.assert(
      fc.property(pair, pair, fc.integer({ min: 1, max: 12 }), fc.array(finite, { minLength: 1, maxLength: 8 }), (d, r, c, probes) => {
        compare(d, r, c, probes);
      }),
      { numRuns: 400 },
    );
  });
});
