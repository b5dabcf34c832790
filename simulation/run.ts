import { DEFAULT_BAND_BUDGET_BYTES, planBatches, prepareScenario } from './prepare';
import { simulateRange } from './project';
import { parseScenario } from './schema';
import { assembleResult, summarisePair, type PairResult, type ProjectionResult } from './summary';

export interface RunOptions {
  /** Called with the fraction of the run done (0 … 1). */
  onProgress?: (fractionDone: number) => void;
  /** Cap on per-age working storage for one batch of pairs (default 256 MiB); see planBatches. */
  bandBudgetBytes?: number;
}

/**
 * Validate and run a scenario on the current thread.
 *
 * Memory: pairs are simulated in batches whose per-age storage (4 bytes × paths × (years − 1)
 * per pair) stays within `bandBudgetBytes` (at least one pair per batch); each batch is
 * summarised and its per-age storage released before the next. Retained: the terminal real
 * pots, 8 bytes × paths per pair, plus the summaries. Draws are shared by every pair in a
 * batch; a run with several batches draws them again per batch (same numbers).
 *
 * Throws ScenarioValidationError (with every issue) for invalid input.
 */
export function runScenario(input: unknown, options: RunOptions = {}): ProjectionResult {
  const scenario = parseScenario(input);
  const prepared = prepareScenario(scenario);
  const batches = planBatches(prepared, options.bandBudgetBytes ?? DEFAULT_BAND_BUDGET_BYTES);
  const results: PairResult[] = new Array(prepared.pairs.length);
  batches.forEach((batch, b) => {
    const chunks = simulateRange(prepared, 0, scenario.paths, batch, {
      onProgress: options.onProgress ? (f) => options.onProgress?.((b + f) / batches.length) : undefined,
    });
    for (const pairIndex of batch) {
      const own = chunks.filter((c) => c.pairIndex === pairIndex);
      results[pairIndex] = summarisePair(prepared, pairIndex, own);
    }
  });
  return assembleResult(prepared, results);
}
