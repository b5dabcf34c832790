import { findCrossings, type CeCurve, type Crossing } from './breakEven';
import type { PreparedScenario } from './prepare';
import { percentileOfSelected, percentileRanks, selectManyInPlace } from './select';
import {
  difference,
  influenceStandardError,
  logCeInfluence,
  quantileInfluence,
  shareInfluence,
  sparsityLevels,
  type Difference,
} from './uncertainty';
import { breakEvenLambda, certaintyEquivalentPot, logPots, type BreakEven } from './utility';

/**
 * Two options compared for one member on the same paths (paired: common random numbers make
 * the two options' figures move together, and the standard errors of the differences count
 * that). Every difference is option A minus option B, in real money or as a probability, with
 * its antithetic-aware standard error and whether it is too close to call (uncertainty.ts).
 *
 * - certaintyEquivalent: CE_A − CE_B at λ; influence values CE_A·ψᵢᴬ − CE_B·ψᵢᴮ with ψ those of
 *   ln CE.
 * - medianPot: median real pot of A minus that of B; influence values of each sample median
 *   (Bahadur representation, sparsity by the Hall–Sheather difference quotient), differenced.
 * - probabilityReachingTarget: share of paths reaching the member's target, A minus B;
 *   influence values 1{Wᵢᴬ ≥ t} − 1{Wᵢᴮ ≥ t} (null when there is no target).
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

/** The figures of comparing A with B at λ (ids added by the caller). */
export function compareOptions(
  potsA: Float64Array,
  potsB: Float64Array,
  opts: { lambda: number; targetRealPot: number | null; antithetic: boolean; logsA?: Float64Array; logsB?: Float64Array },
): Omit<OptionComparison, 'memberId' | 'optionA' | 'optionB'> {
  const n = potsA.length;
  const { lambda, antithetic } = opts;
  const psiA = new Float64Array(n);
  const psiB = new Float64Array(n);
  logCeInfluence(opts.logsA ?? logPots(potsA), lambda, psiA);
  logCeInfluence(opts.logsB ?? logPots(potsB), lambda, psiB);
  const ceA = certaintyEquivalentPot(potsA, lambda);
  const ceB = certaintyEquivalentPot(potsB, lambda);
  for (let i = 0; i < n; i++) psiA[i] = ceA * psiA[i] - ceB * psiB[i];
  const certaintyEquivalent = difference(ceA - ceB, influenceStandardError(psiA, antithetic), n);

  const medianA = medianInfluence(potsA, psiA);
  const medianB = medianInfluence(potsB, psiB);
  for (let i = 0; i < n; i++) psiA[i] -= psiB[i];
  const medianPot = difference(medianA - medianB, influenceStandardError(psiA, antithetic), n);

  let probabilityReachingTarget: Difference | null = null;
  const t = opts.targetRealPot;
  if (t !== null && t > 0) {
    shareInfluence(potsA, t, psiA);
    shareInfluence(potsB, t, psiB);
    let reachA = 0;
    let reachB = 0;
    for (let i = 0; i < n; i++) {
      if (potsA[i] >= t) reachA++;
      if (potsB[i] >= t) reachB++;
      psiA[i] -= psiB[i];
    }
    probabilityReachingTarget = difference(reachA / n - reachB / n, influenceStandardError(psiA, antithetic), n);
  }
  return { lambda, certaintyEquivalent, medianPot, probabilityReachingTarget };
}

/** The sample median of `pots` (percentile rule of the engine) and its influence values into `out`. */
function medianInfluence(pots: Float64Array, out: Float64Array): number {
  const n = pots.length;
  const levels = sparsityLevels(0.5, n);
  const copy = pots.slice();
  selectManyInPlace(copy, percentileRanks(n, [50, levels[0] * 100, levels[1] * 100]));
  const median = percentileOfSelected(copy, 50);
  const atLevels: [number, number] = [percentileOfSelected(copy, levels[0] * 100), percentileOfSelected(copy, levels[1] * 100)];
  quantileInfluence(pots, 0.5, median, levels, atLevels, out);
  return median;
}

/** One member × pair of options to compare (indices into the scenario's lists). */
export interface ComparisonTask {
  memberIndex: number;
  optionA: number;
  optionB: number;
}

/** Every member × pair of options (a < b), member by member. */
export function comparisonTasks(prepared: PreparedScenario): ComparisonTask[] {
  const tasks: ComparisonTask[] = [];
  const M = prepared.scenario.members.length;
  const O = prepared.scenario.options.length;
  for (let m = 0; m < M; m++) for (let a = 0; a < O; a++) for (let b = a + 1; b < O; b++) tasks.push({ memberIndex: m, optionA: a, optionB: b });
  return tasks;
}

/** Index of the pair (option, member) in prepared.pairs. */
export function pairIndexOf(prepared: PreparedScenario, optionIndex: number, memberIndex: number): number {
  return optionIndex * prepared.scenario.members.length + memberIndex;
}

export interface ComparedPair {
  breakEven: BreakEvenResult;
  comparison: OptionComparison;
}

/** Break-even λs and the comparison at the run's λ for one task, from the two pairs' real pots and curves. */
export function compareTask(
  prepared: PreparedScenario,
  task: ComparisonTask,
  potsA: Float64Array,
  potsB: Float64Array,
  curveA: CeCurve,
  curveB: CeCurve,
  targetRealPot: number,
): ComparedPair {
  const { scenario } = prepared;
  const ids = { memberId: scenario.members[task.memberIndex].id, optionA: scenario.options[task.optionA].id, optionB: scenario.options[task.optionB].id };
  const logsA = logPots(potsA);
  const logsB = logPots(potsB);
  const found = findCrossings(logsA, logsB, curveA, curveB, scenario.antithetic);
  const first: BreakEven =
    scenario.version === 1
      ? breakEvenLambda(potsA, potsB)
      : { lambda: found.crossings[0]?.lambda ?? null, status: found.status };
  return {
    breakEven: { ...ids, ...first, crossings: found.crossings },
    comparison: {
      ...ids,
      ...compareOptions(potsA, potsB, {
        lambda: scenario.riskAversion,
        targetRealPot: targetRealPot > 0 ? targetRealPot : null,
        antithetic: scenario.antithetic,
        logsA,
        logsB,
      }),
    },
  };
}
