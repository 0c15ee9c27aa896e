/**
 * Order statistics by selection instead of a full sort: the headline figures (percentiles
 * and their order-statistic intervals) need a few dozen ranks of a column, not all of it.
 * Bucket selection: one pass finds the range, one counts the values in equal-width buckets
 * ((x - min) * scale is monotone in x, so every value of a bucket is no larger than any
 * value of the next), then only the buckets holding a wanted rank are gathered and sorted.
 * Branch-free passes, so a column of 50,000 values costs far less than a sort.
 *
 * The values returned are exactly those of the sorted column at those ranks (sortedCopy in
 * sort.ts orders -0 before +0, as the typed-array sort used inside a bucket does), so a
 * result computed either way is the same bit for bit.
 */

const BUCKETS = 4096;

/**
 * The values at the given 0-based ranks of `values` sorted ascending (NaN must be removed by
 * the caller). Returns one value per rank, in the order asked; `values` is not changed.
 */
export function orderStatistics(values: Float64Array, ranks: readonly number[]): Float64Array {
  const n = values.length;
  const out = new Float64Array(ranks.length);
  if (n === 0) return out.fill(NaN);
  for (const r of ranks) if (!Number.isInteger(r) || r < 0 || r >= n) throw new Error(`Rank ${r} is outside 0..${n - 1}.`);
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < n; k++) {
    const x = values[k];
    if (x < min) min = x;
    if (x > max) max = x;
  }
  if (!(max > min)) {
    // One value (perhaps zeros of both signs): the sort's order of the zeros decides.
    if (min !== 0) return out.fill(min);
    let negatives = 0;
    for (let k = 0; k < n; k++) if (Object.is(values[k], -0)) negatives++;
    ranks.forEach((r, i) => (out[i] = r < negatives ? -0 : 0));
    return out;
  }
  let buckets = Math.min(BUCKETS, n);
  let scale = buckets / (max - min);
  // A range too wide or too narrow to scale: one bucket, which is a sort of the whole column.
  if (!(scale > 0 && scale < Infinity)) {
    buckets = 1;
    scale = 0;
  }
  const last = buckets - 1;
  // The bucket of x is b < last ? b : last with b = floor((x - min) scale), written out in both passes below
  // (cheaper than a call per value), and so that NaN (an infinite difference times a zero scale) lands in the last.
  const counts = new Uint32Array(buckets);
  for (let k = 0; k < n; k++) {
    const b = Math.floor((values[k] - min) * scale);
    counts[b < last ? b : last]++;
  }
  // First rank of each bucket; the buckets that hold a wanted rank.
  const first = new Uint32Array(buckets + 1);
  for (let b = 0; b < buckets; b++) first[b + 1] = first[b] + counts[b];
  const bucketOfRank = (r: number) => {
    let lo = 0;
    let hi = buckets - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (first[mid] <= r) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  };
  const needed = new Map<number, Float64Array>();
  for (const r of ranks) {
    const b = bucketOfRank(r);
    if (!needed.has(b)) needed.set(b, new Float64Array(counts[b]));
  }
  const slot = new Int32Array(buckets).fill(-1);
  const lists: Float64Array[] = [];
  const fills: number[] = [];
  for (const [b, arr] of needed) {
    slot[b] = lists.length;
    lists.push(arr);
    fills.push(0);
  }
  for (let k = 0; k < n; k++) {
    const x = values[k];
    const b = Math.floor((x - min) * scale);
    const s = slot[b < last ? b : last];
    if (s >= 0) lists[s][fills[s]++] = x;
  }
  for (const arr of lists) arr.sort();
  ranks.forEach((r, i) => {
    const b = bucketOfRank(r);
    out[i] = lists[slot[b]][r - first[b]];
  });
  return out;
}
