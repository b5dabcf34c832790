import { ceCurve, type CeCurve } from './breakEven';
import { ceReturn, type BreakEvenResult, type ComparedPair, type OptionComparison } from './compare';
import type { Conventions } from './conventions';
import type { PreparedScenario } from './prepare';
import type { PairStore } from './project';
import { float32ValuesAtRanks, float64ValuesAtRanks, percentileFromRanks, percentileRanks, RadixScratch } from './select';
import { mean, percentileKey, standardErrorOfMean } from './statistics';
import {
  influenceStandardError,
  logCeInfluence,
  quantileInfluence,
  shareInfluence,
  sparsityLevels,
  tailMeanInfluence,
} from './uncertainty';
import { logPots } from './utility';
import { ENGINE_VERSION } from './version';

/** Percentile values keyed "p5", "p50", … */
export type PercentileValues = Record<string, number>;

/** Level of the expected shortfall: the mean of the worst 5 % of pots. */
export const SHORTFALL_LEVEL = 0.05;

export interface NominalReal {
  nominal: number;
  real: number;
}

/** Results for one (option, member) pair. */
export interface PairResult {
  optionId: string;
  memberId: string;
  /** Years from now to retirement. */
  years: number;
  /** Ages at times 0 … n. */
  ages: number[];
  /** Per-age percentiles of the pot: bands.nominal.p50[t] is the median nominal pot at ages[t]. */
  bands: { nominal: Record<string, number[]>; real: Record<string, number[]> };
  atRetirement: {
    mean: NominalReal;
    /** Monte Carlo standard error of the mean (antithetic pairs counted as one draw). */
    standardError: NominalReal;
    percentiles: { nominal: PercentileValues; real: PercentileValues };
    /** Real pot needed: targetReplacementRatio × real final salary × annuity factor. */
    targetRealPot: number;
    /**
     * Fraction of paths whose real pot is at least targetRealPot. Format 2: null when the
     * target is 0 (no target; format 1 gives 1).
     */
    probabilityReachingTarget: number | null;
    /** Mean of the worst 5 % of pots. */
    expectedShortfall: NominalReal & { level: number };
    /** Level real income the pot buys (real pot ÷ annuity factor), percentiles. */
    realIncome: PercentileValues;
    /** Real income ÷ real final salary, percentiles; null when the final salary is zero. */
    replacementRatio: PercentileValues | null;
    certaintyEquivalent: {
      lambda: number;
      /** Certainty-equivalent real pot. */
      realPot: number;
      /** Constant real annual return (net of charges) giving that pot from the same contributions. */
      realAnnualReturn: number | null;
    };
    /**
     * Monte Carlo standard errors (antithetic-aware, by influence functions; uncertainty.ts) of
     * the figures above, in real money: each reported percentile, the chance of reaching the
     * target (null without a target), the expected shortfall and the certainty-equivalent pot
     * (null when it cannot be estimated). The mean's is `standardError`.
     */
    uncertainty: {
      percentiles: { real: PercentileValues };
      probabilityReachingTarget: number | null;
      expectedShortfall: { real: number };
      certaintyEquivalent: { realPot: number | null };
    };
  };
  /** Real pot at retirement for every path, in path order (not written to JSON unless asked). */
  terminalRealPots: Float64Array;
}

/** A projection result (format described in simulation/README.md). */
export interface ProjectionResult {
  format: 'keelson-projection-result';
  formatVersion: number;
  engineVersion: string;
  seed: number;
  paths: number;
  antithetic: boolean;
  percentiles: number[];
  inflation: number;
  riskAversion: number;
  annuityFactor: number;
  stress: { fundId: string; yearsBeforeRetirement: number; fall: number } | null;
  /** One entry per option × member, option-major. */
  results: PairResult[];
  /** For each member, every pair of options: λ where their certainty-equivalent pots are equal. */
  breakEven: BreakEvenResult[];
  /** Timing conventions and contribution basis the run used (format 1: start of year, full salary). */
  conventions: Conventions;
  /** For each member, every pair of options: differences at the run's λ with standard errors. */
  comparisons: OptionComparison[];
}

const EMPTY_CURVE: CeCurve = { logCe: new Float64Array(0), slope: new Float64Array(0) };

/** What summarising one pair gives: its result, and its CE curve for the break-even scan (empty with one option). */
export interface PairSummary {
  result: PairResult;
  curve: CeCurve;
}

/**
 * Summarise one pair from its store (every path simulated). Percentiles by selection, not
 * sorting (select.ts): per age by radix selection on the age's column, at retirement by
 * Floyd–Rivest selection on a copy of the pots. Working memory beyond the store: two Float64
 * arrays of `paths` values, the radix tables (512 KiB), and the returned real pots (on a SharedArrayBuffer with `shared`, so other threads
 * can read them). The store's arrays are only read.
 */
export function summarisePair(prepared: PreparedScenario, store: PairStore, options: { shared?: boolean } = {}): PairSummary {
  const { scenario } = prepared;
  const pair = prepared.pairs[store.pairIndex];
  const paths = scenario.paths;
  const antithetic = scenario.antithetic;
  const formatOne = scenario.version === 1;
  const { timeline, years } = pair;
  const ranks = scenario.percentiles;
  const keys = ranks.map(percentileKey);
  const bandRanks = percentileRanks(paths, ranks);

  // Per-age bands.
  const nominalBands: Record<string, number[]> = {};
  const realBands: Record<string, number[]> = {};
  for (const key of keys) {
    nominalBands[key] = [timeline.initialPot];
    realBands[key] = [timeline.initialPot];
  }
  if (store.bands !== null) {
    const scratch = RadixScratch.shared();
    for (let y = 0; y < years - 1; y++) {
      const atRanks = float32ValuesAtRanks(store.bands.subarray(y * paths, (y + 1) * paths), bandRanks, scratch);
      const deflator = timeline.deflators[y + 1];
      ranks.forEach((rank, r) => {
        const v = percentileFromRanks(paths, rank, bandRanks, atRanks);
        nominalBands[keys[r]].push(v);
        realBands[keys[r]].push(v / deflator);
      });
    }
  }

  // At retirement.
  const deflator = timeline.deflators[years];
  const terminal = store.terminal;
  const meanNominal = mean(terminal);
  const seNominal = standardErrorOfMean(terminal, antithetic);
  const terminalRealPots = new Float64Array(options.shared ? new SharedArrayBuffer(8 * paths) : new ArrayBuffer(8 * paths));
  for (let i = 0; i < paths; i++) terminalRealPots[i] = terminal[i] / deflator;
  // Ranks for the percentiles, the 5 % tail and the sparsity levels of each percentile.
  const tailCount = Math.max(1, Math.ceil(SHORTFALL_LEVEL * paths - 1e-9));
  const levels = ranks.map((rank) => sparsityLevels(rank / 100, paths));
  const wanted = new Set([...bandRanks, tailCount - 1]);
  for (const [a, b] of levels) for (const r of percentileRanks(paths, [a * 100, b * 100])) wanted.add(r);
  const terminalRanks = [...wanted].sort((x, y) => x - y);
  const atRanks = float64ValuesAtRanks(terminal, terminalRanks);
  const percentile = (rank: number) => percentileFromRanks(paths, rank, terminalRanks, atRanks);
  const nominalPercentiles: PercentileValues = {};
  const realPercentiles: PercentileValues = {};
  const realIncome: PercentileValues = {};
  const replacementRatio: PercentileValues = {};
  const af = prepared.annuityFactor;
  ranks.forEach((rank, r) => {
    const v = percentile(rank);
    nominalPercentiles[keys[r]] = v;
    realPercentiles[keys[r]] = v / deflator;
    realIncome[keys[r]] = v / deflator / af;
    replacementRatio[keys[r]] = v / deflator / af / timeline.realFinalSalary;
    nominalBands[keys[r]].push(v);
    realBands[keys[r]].push(v / deflator);
  });
  const atLevels = levels.map(([a, b]): [number, number] => [percentile(a * 100), percentile(b * 100)]);
  const tailQuantile = atRanks[terminalRanks.indexOf(tailCount - 1)];
  // The worst pots — those below the tail quantile, then as many equal to it as make the count —
  // in ascending order, summed in that order (engine 1's arithmetic on its sorted pots).
  const worst = new Float64Array(tailCount);
  let below = 0;
  for (let i = 0; i < paths; i++) if (terminal[i] < tailQuantile) worst[below++] = terminal[i];
  worst.fill(tailQuantile, below);
  worst.sort();
  let tailSum = 0;
  for (let i = 0; i < tailCount; i++) tailSum += worst[i];
  const shortfall = tailSum / tailCount;

  const targetRealPot = scenario.targetReplacementRatio * timeline.realFinalSalary * af;
  const threshold = targetRealPot * deflator;
  let reaching = 0;
  for (let i = 0; i < paths; i++) if (terminal[i] >= threshold) reaching++;
  const noTarget = !formatOne && !(targetRealPot > 0);
  const lambda = scenario.riskAversion;
  const logs = logPots(terminalRealPots);
  const psi = new Float64Array(paths);
  const cePot = Math.exp(logCeInfluence(logs, lambda, psi)); // = certaintyEquivalentPot(terminalRealPots, λ)
  const ceSe = influenceStandardError(psi, antithetic);

  // Standard errors of the figures at retirement (real money), antithetic-aware.
  const percentileErrors: PercentileValues = {};
  ranks.forEach((rank, r) => {
    quantileInfluence(terminal, rank / 100, nominalPercentiles[keys[r]], levels[r], atLevels[r], psi);
    percentileErrors[keys[r]] = (influenceStandardError(psi, antithetic) ?? Number.NaN) / deflator;
  });
  shareInfluence(terminal, threshold, psi);
  const probabilitySe = noTarget ? null : influenceStandardError(psi, antithetic);
  tailMeanInfluence(terminal, SHORTFALL_LEVEL, tailQuantile, shortfall, psi);
  const shortfallSe = (influenceStandardError(psi, antithetic) ?? Number.NaN) / deflator;

  const option = scenario.options[pair.optionIndex];
  const member = scenario.members[pair.memberIndex];
  const result: PairResult = {
    optionId: option.id,
    memberId: member.id,
    years,
    ages: timeline.ages,
    bands: { nominal: nominalBands, real: realBands },
    atRetirement: {
      mean: { nominal: meanNominal, real: mean(terminalRealPots) },
      standardError: { nominal: seNominal, real: standardErrorOfMean(terminalRealPots, antithetic) },
      percentiles: { nominal: nominalPercentiles, real: realPercentiles },
      targetRealPot,
      probabilityReachingTarget: noTarget ? null : reaching / paths,
      expectedShortfall: { level: SHORTFALL_LEVEL, nominal: shortfall, real: shortfall / deflator },
      realIncome,
      replacementRatio: timeline.realFinalSalary > 0 ? replacementRatio : null,
      certaintyEquivalent: {
        lambda,
        realPot: cePot,
        realAnnualReturn: ceReturn(prepared, timeline, cePot),
      },
      uncertainty: {
        percentiles: { real: percentileErrors },
        probabilityReachingTarget: probabilitySe,
        expectedShortfall: { real: shortfallSe },
        certaintyEquivalent: { realPot: ceSe === null ? null : ceSe * cePot },
      },
    },
    terminalRealPots,
  };
  // The CE curve only serves break-even searches between options.
  return { result, curve: scenario.options.length > 1 ? ceCurve(logs) : EMPTY_CURVE };
}

/**
 * Assemble the run's result from every pair's summary (in pair order) and the comparisons
 * (member by member, option pairs in the order of optionPairs).
 */
export function assembleResult(prepared: PreparedScenario, results: PairResult[], compared: ComparedPair[]): ProjectionResult {
  const { scenario } = prepared;
  return {
    format: 'keelson-projection-result',
    formatVersion: scenario.version,
    engineVersion: ENGINE_VERSION,
    seed: scenario.seed,
    paths: scenario.paths,
    antithetic: scenario.antithetic,
    percentiles: [...scenario.percentiles],
    inflation: scenario.inflation,
    riskAversion: scenario.riskAversion,
    annuityFactor: prepared.annuityFactor,
    stress: scenario.stress ? { ...scenario.stress } : null,
    results,
    breakEven: compared.map((c) => c.breakEven),
    conventions: { timing: { ...scenario.timing }, contributionBasis: { ...scenario.contributionBasis } },
    comparisons: compared.map((c) => c.comparison),
  };
}

/**
 * Plain JSON-ready copy of a result. Terminal real pots are left out unless `includePots`
 * (then they are written as arrays of numbers).
 */
export function resultToJson(result: ProjectionResult, options: { includePots?: boolean } = {}): unknown {
  return {
    ...result,
    results: result.results.map(({ terminalRealPots, ...rest }) =>
      options.includePots ? { ...rest, terminalRealPots: Array.from(terminalRealPots) } : rest,
    ),
  };
}
