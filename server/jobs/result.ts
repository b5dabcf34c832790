import type { PairResult, ProjectionResult } from '../../simulation';
import { percentileOfSorted } from '../../simulation/statistics';

/**
 * The stored shape of a finished run (projection_runs.result). Money is exact (unrounded,
 * in the scheme's currency); rates and probabilities are fractions.
 */

/** Largest number of terminal real pots stored per option × member. */
export const SAMPLE_SIZE = 2000;

export type PairFigures = Omit<PairResult, 'terminalRealPots'> & {
  /** Monte Carlo standard errors beyond the engine's standard error of the mean. */
  extraStandardErrors: {
    /** Of the 50th and 5th percentile real pots (order-statistic interval, see quantileStandardError). */
    p50Real: number;
    p5Real: number;
    /** Of the probability of reaching the target: √(p(1−p)/n), the binomial standard error. */
    probabilityReachingTarget: number;
  };
};

export type StoredVariant = {
  result: Omit<ProjectionResult, 'results'> & { results: PairFigures[] };
  /**
   * Terminal real pots per option × member, ascending: every path when paths ≤ SAMPLE_SIZE,
   * otherwise the quantiles at probabilities (k + ½)/SAMPLE_SIZE, k = 0 … SAMPLE_SIZE − 1
   * (a midpoint rule over the distribution, enough for the browser's certainty equivalents at
   * any λ; the full-sample figure at the run's λ is in `result`).
   */
  samples: { optionId: string; memberId: string; realPots: number[] }[];
};

export type Reproduction = {
  of: string;
  matches: boolean;
  /** First place the two results differ, as a dotted path with both values. */
  firstDifference: { path: string; original: unknown; rerun: unknown } | null;
  checkedAt: string;
};

export type StoredResult = {
  kind: 'keelson-run-result';
  engineVersion: string;
  sample: { kind: 'all' | 'quantiles'; size: number };
  base: StoredVariant;
  stressed: StoredVariant | null;
  reproduction?: Reproduction;
};

/**
 * Standard error of the sample p-quantile from the sorted sample itself: the number of values
 * below the true quantile is Binomial(n, p), so the order statistics at ranks n(p ± d) with
 * d = √(p(1−p)/n) bracket about ±1 standard error; half that distance is the estimate.
 * (Normal approximation to the binomial for order-statistic confidence intervals; Conover,
 * Practical Nonparametric Statistics, 3rd ed., §3.2 — from memory.)
 */
export function quantileStandardError(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n < 2) return Number.NaN;
  const d = Math.sqrt((p * (1 - p)) / n);
  const lo = percentileOfSorted(sorted, Math.max(0, p - d) * 100);
  const hi = percentileOfSorted(sorted, Math.min(1, p + d) * 100);
  return (hi - lo) / 2;
}

/** Sorted pots, or their quantiles at SAMPLE_SIZE midpoints when there are more. */
export function potSample(sorted: Float64Array): { kind: 'all' | 'quantiles'; values: number[] } {
  if (sorted.length <= SAMPLE_SIZE) return { kind: 'all', values: Array.from(sorted) };
  const values = new Array<number>(SAMPLE_SIZE);
  for (let k = 0; k < SAMPLE_SIZE; k++) values[k] = percentileOfSorted(sorted, ((k + 0.5) / SAMPLE_SIZE) * 100);
  return { kind: 'quantiles', values };
}

/** The stored form of one engine result: figures, extra standard errors and pot samples. */
export function storeVariant(result: ProjectionResult): { variant: StoredVariant; sampleKind: 'all' | 'quantiles' } {
  let sampleKind: 'all' | 'quantiles' = 'all';
  const samples: StoredVariant['samples'] = [];
  const results: PairFigures[] = result.results.map((pair) => {
    const { terminalRealPots, ...rest } = pair;
    const sorted = terminalRealPots.slice().sort();
    const n = sorted.length;
    const p = rest.atRetirement.probabilityReachingTarget;
    const sample = potSample(sorted);
    sampleKind = sample.kind;
    samples.push({ optionId: pair.optionId, memberId: pair.memberId, realPots: sample.values });
    return {
      ...rest,
      extraStandardErrors: {
        p50Real: quantileStandardError(sorted, 0.5),
        p5Real: quantileStandardError(sorted, 0.05),
        probabilityReachingTarget: Math.sqrt((p * (1 - p)) / n),
      },
    };
  });
  // Round-trip through JSON now, so a stored result and a freshly computed one compare alike.
  const variant = JSON.parse(JSON.stringify({ result: { ...result, results }, samples })) as StoredVariant;
  return { variant, sampleKind };
}

/** First difference between two JSON values (depth-first, in key order of `a`), or null. */
export function firstDifference(a: unknown, b: unknown, path = ''): { path: string; original: unknown; rerun: unknown } | null {
  if (Object.is(a, b)) return null;
  const bothObjects = a !== null && b !== null && typeof a === 'object' && typeof b === 'object';
  if (!bothObjects || Array.isArray(a) !== Array.isArray(b)) return { path: path || '(result)', original: a, rerun: b };
  if (Array.isArray(a) && Array.isArray(b)) {
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      const d = firstDifference(a[i], b[i], path ? `${path}.${i}` : String(i));
      if (d) return d;
    }
    return null;
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  const keys = [...Object.keys(ao), ...Object.keys(bo).filter((k) => !(k in ao))];
  for (const k of keys) {
    const d = firstDifference(ao[k], bo[k], path ? `${path}.${k}` : k);
    if (d) return d;
  }
  return null;
}

/** Compares the reproducible part of two stored results (both variants; not the reproduction note). */
export function compareResults(original: StoredResult, rerun: StoredResult) {
  return firstDifference({ base: original.base, stressed: original.stressed }, { base: rerun.base, stressed: rerun.stressed });
}
