import type { PairChunk } from './project';
import type { PreparedScenario } from './prepare';
import {
  fractionAtLeast,
  lowerTailMean,
  mean,
  percentileKey,
  percentileOfSorted,
  standardErrorOfMean,
} from './statistics';
import { breakEvenLambda, ceAnnualReturn, certaintyEquivalentPot, type BreakEven } from './utility';
import { ENGINE_VERSION, FORMAT_VERSION } from './version';

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
    /** Fraction of paths whose real pot is at least targetRealPot. */
    probabilityReachingTarget: number;
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
  };
  /** Real pot at retirement for every path, in path order (not written to JSON unless asked). */
  terminalRealPots: Float64Array;
}

export interface BreakEvenResult extends BreakEven {
  memberId: string;
  optionA: string;
  optionB: string;
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
}

/**
 * Summarise one pair from its chunks (any split of the paths, in any order; they are put in
 * path order). Working memory beyond the chunks: one Float32 column of `paths` values and the
 * retained Float64 terminal pots.
 */
export function summarisePair(prepared: PreparedScenario, pairIndex: number, chunks: readonly PairChunk[]): PairResult {
  const { scenario } = prepared;
  const pair = prepared.pairs[pairIndex];
  const ordered = [...chunks].filter((c) => c.pairIndex === pairIndex).sort((a, b) => a.start - b.start);
  const paths = scenario.paths;
  let expected = 0;
  for (const c of ordered) {
    if (c.start !== expected) throw new RangeError(`path chunks are not contiguous at path ${expected}`);
    expected += c.length;
  }
  if (expected !== paths) throw new RangeError(`path chunks cover ${expected} of ${paths} paths`);
  const { timeline, years } = pair;
  const ranks = scenario.percentiles;
  const keys = ranks.map(percentileKey);

  // Per-age bands.
  const nominalBands: Record<string, number[]> = {};
  const realBands: Record<string, number[]> = {};
  for (const key of keys) {
    nominalBands[key] = [timeline.initialPot];
    realBands[key] = [timeline.initialPot];
  }
  const column = new Float32Array(paths);
  for (let y = 0; y < years - 1; y++) {
    let offset = 0;
    for (const c of ordered) {
      column.set(c.bands.subarray(y * c.length, (y + 1) * c.length), offset);
      offset += c.length;
    }
    column.sort();
    const deflator = timeline.deflators[y + 1];
    ranks.forEach((rank, r) => {
      const v = percentileOfSorted(column, rank);
      nominalBands[keys[r]].push(v);
      realBands[keys[r]].push(v / deflator);
    });
  }

  // At retirement.
  const deflator = timeline.deflators[years];
  const terminal = new Float64Array(paths);
  let offset = 0;
  for (const c of ordered) {
    terminal.set(c.terminal, offset);
    offset += c.length;
  }
  const meanNominal = mean(terminal);
  const seNominal = standardErrorOfMean(terminal, scenario.antithetic);
  const terminalRealPots = new Float64Array(paths);
  for (let i = 0; i < paths; i++) terminalRealPots[i] = terminal[i] / deflator;
  const sorted = terminal.slice().sort();
  const nominalPercentiles: PercentileValues = {};
  const realPercentiles: PercentileValues = {};
  const realIncome: PercentileValues = {};
  const replacementRatio: PercentileValues = {};
  const af = prepared.annuityFactor;
  ranks.forEach((rank, r) => {
    const v = percentileOfSorted(sorted, rank);
    nominalPercentiles[keys[r]] = v;
    realPercentiles[keys[r]] = v / deflator;
    realIncome[keys[r]] = v / deflator / af;
    replacementRatio[keys[r]] = v / deflator / af / timeline.realFinalSalary;
    nominalBands[keys[r]].push(v);
    realBands[keys[r]].push(v / deflator);
  });
  const targetRealPot = scenario.targetReplacementRatio * timeline.realFinalSalary * af;
  const shortfall = lowerTailMean(sorted, SHORTFALL_LEVEL);
  const lambda = scenario.riskAversion;
  const cePot = certaintyEquivalentPot(terminalRealPots, lambda);
  const option = scenario.options[pair.optionIndex];
  const member = scenario.members[pair.memberIndex];
  return {
    optionId: option.id,
    memberId: member.id,
    years,
    ages: timeline.ages,
    bands: { nominal: nominalBands, real: realBands },
    atRetirement: {
      mean: { nominal: meanNominal, real: mean(terminalRealPots) },
      standardError: { nominal: seNominal, real: standardErrorOfMean(terminalRealPots, scenario.antithetic) },
      percentiles: { nominal: nominalPercentiles, real: realPercentiles },
      targetRealPot,
      probabilityReachingTarget: fractionAtLeast(sorted, targetRealPot * deflator),
      expectedShortfall: { level: SHORTFALL_LEVEL, nominal: shortfall, real: shortfall / deflator },
      realIncome,
      replacementRatio: timeline.realFinalSalary > 0 ? replacementRatio : null,
      certaintyEquivalent: {
        lambda,
        realPot: cePot,
        realAnnualReturn: ceAnnualReturn(cePot, {
          initialPot: timeline.initialPot,
          contributions: timeline.realContributions,
        }),
      },
    },
    terminalRealPots,
  };
}

/** Assemble the run's result from every pair's summary (in pair order). */
export function assembleResult(prepared: PreparedScenario, results: PairResult[]): ProjectionResult {
  const { scenario } = prepared;
  const M = scenario.members.length;
  const O = scenario.options.length;
  const breakEven: BreakEvenResult[] = [];
  for (let m = 0; m < M; m++) {
    for (let a = 0; a < O; a++) {
      for (let b = a + 1; b < O; b++) {
        const ra = results[a * M + m];
        const rb = results[b * M + m];
        breakEven.push({
          memberId: scenario.members[m].id,
          optionA: scenario.options[a].id,
          optionB: scenario.options[b].id,
          ...breakEvenLambda(ra.terminalRealPots, rb.terminalRealPots),
        });
      }
    }
  }
  return {
    format: 'keelson-projection-result',
    formatVersion: FORMAT_VERSION,
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
    breakEven,
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
