import type { PairFigures, StoredVariant } from '../server/jobs/result';
import { ceAnnualReturn, certaintyEquivalentPot, memberTimeline, type ScenarioInput } from '../simulation';
import { sampleVariance } from '../simulation/statistics';

/**
 * Options ranked at a chosen λ, from a stored run: the same computation for the comparison
 * screen (in the browser, so moving λ re-ranks without simulating again), the board report and
 * its CSV. At the run's own λ the engine's full-sample certainty equivalent is used; at any other
 * λ the stored sample of terminal real pots (every path, or 2,000 quantiles for larger runs).
 */

/** A certainty-equivalent pot with its Monte Carlo standard error and its constant annual real return. */
export type CeFigure = {
  pot: number;
  /** Delta-method standard error (see ceStandardError); NaN when it cannot be estimated. */
  standardError: number;
  annualReturn: number | null;
  /** 'run': the engine's own figure from every path; 'sample': from the stored sample. */
  basis: 'run' | 'sample';
};

export type RankedOption = {
  /** 1 for the highest certainty-equivalent pot. */
  rank: number;
  optionId: string;
  name: string;
  pair: PairFigures;
  ce: CeFigure;
};

type Names = Record<string, string> | Map<string, string>;
const nameOf = (names: Names, id: string) => (names instanceof Map ? names.get(id) : names[id]) ?? id;

/** The stored sample of terminal real pots for one option × member. */
export function sampleOf(variant: StoredVariant, optionId: string, memberId: string): number[] {
  const s = variant.samples.find((x) => x.optionId === optionId && x.memberId === memberId);
  if (!s) throw new Error(`the run stores no sample for option ${optionId} × member ${memberId}`);
  return s.realPots;
}

/**
 * Monte Carlo standard error of the certainty-equivalent pot by the delta method:
 * CE = g(m) with m = mean(W^(1−γ)) and g(m) = m^(1/(1−γ)), so SE(CE)/CE ≈ SE(m)/(|1−γ|·m);
 * for γ = 1, CE = exp(mean ln W) and SE(CE)/CE ≈ sd(ln W)/√n. γ = 2λ (simulation/utility.ts).
 * The spread comes from the stored sample; n is the run's number of paths. Computed in a
 * shifted log scale so that large γ does not overflow. Zero pots give no estimate (NaN).
 */
export function ceStandardError(sample: ArrayLike<number>, lambda: number, paths: number): number {
  const n = sample.length;
  if (n < 2) return Number.NaN;
  const e = 1 - 2 * lambda;
  const logs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!(sample[i] > 0)) return Number.NaN;
    logs[i] = Math.log(sample[i]);
  }
  const ce = certaintyEquivalentPot(sample, lambda);
  if (Math.abs(e) < 1e-9) return (ce * Math.sqrt(sampleVariance(logs))) / Math.sqrt(paths);
  let mx = -Infinity;
  for (let i = 0; i < n; i++) mx = Math.max(mx, e * logs[i]);
  const u = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    u[i] = Math.exp(e * logs[i] - mx);
    m += u[i];
  }
  m /= n;
  return (ce * Math.sqrt(sampleVariance(u))) / (Math.sqrt(paths) * Math.abs(e) * m);
}

/** The certainty-equivalent figures of one option × member at λ. */
export function ceAt(variant: StoredVariant, scenario: ScenarioInput, pair: PairFigures, lambda: number): CeFigure {
  const sample = sampleOf(variant, pair.optionId, pair.memberId);
  const standardError = ceStandardError(sample, lambda, variant.result.paths);
  if (lambda === variant.result.riskAversion) {
    const own = pair.atRetirement.certaintyEquivalent;
    return { pot: own.realPot, standardError, annualReturn: own.realAnnualReturn, basis: 'run' };
  }
  const pot = certaintyEquivalentPot(sample, lambda);
  const member = scenario.members.find((m) => m.id === pair.memberId);
  if (!member) throw new Error(`the run has no member ${pair.memberId}`);
  const t = memberTimeline(member, scenario.inflation);
  return { pot, standardError, annualReturn: ceAnnualReturn(pot, { initialPot: t.initialPot, contributions: t.realContributions }), basis: 'sample' };
}

/** Each option's figures for one member at λ, highest certainty-equivalent pot first. */
export function rankAt(variant: StoredVariant, scenario: ScenarioInput, memberId: string, lambda: number, names: Names): RankedOption[] {
  return variant.result.results
    .filter((p) => p.memberId === memberId)
    .map((pair) => ({ rank: 0, optionId: pair.optionId, name: nameOf(names, pair.optionId), pair, ce: ceAt(variant, scenario, pair, lambda) }))
    .sort((a, b) => b.ce.pot - a.ce.pot)
    .map((r, i) => ({ ...r, rank: i + 1 }));
}

// ---- Differences to a baseline option --------------------------------------------------

/**
 * How many standard errors a difference must reach before one option is said to be ahead: 2,
 * the two-sided 95% normal point (1.96) rounded up (common practice, no source), the rule the
 * engine's paired comparison uses too.
 */
export const SEPARATION_Z = 2;

/**
 * A difference between an option and the baseline. `standardError` is the Monte Carlo standard
 * error of the difference itself (paired, since every option sees the same paths); it is null
 * until the run's stored result provides it, and `tooCloseToCall` is then null too. The engine's
 * own paired differences ({ value, standardError, tooCloseToCall, pathsToSeparate }) fit as they are.
 */
export type Difference = { value: number; standardError: number | null; tooCloseToCall: boolean | null; pathsToSeparate?: number | null };

export function difference(value: number, standardError: number | null = null): Difference {
  const se = standardError !== null && Number.isFinite(standardError) ? standardError : null;
  return { value, standardError: se, tooCloseToCall: se === null ? null : Math.abs(value) < SEPARATION_Z * se };
}

export type OptionDifference = {
  optionId: string;
  name: string;
  /** Certainty-equivalent pot, median and 5th-percentile pots: money, option − baseline. */
  ce: Difference;
  median: Difference;
  p5: Difference;
  /** Chance of reaching the income target: a fraction, option − baseline (percentage points when shown); null when the run has no income target. */
  chance: Difference | null;
};

/**
 * Paired figures of differences (option − baseline) when the run provides them: a standard
 * error, or the engine's whole difference with its own too-close-to-call judgement.
 */
export type PairedErrors = (optionId: string, baselineId: string, figure: 'ce' | 'median' | 'p5' | 'chance') => number | Difference | null;

function paired(value: number, p: number | Difference | null): Difference {
  if (p === null || typeof p === 'number') return difference(value, p);
  return { ...p, value };
}

function chanceDifference(a: number | null, b: number | null, error: () => number | Difference | null): Difference | null {
  return a === null || b === null ? null : paired(a - b, error());
}

/** Every other option compared with the baseline (by default the top-ranked one). */
export function differencesToBaseline(ranked: RankedOption[], baselineId: string = ranked[0]?.optionId, errors: PairedErrors = () => null): OptionDifference[] {
  const base = ranked.find((r) => r.optionId === baselineId);
  if (!base) return [];
  const at = (r: RankedOption) => r.pair.atRetirement;
  return ranked
    .filter((r) => r.optionId !== baselineId)
    .map((r) => ({
      optionId: r.optionId,
      name: r.name,
      ce: paired(r.ce.pot - base.ce.pot, errors(r.optionId, baselineId, 'ce')),
      median: paired(at(r).percentiles.real.p50 - at(base).percentiles.real.p50, errors(r.optionId, baselineId, 'median')),
      p5: paired(at(r).percentiles.real.p5 - at(base).percentiles.real.p5, errors(r.optionId, baselineId, 'p5')),
      chance: chanceDifference(at(r).probabilityReachingTarget, at(base).probabilityReachingTarget, () => errors(r.optionId, baselineId, 'chance')),
    }));
}

// ---- The baseline: the scheme's current default ----------------------------------------

/**
 * The option comparisons are measured from: the scheme's current default when the run was made
 * (`projection_runs.baseline_option_id`), when it is among the options; otherwise the top-ranked one.
 */
export function baselineOf<T extends { optionId: string }>(ranked: T[], currentDefaultId: string | null | undefined): T | undefined {
  return ranked.find((r) => r.optionId === currentDefaultId) ?? ranked[0];
}

/** The rows with the current default's moved to the top, the others in their order: how comparisons are laid out. */
export function pinFirst<T extends { optionId: string }>(rows: T[], currentDefaultId: string | null | undefined): T[] {
  const at = rows.findIndex((r) => r.optionId === currentDefaultId);
  return at < 0 ? rows : [rows[at], ...rows.slice(0, at), ...rows.slice(at + 1)];
}
