/**
 * Bucket sorting for the smooth columns a simulation produces: one pass finds the range, one
 * counts the values in about n/4 equal-width buckets ((x - min) * scale is monotone in x, so
 * buckets are in order), one scatters them, and each bucket of a few values is finished by
 * insertion. Three linear passes instead of the radix sort's six; sort.ts falls back to the
 * radix sort when a bucket gets crowded (skewed or discrete columns), so the cost never
 * degrades. The order is the radix sort's exactly: ascending, -0 before +0.
 */

/** Largest bucket the insertion step accepts; beyond it the caller sorts by radix. */
const CROWDED = 48;

interface Buckets {
  min: number;
  scale: number;
  last: number;
  /** First position of each bucket in the output (length buckets + 1). */
  first: Uint32Array;
}

/** The buckets of `values`, or null when they would not help (tiny or constant range, a crowded bucket). */
function bucketsOf(values: Float64Array): Buckets | null {
  const n = values.length;
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < n; k++) {
    const x = values[k];
    if (x < min) min = x;
    if (x > max) max = x;
  }
  const count = Math.max(1, n >>> 2);
  const scale = count / (max - min);
  if (!(scale > 0 && scale < Infinity)) return null;
  const last = count - 1;
  const first = new Uint32Array(count + 1);
  for (let k = 0; k < n; k++) {
    const b = Math.floor((values[k] - min) * scale);
    first[(b < last ? b : last) + 1]++;
  }
  for (let b = 0; b < count; b++) {
    if (first[b + 1] > CROWDED) return null;
    first[b + 1] += first[b];
  }
  return { min, scale, last, first };
}

/** -0 counts as smaller than +0, as in the radix order. */
function less(x: number, y: number): boolean {
  return x < y || (x === 0 && y === 0 && 1 / x < 0 && 1 / y > 0);
}

/** Sorted copy of values (no NaN), or null when the radix sort should do it. */
export function bucketSortedCopy(values: Float64Array): Float64Array | null {
  const n = values.length;
  const bk = bucketsOf(values);
  if (!bk) return null;
  const { min, scale, last, first } = bk;
  const next = first.slice(0, last + 1);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const x = values[k];
    const b = Math.floor((x - min) * scale);
    out[next[b < last ? b : last]++] = x;
  }
  for (let b = 0; b <= last; b++) {
    const lo = first[b];
    const hi = first[b + 1];
    for (let i = lo + 1; i < hi; i++) {
      const v = out[i];
      let j = i - 1;
      while (j >= lo && less(v, out[j])) {
        out[j + 1] = out[j];
        j--;
      }
      out[j + 1] = v;
    }
  }
  return out;
}

/** Average ranks 1..n (ties, by equal bits, share their mean rank), or null when the radix sort should do it. */
export function bucketAverageRanks(values: Float64Array): Float64Array | null {
  const n = values.length;
  const bk = bucketsOf(values);
  if (!bk) return null;
  const { min, scale, last, first } = bk;
  const next = first.slice(0, last + 1);
  const order = new Uint32Array(n);
  const sorted = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const x = values[k];
    const b = Math.floor((x - min) * scale);
    const pos = next[b < last ? b : last]++;
    order[pos] = k;
    sorted[pos] = x;
  }
  for (let b = 0; b <= last; b++) {
    const lo = first[b];
    const hi = first[b + 1];
    for (let i = lo + 1; i < hi; i++) {
      const v = sorted[i];
      const o = order[i];
      let j = i - 1;
      while (j >= lo && less(v, sorted[j])) {
        sorted[j + 1] = sorted[j];
        order[j + 1] = order[j];
        j--;
      }
      sorted[j + 1] = v;
      order[j + 1] = o;
    }
  }
  const ranks = new Float64Array(n);
  let i = 0;
  while (i < n) {
    const v = sorted[i];
    let j = i + 1;
    // Equal bits: -0 and +0 are different values here, as in the radix ranks.
    while (j < n && sorted[j] === v && (v !== 0 || 1 / sorted[j] === 1 / v)) j++;
    if (j === i + 1) ranks[order[i]] = i + 1;
    else {
      const r = (i + 1 + j) / 2;
      for (let k = i; k < j; k++) ranks[order[k]] = r;
    }
    i = j;
  }
  return ranks;
}
