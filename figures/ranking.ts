import type { PairFigures, StoredVariant } from '../server/jobs/result';
import { separation, type OptionComparison, type PairAtLambda } from '../simulation';

/**
 * Options ranked at a chosen λ, from a stored run and its exact figures at that λ: the same
 * computation for the comparison screen, the board report and its CSV. The certainty
 * equivalents, their standard errors and the paired differences come from every path's pot —
 * the comparison endpoint (`GET …/runs/:runId/comparison?lambda=`, runComparison) — or, at the
 * run's own λ, from the engine's stored full-sample figures (storedFigures). Nothing here
 * approximates from a sample of quantiles.
 */

/**
 * The exact figures of one variant at one λ: each option × member's certainty equivalent with
 * its standard error, and every paired difference between options (CE, median pot, chance of
 * target) with its standard error and whether it is too close to call.
 */
export type ExactFigures = { lambda: number; paths: number; pairs: readonly PairAtLambda[]; differences: readonly OptionComparison[] };

/** A certainty-equivalent pot with its Monte Carlo standard error and its constant annual real return. */
export type CeFigure = {
  pot: number;
  /** Antithetic-aware standard error (influence function); null when it cannot be estimated. */
  standardError: number | null;
  annualReturn: number | null;
};

export type RankedOption = {
  /** 1 for the highest certainty-equivalent pot. */
  rank: number;
  optionId: string;
  name: string;
  pair: PairFigures;
  ce: CeFigure;
  /** Certainty-equivalent pot minus that of the next option down, paired (null for the last). */
  toNext: Difference | null;
};

type Names = Record<string, string> | Map<string, string>;
const nameOf = (names: Names, id: string) => (names instanceof Map ? names.get(id) : names[id]) ?? id;

/**
 * The figures a run stored at its own λ, computed by the engine from every path: for runs whose
 * pots were not kept (engine before 2.0.0), and the same numbers the comparison endpoint gives
 * at that λ. Runs stored before paired comparisons have no differences (standard errors unknown).
 */
export function storedFigures(variant: StoredVariant): ExactFigures {
  const r = variant.result;
  return {
    lambda: r.riskAversion,
    paths: r.paths,
    pairs: r.results.map((p) => ({
      optionId: p.optionId,
      memberId: p.memberId,
      certaintyEquivalent: {
        realPot: p.atRetirement.certaintyEquivalent.realPot,
        realAnnualReturn: p.atRetirement.certaintyEquivalent.realAnnualReturn,
        standardError: p.atRetirement.uncertainty?.certaintyEquivalent.realPot ?? null,
      },
    })),
    differences: r.comparisons ?? [],
  };
}

const FIGURE_KEYS = { ce: 'certaintyEquivalent', median: 'medianPot', chance: 'probabilityReachingTarget' } as const;

/**
 * The paired difference option − other for one member, oriented as asked (the engine stores
 * each pair once, A − B); null when the figures have none (or no target, for the chance).
 */
export function pairedDifference(ex: ExactFigures, memberId: string, optionId: string, otherId: string, figure: keyof typeof FIGURE_KEYS): Difference | null {
  const c = ex.differences.find((x) => x.memberId === memberId && ((x.optionA === optionId && x.optionB === otherId) || (x.optionA === otherId && x.optionB === optionId)));
  const d = c?.[FIGURE_KEYS[figure]];
  if (!c || !d) return null;
  const value = c.optionA === optionId ? d.value : -d.value;
  // Equal figures (options identical on every path) are never a lead, whatever the standard error (0 then).
  return { value, standardError: d.standardError, tooCloseToCall: value === 0 ? true : d.tooCloseToCall, pathsToSeparate: d.pathsToSeparate };
}

/** Each option's figures for one member at the figures' λ, highest certainty-equivalent pot first. */
export function rankAt(variant: StoredVariant, ex: ExactFigures, memberId: string, names: Names): RankedOption[] {
  const rows = variant.result.results
    .filter((p) => p.memberId === memberId)
    .map((pair) => {
      const own = ex.pairs.find((x) => x.optionId === pair.optionId && x.memberId === memberId);
      if (!own) throw new Error(`the comparison has no figures for option ${pair.optionId} × member ${memberId}`);
      const c = own.certaintyEquivalent;
      return { optionId: pair.optionId, name: nameOf(names, pair.optionId), pair, ce: { pot: c.realPot, standardError: c.standardError, annualReturn: c.realAnnualReturn } };
    })
    .sort((a, b) => b.ce.pot - a.ce.pot);
  return rows.map((r, i) => {
    const next = rows[i + 1];
    const toNext = next ? (pairedDifference(ex, memberId, r.optionId, next.optionId, 'ce') ?? difference(r.ce.pot - next.ce.pot)) : null;
    return { ...r, rank: i + 1, toNext };
  });
}

/** The paired standard errors of differences to a baseline, from exact figures (for differencesToBaseline). */
export function exactErrors(ex: ExactFigures, memberId: string): PairedErrors {
  return (optionId, baselineId, figure) => (figure === 'p5' ? null : pairedDifference(ex, memberId, optionId, baselineId, figure));
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

/**
 * A difference with its standard error; given the number of paths, also roughly how many paths
 * would separate it when it is too close to call (the engine's rule, `separation`:
 * n·(2·SE/|d|)², rounded up to two significant figures, since the standard error shrinks as 1/√n).
 */
export function difference(value: number, standardError: number | null = null, paths?: number): Difference {
  const se = standardError !== null && Number.isFinite(standardError) ? standardError : null;
  if (se === null) return { value, standardError: null, tooCloseToCall: null };
  if (paths) return { value, standardError: se, ...separation(value, se, paths) };
  return { value, standardError: se, tooCloseToCall: Math.abs(value) < SEPARATION_Z * se };
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
