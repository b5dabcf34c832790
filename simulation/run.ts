import type { CeCurve } from './breakEven';
import { compareMember, pairIndexOf, type ComparedPair } from './compare';
import { DEFAULT_BAND_BUDGET_BYTES, planBatches, prepareScenario, type PreparedScenario } from './prepare';
import { createPairStores, simulateRange } from './project';
import { parseScenario } from './schema';
import { assembleResult, summarisePair, type PairResult, type ProjectionResult } from './summary';

export interface RunOptions {
  /** Called with the fraction of the run done (0 … 1). */
  onProgress?: (fractionDone: number) => void;
  /** Cap on per-age working storage for one batch of pairs (default 256 MiB); see planBatches. */
  bandBudgetBytes?: number;
}

/** Share of a batch's progress given to simulating (the rest is summarising). */
export const SIMULATE_SHARE = 0.8;

/**
 * Validate and run a scenario on the current thread.
 *
 * Phases, the same as the threaded runner's (server/compute/):
 * 1. simulate — pairs in batches whose per-age storage (4 bytes × paths × (years − 1) per pair)
 *    stays within `bandBudgetBytes` (at least one pair per batch); the market is generated once
 *    per block of paths for the whole batch;
 * 2. summarise — each pair of the batch (bands, figures at retirement, standard errors, CE
 *    curve); the batch's per-age storage is then released;
 * 3. compare — member by member, every pair of options (break-even λs, differences at the run's λ).
 * Retained: the terminal real pots, 8 bytes × paths per pair, plus the summaries.
 *
 * Throws ScenarioValidationError (with every issue) for invalid input.
 */
export function runScenario(input: unknown, options: RunOptions = {}): ProjectionResult {
  const scenario = parseScenario(input);
  const prepared = prepareScenario(scenario);
  const batches = planBatches(prepared, options.bandBudgetBytes ?? DEFAULT_BAND_BUDGET_BYTES);
  const results: PairResult[] = new Array(prepared.pairs.length);
  const curves: CeCurve[] = new Array(prepared.pairs.length);
  const progress = options.onProgress;
  batches.forEach((batch, b) => {
    const stores = createPairStores(prepared, batch);
    simulateRange(prepared, 0, scenario.paths, stores, {
      onProgress: progress ? (f) => progress((b + SIMULATE_SHARE * f) / batches.length) : undefined,
    });
    for (const store of stores) {
      const summary = summarisePair(prepared, store);
      results[store.pairIndex] = summary.result;
      curves[store.pairIndex] = summary.curve;
    }
    progress?.((b + 1) / batches.length);
  });
  const compared = scenario.members.flatMap((_, m) => runMemberComparison(prepared, m, results, curves));
  return assembleResult(prepared, results, compared);
}

/** Phase 3 for one member, from the summarised pairs (real pots and CE curves, in pair order). */
export function runMemberComparison(
  prepared: PreparedScenario,
  memberIndex: number,
  results: readonly { terminalRealPots: Float64Array; atRetirement: { targetRealPot: number } }[],
  curves: readonly CeCurve[],
): ComparedPair[] {
  const indices = prepared.scenario.options.map((_, o) => pairIndexOf(prepared, o, memberIndex));
  return compareMember(
    prepared,
    memberIndex,
    indices.map((i) => results[i].terminalRealPots),
    indices.map((i) => curves[i]),
    results[indices[0]].atRetirement.targetRealPot,
  );
}
