import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import { runScenarioThreaded, splitPaths } from '@/server/compute/threads';
import { resultToJson, runScenario, type ScenarioInput } from '@/simulation';

import { baseScenario } from './helpers';

const asJson = (r: Parameters<typeof resultToJson>[0]) => JSON.stringify(resultToJson(r, { includePots: true }));

describe('threaded runner', () => {
  it('splits paths into contiguous ranges covering every path once', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 100000 }), fc.integer({ min: 1, max: 8 }), fc.boolean(), (paths, parts, antithetic) => {
        const ranges = splitPaths(paths, parts, antithetic);
        expect(ranges[0][0]).toBe(0);
        expect(ranges.at(-1)![1]).toBe(paths);
        for (let k = 1; k < ranges.length; k++) expect(ranges[k][0]).toBe(ranges[k - 1][1]);
        expect(ranges.length).toBeLessThanOrEqual(parts);
      }),
    );
  });

  it('gives byte-identical results on 1 and 2 threads and on the calling thread, in both formats', async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 1e6 }), fc.integer({ min: 300, max: 1500 }), fc.boolean(), fc.constantFrom(1, 2), async (seed, halfPaths, antithetic, version) => {
        const scenario = { ...baseScenario({ seed, paths: 2 * halfPaths + (antithetic ? 0 : seed % 2), antithetic }), version } as ScenarioInput;
        const one = asJson(await runScenarioThreaded(scenario, { threads: 1 }));
        const two = asJson(await runScenarioThreaded(scenario, { threads: 2 }));
        expect(one === two).toBe(true);
        expect(asJson(runScenario(scenario)) === two).toBe(true);
      }),
      { numRuns: 4 },
    );
  });

  it('reports progress up to 1 and rejects invalid input before starting workers', async () => {
    const seen: number[] = [];
    await runScenarioThreaded(baseScenario({ paths: 2000 }), { threads: 2, onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(1);
    expect(Math.max(...seen)).toBeCloseTo(1, 12);
    await expect(runScenarioThreaded(baseScenario({ paths: -1 }), { threads: 2 })).rejects.toThrow(/paths/);
  });
});
