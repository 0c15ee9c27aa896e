import { describe, expect, it } from 'vitest';
import { Stream } from '@/lib/core/engine/rng';
import { bucketAverageRanks, bucketSortedCopy } from '@/lib/core/engine/bucket-sort';
import { argsort } from '@/lib/core/engine/sort';

// The bucket sort must give exactly the radix sort's order (sort.ts), so results do not depend on which ran.
function radixRanks(values: Float64Array): Float64Array {
  // Reference: average ranks over runs of equal bits in a stable argsort (the radix path).
  const order = argsort(values);
  const bits = (x: number) => (Object.is(x, -0) ? '-0' : String(x));
  const ranks = new Float64Array(values.length);
  let i = 0;
  while (i < order.length) {
    let j = i + 1;
    while (j < order.length && bits(values[order[j]]) === bits(values[order[i]])) j++;
    for (let k = i; k < j; k++) ranks[order[k]] = (i + 1 + j) / 2;
    i = j;
  }
  return ranks;
}

function columns(): Float64Array[] {
  const s = new Stream('bucket-test');
  const u = () => s.uniform();
  return [
    Float64Array.from({ length: 30000 }, () => u() + u() + u() - 1.5),
    Float64Array.from({ length: 20000 }, () => u() * 10 - 5),
    Float64Array.from({ length: 5000 }, (_, i) => (i % 4 === 0 ? -0 : i % 4 === 1 ? 0 : (u() - 0.5) * 1e-3)),
    Float64Array.from({ length: 4000 }, () => Math.round(u() * 1000) / 100),
    Float64Array.from({ length: 3000 }, () => Math.exp(8 * u())),
  ];
}

describe('bucket sort', () => {
  it('sorts exactly as the radix sort (values and -0 before +0) or declines', () => {
    let used = 0;
    for (const col of columns()) {
      const got = bucketSortedCopy(col);
      if (!got) continue;
      used++;
      const ref = col.slice().sort();
      const differ = [...got].findIndex((x, k) => !Object.is(x, ref[k]));
      expect(differ).toBe(-1);
    }
    expect(used).toBeGreaterThanOrEqual(3);
  });

  it('ranks exactly as the radix ranks, ties by equal bits, or declines', () => {
    let used = 0;
    for (const col of columns()) {
      const got = bucketAverageRanks(col);
      if (!got) continue;
      used++;
      expect([...got]).toEqual([...radixRanks(col)]);
    }
    expect(used).toBeGreaterThanOrEqual(3);
  });

  it('declines a crowded column (one far outlier) and a constant one', () => {
    const crowded = Float64Array.from({ length: 10000 }, (_, i) => (i === 0 ? 1e9 : i / 1e4));
    expect(bucketSortedCopy(crowded)).toBeNull();
    expect(bucketAverageRanks(new Float64Array(100).fill(2))).toBeNull();
  });
});
