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
