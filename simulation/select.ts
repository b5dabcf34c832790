/**
 * Order statistics without sorting.
 *
 * `selectInPlace` is Floyd and Rivest's SELECT (Communications of the ACM 18(3), 1975,
 * Algorithm 489): on a large range it first selects within a small sample around the expected
 * position to get two close pivots, so the partition that follows leaves few elements; about
 * n + min(k, n − k) comparisons on average. After it, a[k] is the k-th smallest (0-based),
 * everything left of k is ≤ a[k] and everything right is ≥ a[k].
 *
 * `selectManyInPlace` places several ranks at once by selecting the middle one and recursing
 * into the two sides, O(n log m) for m ranks. Values must not be NaN.
 */
export type NumberArray = Float64Array | Float32Array;

export function selectInPlace(a: NumberArray, k: number, left = 0, right = a.length - 1): void {
  while (right > left) {
    if (right - left > 600) {
      const n = right - left + 1;
      const i = k - left + 1;
      const z = Math.log(n);
      const s = 0.5 * Math.exp((2 * z) / 3);
      const sd = 0.5 * Math.sqrt((z * s * (n - s)) / n) * (i - n / 2 < 0 ? -1 : 1);
      const newLeft = Math.max(left, Math.floor(k - (i * s) / n + sd));
      const newRight = Math.min(right, Math.floor(k + ((n - i) * s) / n + sd));
      selectInPlace(a, k, newLeft, newRight);
    }
    const t = a[k];
    let i = left;
    let j = right;
    swap(a, left, k);
    if (a[right] > t) swap(a, right, left);
    while (i < j) {
      swap(a, i, j);
      i++;
      j--;
      while (a[i] < t) i++;
      while (a[j] > t) j--;
    }
    if (a[left] === t) swap(a, left, j);
    else {
      j++;
      swap(a, j, right);
    }
    if (j <= k) left = j + 1;
    if (k <= j) right = j - 1;
  }
}

function swap(a: NumberArray, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

/** Place every rank of `ranks` (ascending, distinct, inside [left, right]) at its sorted position. */
export function selectManyInPlace(a: NumberArray, ranks: readonly number[], left = 0, right = a.length - 1, from = 0, to = ranks.length): void {
  if (from >= to) return;
  const mid = (from + to) >> 1;
  const k = ranks[mid];
  selectInPlace(a, k, left, right);
  selectManyInPlace(a, ranks, left, k - 1, from, mid);
  selectManyInPlace(a, ranks, k + 1, right, mid + 1, to);
}

/**
 * The 0-based ranks needed to interpolate the given percentiles (0–100) of n values, with the
 * same rule as percentileOfSorted: h = (n − 1)·p/100, ranks ⌊h⌋ and ⌊h⌋ + 1.
 */
export function percentileRanks(n: number, percentiles: readonly number[]): number[] {
  const set = new Set<number>();
  for (const p of percentiles) {
    const h = ((n - 1) * p) / 100;
    const lo = Math.min(Math.floor(h), n - 1);
    set.add(lo);
    if (lo + 1 < n && h > lo) set.add(lo + 1);
  }
  return [...set].sort((x, y) => x - y);
}

/**
 * Percentile of values whose needed ranks have been placed by selectManyInPlace (see
 * percentileRanks): the same arithmetic as percentileOfSorted on the sorted values.
 */
export function percentileOfSelected(a: ArrayLike<number>, rank: number): number {
  const n = a.length;
  if (n === 0) return Number.NaN;
  const h = ((n - 1) * rank) / 100;
  const lo = Math.floor(h);
  if (lo >= n - 1) return a[n - 1];
  const frac = h - lo;
  const x = a[lo];
  return frac === 0 ? x : x + frac * (a[lo + 1] - x);
}

/**
 * The percentile (0–100) of n values from the values at the ranks percentileRanks asked for
 * (`ranks` ascending, `values` in the same order): the same arithmetic as percentileOfSorted.
 */
export function percentileFromRanks(n: number, rank: number, ranks: readonly number[], values: ArrayLike<number>): number {
  if (n === 0) return Number.NaN;
  const h = ((n - 1) * rank) / 100;
  const lo = Math.floor(h);
  const at = (r: number) => values[ranks.indexOf(r)];
  if (lo >= n - 1) return at(n - 1);
  const frac = h - lo;
  const x = at(lo);
  return frac === 0 ? x : x + frac * (at(lo + 1) - x);
}

/**
 * Values at several ranks of non-negative values without moving them: a two-pass radix
 * selection on float32 bit patterns (for floats ≥ +0 the IEEE 754 bits, read as unsigned
 * integers, order as the values do; rounding a double to float32 keeps order, so Float64
 * values are bucketed by the bits of their float32 rounding). Pass 1 counts the values in each
 * bucket of the top 16 bits (sign, exponent and 7 mantissa bits); the buckets holding the
 * asked ranks follow from the running counts. Pass 2 copies the values of those buckets aside
 * (the exact values); each rank is then selected among its bucket's few values. About two cheap
 * passes instead of a partitioning select per rank. Falls back to selection on a copy when a
 * value is negative, −0 or NaN.
 *
 * `ranks` ascending and distinct; returns the value at each, in that order.
 */
export function float32ValuesAtRanks(values: Float32Array, ranks: readonly number[], scratch: RadixScratch = RadixScratch.shared()): Float64Array {
  return radixValuesAtRanks(new Uint32Array(values.buffer, values.byteOffset, values.length), values, ranks, scratch);
}

/** As float32ValuesAtRanks, for Float64 values (exact values returned). */
export function float64ValuesAtRanks(values: Float64Array, ranks: readonly number[], scratch: RadixScratch = RadixScratch.shared()): Float64Array {
  const rounded = Float32Array.from(values);
  return radixValuesAtRanks(new Uint32Array(rounded.buffer), values, ranks, scratch);
}

function radixValuesAtRanks(bits: Uint32Array, values: Float32Array | Float64Array, ranks: readonly number[], scratch: RadixScratch): Float64Array {
  const n = values.length;
  const R = ranks.length;
  const out = new Float64Array(R);
  const counts = scratch.counts;
  let lowest = 0xffff;
  let highest = 0;
  for (let i = 0; i < n; i++) {
    const b = bits[i] >>> 16;
    counts[b]++;
    if (b < lowest) lowest = b;
    if (b > highest) highest = b;
  }
  if (highest >= 0x7f80) {
    // A negative value, −0 or NaN: clear the counts and select on a copy.
    counts.fill(0, lowest, highest + 1);
    const copy = values.slice();
    selectManyInPlace(copy, ranks);
    for (let k = 0; k < R; k++) out[k] = copy[ranks[k]];
    return out;
  }
  // Bucket of each rank and the number of values below it; each target bucket gets a segment
  // of the scratch buffer (marks[b] = 1 + its start), in bucket order.
  const marks = scratch.marks;
  const bucketOf = new Int32Array(R);
  const below = new Int32Array(R);
  let k = 0;
  let seen = 0;
  let used = 0;
  for (let b = lowest; b <= highest && k < R; b++) {
    const c = counts[b];
    while (k < R && ranks[k] < seen + c) {
      bucketOf[k] = b;
      below[k] = seen;
      if (marks[b] === 0) {
        marks[b] = used + 1;
        used += c;
      }
      k++;
    }
    seen += c;
  }
  const buffer = scratch.buffer(used);
  const fill = scratch.fill(lowest, highest);
  for (let i = 0; i < n; i++) {
    const b = bits[i] >>> 16;
    const m = marks[b];
    if (m !== 0) buffer[m - 1 + fill[b - lowest]++] = values[i];
  }
  for (let j = 0; j < R; j++) {
    const start = marks[bucketOf[j]] - 1;
    const at = start + ranks[j] - below[j];
    selectInPlace(buffer, at, start, start + counts[bucketOf[j]] - 1);
    out[j] = buffer[at];
  }
  for (let j = 0; j < R; j++) marks[bucketOf[j]] = 0;
  counts.fill(0, lowest, highest + 1);
  return out;
}

/** Reusable tables for float32ValuesAtRanks (about 640 KiB; left cleared after each call). */
export class RadixScratch {
  readonly counts = new Int32Array(0x10000);
  readonly marks = new Int32Array(0x10000);
  private values = new Float64Array(1024);
  private filled = new Int32Array(0x10000);
  private static instance: RadixScratch | null = null;
  /** One set per thread (JavaScript runs one call at a time on a thread), made on first use. */
  static shared(): RadixScratch {
    RadixScratch.instance ??= new RadixScratch();
    return RadixScratch.instance;
  }
  /** A buffer of at least `size` values (Float64, so float32 and float64 values are kept exactly). */
  buffer(size: number): Float64Array {
    if (this.values.length < size) this.values = new Float64Array(Math.max(size, 2 * this.values.length));
    return this.values;
  }
  /** Per-bucket fill counters for buckets lowest … highest, zeroed. */
  fill(lowest: number, highest: number): Int32Array {
    const f = this.filled.subarray(0, highest - lowest + 1);
    f.fill(0);
    return f;
  }
}
