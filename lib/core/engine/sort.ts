/**
 * LSD radix sorting of Float64Array keys (IEEE-754 bits mapped to an unsigned order:
 * flip all bits of negatives, the sign bit of positives), six 11-bit passes, skipping any
 * pass whose digit is the same for every key. About twice as fast as the native
 * TypedArray sort for a million doubles. NaN must be removed by the caller. Smooth columns
 * go to the bucket sort first (bucket-sort.ts: three passes, the same order), which declines
 * skewed or discrete ones.
 */
import { bucketAverageRanks, bucketSortedCopy } from './bucket-sort';

const RADIX_BITS = 11;
const BUCKETS = 1 << RADIX_BITS;
const PASSES = 6;

function digit(lo: number, hi: number, pass: number): number {
  switch (pass) {
    case 0:
      return lo & 2047;
    case 1:
      return (lo >>> 11) & 2047;
    case 2:
      return ((lo >>> 22) | (hi << 10)) & 2047;
    case 3:
      return (hi >>> 1) & 2047;
    case 4:
      return (hi >>> 12) & 2047;
    default:
      return hi >>> 23;
  }
}

// Scratch buffers reused between calls (the engine is single-threaded): sorting many
// columns would otherwise allocate, and collect, several arrays per column.
let scratchKeys = new Uint32Array(0);
let scratchKeys2 = new Uint32Array(0);
let scratchIdx = new Uint32Array(0);
let scratchIdx2 = new Uint32Array(0);

function scratch(n: number): void {
  if (scratchIdx.length < n) {
    const size = Math.max(n, 2 * scratchIdx.length);
    scratchKeys = new Uint32Array(2 * size);
    scratchKeys2 = new Uint32Array(2 * size);
    scratchIdx = new Uint32Array(size);
    scratchIdx2 = new Uint32Array(size);
  }
}

function toKeys(values: Float64Array, into?: Uint32Array): Uint32Array {
  const n = values.length;
  const u = into ?? new Uint32Array(2 * n);
  const f = new Float64Array(u.buffer, u.byteOffset, n);
  f.set(values);
  for (let k = 0; k < n; k++) {
    const hi = u[2 * k + 1];
    if (hi & 0x80000000) {
      u[2 * k + 1] = ~hi;
      u[2 * k] = ~u[2 * k];
    } else {
      u[2 * k + 1] = hi | 0x80000000;
    }
  }
  return u;
}

function fromKeys(u: Uint32Array): Float64Array {
  const n = u.length / 2;
  for (let k = 0; k < n; k++) {
    const hi = u[2 * k + 1];
    if (hi & 0x80000000) {
      u[2 * k + 1] = hi & 0x7fffffff;
    } else {
      u[2 * k + 1] = ~hi;
      u[2 * k] = ~u[2 * k];
    }
  }
  return new Float64Array(u.buffer, u.byteOffset, n);
}

function histograms(u: Uint32Array, n: number): Uint32Array[] {
  const counts = Array.from({ length: PASSES }, () => new Uint32Array(BUCKETS));
  const [c0, c1, c2, c3, c4, c5] = counts;
  for (let k = 0; k < n; k++) {
    const lo = u[2 * k];
    const hi = u[2 * k + 1];
    c0[lo & 2047]++;
    c1[(lo >>> 11) & 2047]++;
    c2[((lo >>> 22) | (hi << 10)) & 2047]++;
    c3[(hi >>> 1) & 2047]++;
    c4[(hi >>> 12) & 2047]++;
    c5[hi >>> 23]++;
  }
  return counts;
}

/** Prefix sums in place; returns false when every key shares one digit (pass can be skipped). */
function prefix(c: Uint32Array, n: number): boolean {
  let s = 0;
  let useful = true;
  for (let j = 0; j < BUCKETS; j++) {
    const t = c[j];
    if (t === n) useful = false;
    c[j] = s;
    s += t;
  }
  return useful;
}

/** A sorted copy (ascending) of values, which must contain no NaN. */
export function sortedCopy(values: Float64Array): Float64Array {
  const n = values.length;
  if (n < 2048) return Float64Array.from(values).sort();
  const byBuckets = bucketSortedCopy(values);
  if (byBuckets) return byBuckets;
  let src: Uint32Array = toKeys(values);
  let dst: Uint32Array = new Uint32Array(2 * n);
  const counts = histograms(src, n);
  for (let pass = 0; pass < PASSES; pass++) {
    const c = counts[pass];
    if (!prefix(c, n)) continue;
    for (let k = 0; k < n; k++) {
      const lo = src[2 * k];
      const hi = src[2 * k + 1];
      const pos = c[digit(lo, hi, pass)]++;
      dst[2 * pos] = lo;
      dst[2 * pos + 1] = hi;
    }
    const t = src;
    src = dst;
    dst = t;
  }
  return fromKeys(src);
}

/**
 * Sorts indices by value (stable) in the scratch buffers. Returns views of the scratch:
 * the order and the sorted keys, valid until the next call.
 */
function argsortWithKeys(values: Float64Array): { order: Uint32Array; keys: Uint32Array } {
  const n = values.length;
  scratch(n);
  let idx: Uint32Array = scratchIdx.subarray(0, n);
  let idx2: Uint32Array = scratchIdx2.subarray(0, n);
  for (let k = 0; k < n; k++) idx[k] = k;
  let src: Uint32Array = toKeys(values, scratchKeys.subarray(0, 2 * n));
  let dst: Uint32Array = scratchKeys2.subarray(0, 2 * n);
  if (n < 2) return { order: idx, keys: src };
  const counts = histograms(src, n);
  for (let pass = 0; pass < PASSES; pass++) {
    const c = counts[pass];
    if (!prefix(c, n)) continue;
    for (let k = 0; k < n; k++) {
      const lo = src[2 * k];
      const hi = src[2 * k + 1];
      const pos = c[digit(lo, hi, pass)]++;
      dst[2 * pos] = lo;
      dst[2 * pos + 1] = hi;
      idx2[pos] = idx[k];
    }
    const t = src;
    src = dst;
    dst = t;
    const ti = idx;
    idx = idx2;
    idx2 = ti;
  }
  return { order: idx, keys: src };
}

/** Indices that sort values ascending (stable), values without NaN. */
export function argsort(values: Float64Array): Uint32Array {
  return argsortWithKeys(values).order.slice();
}

/** Ranks 1..n with ties given their average rank. */
export function averageRanks(values: Float64Array): Float64Array {
  const n = values.length;
  if (n >= 2048) {
    const byBuckets = bucketAverageRanks(values);
    if (byBuckets) return byBuckets;
  }
  const { order, keys } = argsortWithKeys(values);
  // Compare keys as int32: equal bits, and no unsigned values above 2^31 to box.
  const k32 = new Int32Array(keys.buffer, keys.byteOffset, keys.length);
  const ranks = new Float64Array(n);
  let i = 0;
  while (i < n) {
    const lo = k32[2 * i];
    const hi = k32[2 * i + 1];
    let j = i + 1;
    while (j < n && k32[2 * j] === lo && k32[2 * j + 1] === hi) j++;
    if (j === i + 1) {
      ranks[order[i]] = i + 1;
    } else {
      const r = (i + 1 + j) / 2;
      for (let k = i; k < j; k++) ranks[order[k]] = r;
    }
    i = j;
  }
  return ranks;
}
