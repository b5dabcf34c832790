import { standardNormalQuantile } from './normal';
import { standardErrorOfMean } from './statistics';

/**
 * Monte Carlo standard errors by influence functions (the delta method written path by path).
 *
 * An estimate θ̂ computed from n paths behaves, to first order, like θ + (1/n) Σᵢ ψᵢ with ψ
 * the influence values of the paths; its standard error is the standard error of the mean
 * of ψ: s_ψ/√n with the n − 1 sample variance, or — with antithetic paths, where paths 2k and
 * 2k + 1 are not independent — from the means of the pairs, s_ȳ/√(n/2) (Glasserman, Monte
 * Carlo Methods in Financial Engineering, 2004, §4.2). A difference between two options on the
 * same paths takes the difference of their influence values, so the covariance that common
 * random numbers create is counted (paired comparison).
 *
 * Influence values used here (van der Vaart, Asymptotic Statistics, 1998, ch. 20–21):
 * - mean:                       ψᵢ = Wᵢ − W̄
 * - share above a threshold t:  ψᵢ = 1{Wᵢ ≥ t} − p̂
 * - p-quantile q:               ψᵢ = s(p)·(p − 1{Wᵢ ≤ q}), s = 1/f(q) the sparsity (Bahadur, 1966)
 * - lower-tail mean at α (ES):  ψᵢ = q + (Wᵢ − q)·1{Wᵢ ≤ q}/α − ES, q the α-quantile
 * - ln CE at CRRA γ = 2λ, e = 1 − γ:  ψᵢ = (uᵢ − 1)/e, uᵢ = Wᵢ^e / mean(W^e); at e = 0, ψᵢ = ln Wᵢ − mean ln W
 *   (so CE's own is CE·ψᵢ).
 */

/** Standard error from influence values (antithetic-aware); null when not finite. */
export function influenceStandardError(psi: Float64Array, antithetic: boolean): number | null {
  const se = standardErrorOfMean(psi, antithetic);
  return Number.isFinite(se) ? se : null;
}

/**
 * Hall–Sheather bandwidth for estimating the sparsity 1/f at probability p from n values:
 * h = n^(−1/3) · z^(2/3) · (1.5 φ(Φ⁻¹(p))² / (2Φ⁻¹(p)² + 1))^(1/3), z = Φ⁻¹(0.975)
 * (Hall & Sheather, JRSS B 50, 1988; as given in Koenker, Quantile Regression, 2005, §3.4 —
 * from memory).
 */
export function sparsityBandwidth(p: number, n: number): number {
  const x = standardNormalQuantile(p);
  const phi = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
  const z = 1.959963984540054;
  return Math.pow(n, -1 / 3) * Math.pow(z, 2 / 3) * Math.pow((1.5 * phi * phi) / (2 * x * x + 1), 1 / 3);
}

/** The probability levels whose quantiles give the sparsity at p: p ± h, kept inside (0, 1). */
export function sparsityLevels(p: number, n: number): [number, number] {
  const h = sparsityBandwidth(p, n);
  return [Math.max(p - h, 0), Math.min(p + h, 1)];
}

/**
 * Influence values of the p-quantile q of `values` into `out`, given the quantiles at the two
 * sparsity levels (Siddiqui–Bloch–Gastwirth difference quotient s = (q₊ − q₋)/(p₊ − p₋)).
 */
export function quantileInfluence(values: ArrayLike<number>, p: number, q: number, levels: [number, number], quantilesAtLevels: [number, number], out: Float64Array): void {
  const s = (quantilesAtLevels[1] - quantilesAtLevels[0]) / (levels[1] - levels[0]);
  for (let i = 0; i < values.length; i++) out[i] = s * (p - (values[i] <= q ? 1 : 0));
}

/** Influence values of the lower-tail mean at level α with α-quantile q and tail mean es. */
export function tailMeanInfluence(values: ArrayLike<number>, alpha: number, q: number, es: number, out: Float64Array): void {
  for (let i = 0; i < values.length; i++) {
    const w = values[i];
    out[i] = q + (w <= q ? (w - q) / alpha : 0) - es;
  }
}

/** Influence values of the share of values ≥ t, into `out`. */
export function shareInfluence(values: ArrayLike<number>, t: number, out: Float64Array): void {
  let count = 0;
  for (let i = 0; i < values.length; i++) if (values[i] >= t) count++;
  const share = count / values.length;
  for (let i = 0; i < values.length; i++) out[i] = (values[i] >= t ? 1 : 0) - share;
}

/** Below this |e| = |1 − 2λ| the log-utility form is used (as logCertaintyEquivalent does). */
const LOG_UTILITY_BAND = 1e-9;

/**
 * Influence values of ln CE at λ from log pots, into `out`; returns ln CE, computed exactly as
 * logCertaintyEquivalent does (−∞ when a pot is zero and γ > 1; then `out` is NaN).
 */
export function logCeInfluence(logs: Float64Array, lambda: number, out: Float64Array): number {
  const n = logs.length;
  const e = 1 - 2 * lambda;
  if (Math.abs(e) < LOG_UTILITY_BAND) {
    let s = 0;
    for (let i = 0; i < n; i++) s += logs[i];
    const m = s / n;
    for (let i = 0; i < n; i++) out[i] = logs[i] - m;
    return m;
  }
  let top = -Infinity;
  for (let i = 0; i < n; i++) if (e * logs[i] > top) top = e * logs[i];
  if (!Number.isFinite(top)) {
    out.fill(Number.NaN);
    return -Infinity;
  }
  let s = 0;
  for (let i = 0; i < n; i++) {
    const v = Math.exp(e * logs[i] - top);
    out[i] = v;
    s += v;
  }
  const meanV = s / n;
  for (let i = 0; i < n; i++) out[i] = (out[i] / meanV - 1) / e;
  return (top + Math.log(meanV)) / e;
}

/** Whether a difference is inside the noise, and roughly how many paths would separate it. */
export interface Separation {
  /** |difference| < 2 standard errors (or no standard error): not separated at this number of paths. */
  tooCloseToCall: boolean;
  /**
   * Paths at which the difference would be 2 standard errors, n·(2·SE/|d|)², to two significant
   * figures — when too close to call; null when separated already, or when the difference is 0
   * (no number of paths separates equal options).
   */
  pathsToSeparate: number | null;
}

/** See {@link Separation}; the standard error shrinks as 1/√paths. */
export function separation(difference: number, standardError: number | null, paths: number): Separation {
  if (standardError === null || !Number.isFinite(standardError) || !Number.isFinite(difference)) {
    return { tooCloseToCall: true, pathsToSeparate: null };
  }
  const d = Math.abs(difference);
  if (d >= 2 * standardError) return { tooCloseToCall: false, pathsToSeparate: null };
  if (d === 0) return { tooCloseToCall: true, pathsToSeparate: null };
  const needed = paths * ((2 * standardError) / d) ** 2;
  const magnitude = 10 ** Math.max(0, Math.floor(Math.log10(needed)) - 1);
  return { tooCloseToCall: true, pathsToSeparate: Math.ceil(needed / magnitude) * magnitude };
}

/** A difference between two options with its standard error and separation. */
export interface Difference extends Separation {
  value: number;
  standardError: number | null;
}

export function difference(value: number, standardError: number | null, paths: number): Difference {
  return { value, standardError, ...separation(value, standardError, paths) };
}
