/**
 * Summary statistics over Monte Carlo paths.
 */

/** Arithmetic mean x̄ = (1/n) Σ xᵢ, summed in index order (so results are reproducible). */
export function mean(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i];
  return s / values.length;
}

/** Sample variance with the n − 1 divisor: s² = Σ (xᵢ − x̄)² / (n − 1); 0 when n < 2. */
export function sampleVariance(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return 0;
  const m = mean(values);
  let s = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i] - m;
    s += d * d;
  }
  return s / (n - 1);
}

/**
 * Monte Carlo standard error of the mean.
 * Independent paths: s / √n with s² the n − 1 sample variance.
 * Antithetic pairs (paths 2k and 2k+1 are not independent): the pair means
 * yₖ = (x₂ₖ + x₂ₖ₊₁)/2 are independent, so the standard error is s_y / √(n/2).
 */
export function standardErrorOfMean(values: ArrayLike<number>, antithetic = false): number {
  const n = values.length;
  if (!antithetic) return Math.sqrt(sampleVariance(values) / n);
  const pairs = Math.floor(n / 2);
  const y = new Float64Array(pairs);
  for (let k = 0; k < pairs; k++) y[k] = (values[2 * k] + values[2 * k + 1]) / 2;
  return Math.sqrt(sampleVariance(y) / pairs);
}

/**
 * Percentile of ascending `sorted` values at rank `rank` in [0, 100], by linear interpolation
 * between order statistics: h = (n − 1)·rank/100, value = x₍⌊h⌋₎ + (h − ⌊h⌋)(x₍⌊h⌋+1₎ − x₍⌊h⌋₎)
 * (0-based order statistics; the "inclusive" definition).
 */
export function percentileOfSorted(sorted: ArrayLike<number>, rank: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = ((n - 1) * rank) / 100;
  const lo = Math.floor(h);
  if (lo >= n - 1) return sorted[n - 1];
  const frac = h - lo;
  const a = sorted[lo];
  return frac === 0 ? a : a + frac * (sorted[lo + 1] - a);
}

/**
 * Expected shortfall at level α (lower tail): the mean of the k = ⌈α·n⌉ smallest values of
 * ascending `sorted` (at least one value).
 */
export function lowerTailMean(sorted: ArrayLike<number>, alpha: number): number {
  const k = Math.max(1, Math.ceil(alpha * sorted.length - 1e-9));
  let s = 0;
  for (let i = 0; i < k; i++) s += sorted[i];
  return s / k;
}

/** Fraction of ascending `sorted` values that are ≥ `threshold` (binary search). */
export function fractionAtLeast(sorted: ArrayLike<number>, threshold: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < threshold) lo = mid + 1;
    else hi = mid;
  }
  return (sorted.length - lo) / sorted.length;
}

/** Sample correlation Σ(x−x̄)(y−ȳ) / √(Σ(x−x̄)² Σ(y−ȳ)²). */
export function correlation(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const mx = mean(x);
  const my = mean(y);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < x.length; i++) {
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  return sxy / Math.sqrt(sxx * syy);
}

/** Key used for a percentile rank in results: 5 → "p5", 2.5 → "p2.5". */
export function percentileKey(rank: number): string {
  return `p${rank}`;
}
