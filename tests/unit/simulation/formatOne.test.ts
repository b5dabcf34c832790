import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';

import { storeVariant } from '@/server/jobs/result';
import { resultToJson, runScenario, type ProjectionResult, type ScenarioInput } from '@/simulation';

import recorded from '../../fixtures/engine-v1/digests.json';

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

type Json = Record<string, unknown>;
const pick = (o: Json, keys: string[]): Json => Object.fromEntries(keys.map((k) => [k, o[k]]));

/**
 * The fields (in their order) that engine 1.0.0 wrote. Later engines may add fields to a
 * format-1 result; every field that existed must keep its bytes. The engine version is
 * provenance, not a figure: it is set back to the recorded one before hashing.
 */
function asRecorded(result: ProjectionResult): string {
  const json = resultToJson(result, { includePots: true }) as Json;
  const top = pick({ ...json, engineVersion: '1.0.0' }, [
    'format', 'formatVersion', 'engineVersion', 'seed', 'paths', 'antithetic', 'percentiles', 'inflation',
    'riskAversion', 'annuityFactor', 'stress', 'results', 'breakEven',
  ]);
  top.results = (json.results as Json[]).map((r) => {
    const at = r.atRetirement as Json;
    return {
      ...pick(r, ['optionId', 'memberId', 'years', 'ages', 'bands']),
      atRetirement: pick(at, [
        'mean', 'standardError', 'percentiles', 'targetRealPot', 'probabilityReachingTarget', 'expectedShortfall',
        'realIncome', 'replacementRatio', 'certaintyEquivalent',
      ]),
      terminalRealPots: r.terminalRealPots,
    };
  });
  top.breakEven = (json.breakEven as Json[]).map((b) => pick(b, ['memberId', 'optionA', 'optionB', 'lambda', 'status']));
  return JSON.stringify(top);
}

/** The stored figures as engine 1.0.0's server stored them (extra standard errors and pot samples). */
function storedAsRecorded(result: ProjectionResult): string {
  const variant = storeVariant(result).variant as unknown as { result: Json; samples: unknown };
  const r = JSON.parse(asRecorded(result)) as Json;
  const byPair = (variant.result.results as Json[]).map((p) => p.extraStandardErrors);
  r.results = (r.results as Json[]).map(({ terminalRealPots: _pots, ...rest }, i) => ({ ...rest, extraStandardErrors: byPair[i] }));
  return JSON.stringify({ result: r, samples: variant.samples });
}

describe('scenario format 1 keeps the results of engine 1.0.0 byte for byte', () => {
  it.each(recorded.cases.map((c) => [c.name, c] as const))('%s', (_name, c) => {
    const result = runScenario(c.scenario as ScenarioInput);
    const text = asRecorded(result);
    expect(text.length, 'length of the result JSON').toBe(c.resultBytes);
    expect(sha256(text), 'sha256 of the result JSON with every terminal pot').toBe(c.resultSha256);
    const stored = storedAsRecorded(result);
    expect(stored.length, 'length of the stored variant').toBe(c.storedVariantBytes);
    expect(sha256(stored), 'sha256 of the stored variant').toBe(c.storedVariantSha256);
  });
});
