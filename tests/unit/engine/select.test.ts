import { describe, expect, it } from 'vitest';
import { Stream } from '@/lib/core/engine/rng';
import { orderStatistics } from '@/lib/core/engine/select';
import { sortedCopy } from '@/lib/core/engine/sort';

// The selection must give exactly what the radix sort puts at each rank: the headline figures are
// computed by selection and the charts from the sorted column, and both must agree bit for bit.
function columns(): Float64Array[] {
  const s = new Stream('select-test');
  const normal = Float64Array.from({ length: 5000 }, () => s.uniform() - s.uniform() + s.uniform());
  const ties = Float64Array.from({ length: 3000 }, () => Math.floor(s.uniform() * 7) - 3);
  const zeros = Float64Array.from({ length: 2000 }, (_, i) => (i % 3 === 0 ? -0 : i % 3 === 1 ? 0 : s.uniform() - 0.5));
  const sorted = Float64Array.from({ length: 1000 }, (_, i) => i / 10);
  const reversed = sorted.slice().reverse();
  const constant = new Float64Array(500).fill(4.25);
  return [normal, ties, zeros, sorted, reversed, constant, Float64Array.of(3), Float64Array.of(2, -1)];
}

describe('order statistics by selection', () => {
  it('equal the sorted column at every asked rank, with ties, signed zeros and sorted input', () => {
    for (const col of columns()) {
      const n = col.length;
      const ref = sortedCopy(col);
      const ranks = [0, n - 1, Math.floor(n / 2), Math.floor(n / 100), n - 1 - Math.floor(n / 100), Math.floor(n / 3), Math.floor(n / 3), 1 % n];
      for (let r = 0; r < n; r += Math.max(1, Math.floor(n / 37))) ranks.push(r);
      const got = orderStatistics(col, ranks);
      ranks.forEach((r, i) => expect(Object.is(got[i], ref[r]), `rank ${r} of ${n}: ${got[i]} vs ${ref[r]}`).toBe(true));
    }
  });

  it('leaves its input unchanged and refuses ranks outside the column', () => {
    const col = Float64Array.of(5, 1, 4, 2, 3);
    expect([...orderStatistics(col, [4, 0, 2])]).toEqual([5, 1, 3]);
    expect([...col]).toEqual([5, 1, 4, 2, 3]);
    expect(() => orderStatistics(col, [5])).toThrow(/Rank 5 is outside 0..4/);
  });
});

describe('order statistics on awkward ranges', () => {
  it('handle a range too wide to scale, a subnormal range and a discrete column', () => {
    const wide = Float64Array.of(-1.7e308, 1.7e308, 0, 5, -5, 1e300);
    const tiny = Float64Array.of(0, 5e-324, 5e-324, 0, 1e-323);
    const discrete = Float64Array.from({ length: 20000 }, (_, i) => (i * 7919) % 3);
    for (const col of [wide, tiny, discrete]) {
      const ref = sortedCopy(col);
      const ranks = Array.from({ length: col.length }, (_, i) => i).filter((i) => col.length < 100 || i % 997 === 0);
      const got = orderStatistics(col, ranks);
      ranks.forEach((r, i) => expect(Object.is(got[i], ref[r])).toBe(true));
    }
  });
});
