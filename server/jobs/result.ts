import { endianness } from 'node:os';
import { promisify } from 'node:util';
import { deflateRaw, inflateRawSync } from 'node:zlib';
import type { PairResult, ProjectionResult } from '../../simulation';
import { percentileOfSorted } from '../../simulation/statistics';

/**
 * The stored shape of a finished run (projection_runs.result). Money is exact (unrounded,
 * in the scheme's currency); rates and probabilities are fractions. Every terminal real pot
 * is stored beside it, compressed, in projection_run_pots (see encodePots), so figures at any
 * λ are exact; `samples` stays for the screens that read it.
 */

/** Largest number of terminal real pots stored per option × member. */
export const SAMPLE_SIZE = 2000;

export type PairFigures = Omit<PairResult, 'terminalRealPots'> & {
  /**
   * Standard errors the screens read, beyond the engine's standard error of the mean. Format 2:
   * the engine's own (atRetirement.uncertainty: influence functions, antithetic-aware; null
   * without a target). Format 1: as engine 1's runs stored them — order-statistic intervals
   * (quantileStandardError) and the binomial √(p(1−p)/n) — so a rerun reproduces them.
   */
  extraStandardErrors: {
    p50Real: number;
    p5Real: number;
    probabilityReachingTarget: number | null;
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
    const sample = potSample(sorted);
    sampleKind = sample.kind;
    samples.push({ optionId: pair.optionId, memberId: pair.memberId, realPots: sample.values });
    const u = rest.atRetirement.uncertainty;
    const p = rest.atRetirement.probabilityReachingTarget;
    const extraStandardErrors =
      result.formatVersion === 1
        ? {
            p50Real: quantileStandardError(sorted, 0.5),
            p5Real: quantileStandardError(sorted, 0.05),
            probabilityReachingTarget: Math.sqrt(((p ?? 0) * (1 - (p ?? 0))) / n),
          }
        : {
            p50Real: u.percentiles.real.p50 ?? quantileStandardError(sorted, 0.5),
            p5Real: u.percentiles.real.p5 ?? quantileStandardError(sorted, 0.05),
            probabilityReachingTarget: u.probabilityReachingTarget,
          };
    return { ...rest, extraStandardErrors };
  });
  // Round-trip through JSON now, so a stored result and a freshly computed one compare alike.
  const variant = JSON.parse(JSON.stringify({ result: { ...result, results }, samples })) as StoredVariant;
  return { variant, sampleKind };
}

/**
 * First difference between two JSON values (depth-first, in key order of `a`), or null.
 * `ignore` names keys that are not compared; with `onlyOriginal`, keys that `a` lacks are not
 * compared either (fields a later engine added to a result).
 */
export function firstDifference(
  a: unknown,
  b: unknown,
  path = '',
  opts: { ignore?: ReadonlySet<string>; onlyOriginal?: boolean } = {},
): { path: string; original: unknown; rerun: unknown } | null {
  if (Object.is(a, b)) return null;
  const bothObjects = a !== null && b !== null && typeof a === 'object' && typeof b === 'object';
  if (!bothObjects || Array.isArray(a) !== Array.isArray(b)) return { path: path || '(result)', original: a, rerun: b };
  if (Array.isArray(a) && Array.isArray(b)) {
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      const d = firstDifference(a[i], b[i], path ? `${path}.${i}` : String(i), opts);
      if (d) return d;
    }
    return null;
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  const keys = [...Object.keys(ao), ...(opts.onlyOriginal ? [] : Object.keys(bo).filter((k) => !(k in ao)))];
  for (const k of keys) {
    if (opts.ignore?.has(k)) continue;
    const d = firstDifference(ao[k], bo[k], path ? `${path}.${k}` : k, opts);
    if (d) return d;
  }
  return null;
}

/**
 * Compares the reproducible part of two stored results (both variants; not the reproduction
 * note): every figure the original stored must come back identical. The engine version (it
 * is provenance) and fields added by a later engine (present only in the rerun) are not
 * compared, so "run again" of a run stored by engine 1 reproduces it through format 1.
 */
export function compareResults(original: StoredResult, rerun: StoredResult) {
  return firstDifference(
    { base: original.base, stressed: original.stressed },
    { base: rerun.base, stressed: rerun.stressed },
    '',
    { ignore: new Set(['engineVersion']), onlyOriginal: true },
  );
}

/** How projection_run_pots.data is written. */
export const POT_ENCODING = 'f64le-planes-deflate';

/**
 * Terminal real pots, losslessly compressed: the Float64 values (little-endian) are split into
 * eight planes — every value's first byte, then every second byte, … — so the slowly varying
 * sign/exponent bytes sit together, then deflated. About 84 % of the raw 8 bytes a pot.
 */
export function encodePots(pots: Float64Array): Promise<Buffer> {
  if (endianness() !== 'LE') throw new Error('pot storage assumes a little-endian machine');
  const bytes = new Uint8Array(pots.buffer, pots.byteOffset, pots.byteLength);
  const n = pots.length;
  const planes = Buffer.allocUnsafe(8 * n);
  for (let i = 0; i < n; i++) for (let k = 0; k < 8; k++) planes[k * n + i] = bytes[8 * i + k];
  // Compressed on libuv's thread pool, not on the event loop.
  return deflateRawAsync(planes, { level: 6 });
}

const deflateRawAsync = promisify(deflateRaw);

/** The inverse of encodePots. */
export function decodePots(data: Buffer, paths: number, encoding = POT_ENCODING): Float64Array {
  if (encoding !== POT_ENCODING) throw new Error(`unknown pot encoding ${encoding}`);
  const planes = inflateRawSync(data);
  if (planes.length !== 8 * paths) throw new Error(`stored pots hold ${planes.length / 8} values, expected ${paths}`);
  const out = new Float64Array(paths);
  const bytes = new Uint8Array(out.buffer);
  for (let i = 0; i < paths; i++) for (let k = 0; k < 8; k++) bytes[8 * i + k] = planes[k * paths + i];
  return out;
}

/** One row of projection_run_pots (db/schema.ts). */
export type PotRow = { runId: string; variant: 'base' | 'stressed'; optionId: string; memberId: string; paths: number; encoding: string; data: Buffer };

/** The pot rows of one variant of a run's engine result. */
export function potRows(runId: string, variant: 'base' | 'stressed', result: ProjectionResult): Promise<PotRow[]> {
  return Promise.all(
    result.results.map(async (pair) => ({
      runId,
      variant,
      optionId: pair.optionId,
      memberId: pair.memberId,
      paths: pair.terminalRealPots.length,
      encoding: POT_ENCODING,
      data: await encodePots(pair.terminalRealPots),
    })),
  );
}
