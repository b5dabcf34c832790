import { findCrossings, type CeCurve, type Crossing } from './breakEven';
import type { MemberTimeline } from './cashflows';
import type { PreparedScenario } from './prepare';
import { float64ValuesAtRanks, percentileFromRanks, percentileRanks } from './select';
import {
  difference,
  influenceStandardError,
  logCeInfluence,
  quantileInfluence,
  sparsityLevels,
  type Difference,
} from './uncertainty';
import { breakEvenLambda, ceAnnualReturn, ceRealReturn, logPots, type BreakEven } from './utility';

/**
 * Options compared for one member on the same paths (paired: common random numbers make the
 * options' figures move together, and the standard errors of the differences count that).
 * Every difference is option A minus option B, in real money or as a probability, with its
 * antithetic-aware standard error and whether it is too close to call (uncertainty.ts).
 *
 * - certaintyEquivalent: CE_A − CE_B at λ; influence values CE_A·ψᵢᴬ − CE_B·ψᵢᴮ with ψ those of
 *   ln CE.
 * - medianPot: median real pot of A minus that of B; influence values of each sample median
 *   (Bahadur representation, sparsity by the Hall–Sheather difference quotient), differenced.
 * - probabilityReachingTarget: share of paths reaching the member's target, A minus B;
 *   influence values 1{Wᵢᴬ ≥ t} − 1{Wᵢᴮ ≥ t} (null when there is no target).
 *
 * The influence values of each option are computed once per member (memory: three arrays of
 * `paths` values per option), then every pair of options is a subtraction.
 */
export interface OptionComparison {
  memberId: string;
  optionA: string;
  optionB: string;
  lambda: number;
  certaintyEquivalent: Difference;
  medianPot: Difference;
  probabilityReachingTarget: Difference | null;
}

/** Break-even λ of two options for one member. */
export interface BreakEvenResult extends BreakEven {
  memberId: string;
  optionA: string;
  optionB: string;
  /**
   * Every λ in [−5, 50] where the two certainty-equivalent pots are equal, ascending, each with
   * its standard error and 95 % interval (delta method; breakEven.ts). `lambda` is the first
   * (format 1: the lowest crossing on engine 1's 21-point grid, kept for reproducibility).
   */
  crossings: Crossing[];
}

/** One option's figures for one member at λ, with their influence values. */
export interface OptionInfluence {
  cePot: number;
  /** Influence values of the CE pot (CE·ψ of ln CE). */
  ce: Float64Array;
  median: number;
  medianPsi: Float64Array;
  /** Share of paths at or above the target, and each path's indicator (null without a target). */
  share: number | null;
  reached: Uint8Array | null;
}

/** See {@link OptionInfluence}. */
export function optionInfluence(pots: Float64Array, lambda: number, targetRealPot: number | null, logs: Float64Array = logPots(pots)): OptionInfluence {
  const n = pots.length;
  const ce = new Float64Array(n);
  const cePot = Math.exp(logCeInfluence(logs, lambda, ce)); // = certaintyEquivalentPot(pots, λ)
  for (let i = 0; i < n; i++) ce[i] *= cePot;
  const medianPsi = new Float64Array(n);
  const levels = sparsityLevels(0.5, n);
  const ranks = percentileRanks(n, [levels[0] * 100, 50, levels[1] * 100]);
  const atRanks = float64ValuesAtRanks(pots, ranks);
  const at = (p: number) => percentileFromRanks(n, p, ranks, atRanks);
  const median = at(50);
  quantileInfluence(pots, 0.5, median, levels, [at(levels[0] * 100), at(levels[1] * 100)], medianPsi);
  let share: number | null = null;
  let reached: Uint8Array | null = null;
  if (targetRealPot !== null && targetRealPot > 0) {
    reached = new Uint8Array(n);
    let count = 0;
    for (let i = 0; i < n; i++) {
      if (pots[i] >= targetRealPot) {
        reached[i] = 1;
        count++;
      }
    }
    share = count / n;
  }
  return { cePot, ce, median, medianPsi, share, reached };
}

/** A minus B from their influence values (same paths). */
export function compareInfluences(a: OptionInfluence, b: OptionInfluence, lambda: number, antithetic: boolean): Omit<OptionComparison, 'memberId' | 'optionA' | 'optionB'> {
  const n = a.ce.length;
  const psi = new Float64Array(n);
  for (let i = 0; i < n; i++) psi[i] = a.ce[i] - b.ce[i];
  const certaintyEquivalent = difference(a.cePot - b.cePot, influenceStandardError(psi, antithetic), n);
  for (let i = 0; i < n; i++) psi[i] = a.medianPsi[i] - b.medianPsi[i];
  const medianPot = difference(a.median - b.median, influenceStandardError(psi, antithetic), n);
  let probabilityReachingTarget: Difference | null = null;
  if (a.reached && b.reached && a.share !== null && b.share !== null) {
    for (let i = 0; i < n; i++) psi[i] = a.reached[i] - b.reached[i];
    probabilityReachingTarget = difference(a.share - b.share, influenceStandardError(psi, antithetic), n);
  }
  return { lambda, certaintyEquivalent, medianPot, probabilityReachingTarget };
}

/** The figures of comparing A with B at λ (ids added by the caller). */
export function compareOptions(
  potsA: Float64Array,
  potsB: Float64Array,
  opts: { lambda: number; targetRealPot: number | null; antithetic: boolean },
): Omit<OptionComparison, 'memberId' | 'optionA' | 'optionB'> {
  const a = optionInfluence(potsA, opts.lambda, opts.targetRealPot);
  const b = optionInfluence(potsB, opts.lambda, opts.targetRealPot);
  return compareInfluences(a, b, opts.lambda, opts.antithetic);
}

/** Index of the pair (option, member) in prepared.pairs. */
export function pairIndexOf(prepared: PreparedScenario, optionIndex: number, memberIndex: number): number {
  return optionIndex * prepared.scenario.members.length + memberIndex;
}

/** Every pair of options (a < b) in the scenario's order. */
export function optionPairs(options: number): [number, number][] {
  const pairs: [number, number][] = [];
  for (let a = 0; a < options; a++) for (let b = a + 1; b < options; b++) pairs.push([a, b]);
  return pairs;
}

export interface ComparedPair {
  breakEven: BreakEvenResult;
  comparison: OptionComparison;
}

/**
 * Break-even λs and the comparison at the run's λ for every pair of options of one member,
 * from each option's real pots and CE curve (in option order). Pairs in the order of
 * optionPairs.
 */
export function compareMember(
  prepared: PreparedScenario,
  memberIndex: number,
  pots: readonly Float64Array[],
  curves: readonly CeCurve[],
  targetRealPot: number,
): ComparedPair[] {
  const { scenario } = prepared;
  const lambda = scenario.riskAversion;
  const target = targetRealPot > 0 ? targetRealPot : null;
  const logs = pots.map(logPots);
  const influence = pots.map((p, o) => optionInfluence(p, lambda, target, logs[o]));
  const memberId = scenario.members[memberIndex].id;
  return optionPairs(scenario.options.length).map(([a, b]) => {
    const ids = { memberId, optionA: scenario.options[a].id, optionB: scenario.options[b].id };
    const found = findCrossings(logs[a], logs[b], curves[a], curves[b], scenario.antithetic);
    const first: BreakEven =
      scenario.version === 1 ? breakEvenLambda(pots[a], pots[b]) : { lambda: found.crossings[0]?.lambda ?? null, status: found.status };
    return {
      breakEven: { ...ids, ...first, crossings: found.crossings },
      comparison: { ...ids, ...compareInfluences(influence[a], influence[b], lambda, scenario.antithetic) },
    };
  });
}

/** One option for one member at a chosen λ. */
export interface PairAtLambda {
  optionId: string;
  memberId: string;
  certaintyEquivalent: { realPot: number; realAnnualReturn: number | null; standardError: number | null };
}

/** A member's options from the highest certainty equivalent down, each against the next. */
export interface MemberRanking {
  memberId: string;
  options: {
    optionId: string;
    realPot: number;
    /** This option minus the next one down (null for the last). */
    toNext: Difference | null;
  }[];
}

export interface ComparisonAtLambda {
  lambda: number;
  pairs: PairAtLambda[];
  differences: OptionComparison[];
  ranking: MemberRanking[];
}

/**
 * Certainty equivalents, their returns and standard errors, every paired difference and the
 * ranking at any λ, from every path's real pot — `pots(optionIndex, memberIndex)` — of a run of
 * `prepared` (exact: nothing is re-simulated or sampled); for `members` (default all).
 */
export function comparisonAtLambda(
  prepared: PreparedScenario,
  pots: (optionIndex: number, memberIndex: number) => Float64Array,
  lambda: number,
  members: readonly number[] = prepared.scenario.members.map((_, m) => m),
): ComparisonAtLambda {
  const { scenario } = prepared;
  const pairs: PairAtLambda[] = [];
  const differences: OptionComparison[] = [];
  const ranking: MemberRanking[] = [];
  members.forEach((m) => {
    const member = scenario.members[m];
    const first = prepared.pairs[pairIndexOf(prepared, 0, m)];
    const target = first.timeline.realFinalSalary * scenario.targetReplacementRatio * prepared.annuityFactor;
    const influence = scenario.options.map((_, o) => optionInfluence(pots(o, m), lambda, target > 0 ? target : null));
    const own: OptionComparison[] = [];
    for (const [a, b] of optionPairs(scenario.options.length)) {
      own.push({ memberId: member.id, optionA: scenario.options[a].id, optionB: scenario.options[b].id, ...compareInfluences(influence[a], influence[b], lambda, scenario.antithetic) });
    }
    differences.push(...own);
    scenario.options.forEach((option, o) => {
      const inf = influence[o];
      const se = influenceStandardError(inf.ce, scenario.antithetic);
      pairs.push({
        optionId: option.id,
        memberId: member.id,
        certaintyEquivalent: { realPot: inf.cePot, realAnnualReturn: ceReturn(prepared, first.timeline, inf.cePot), standardError: se },
      });
    });
    const order = scenario.options.map((_, o) => o).sort((x, y) => influence[y].cePot - influence[x].cePot);
    ranking.push({
      memberId: member.id,
      options: order.map((o, k) => {
        const next = order[k + 1];
        let toNext: Difference | null = null;
        if (next !== undefined) {
          const d = own.find((c) => c.optionA === scenario.options[Math.min(o, next)].id && c.optionB === scenario.options[Math.max(o, next)].id)!.certaintyEquivalent;
          toNext = o < next ? d : { ...d, value: -d.value };
        }
        return { optionId: scenario.options[o].id, realPot: influence[o].cePot, toNext };
      }),
    });
  });
  return { lambda, pairs, differences, ranking };
}

/** The CE real return under the scenario's format and conventions. */
export function ceReturn(prepared: PreparedScenario, timeline: MemberTimeline, cePot: number): number | null {
  const { scenario } = prepared;
  return scenario.version === 1
    ? ceAnnualReturn(cePot, { initialPot: timeline.initialPot, contributions: timeline.realContributions })
    : ceRealReturn(cePot, timeline, scenario.timing.contributions);
}
