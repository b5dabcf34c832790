import fc from 'fast-check';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';

import {
  growingAnnuityFutureValue,
  lognormalFromMoments,
  parseScenario,
  pathLogReturns,
  prepareScenario,
  resultToJson,
  runScenario,
  createPairStores,
  simulateRange,
  summarisePair,
  type ScenarioInput,
} from './engineImports';
import { baseScenario, describeCheck } from './helpers';

function oneFund(expectedReturn: number, volatility: number, annualCharge = 0) {
  return [{ id: 'f', name: 'Only Fund', expectedReturn, volatility, annualCharge }];
}

/**
 * Format 1, and format 2 with the conventions these closed forms assume (weights and
 * contributions at the start of each year); format 2's own conventions have their closed forms
 * in conventions.test.ts.
 */
const FORMATS: [string, Partial<ScenarioInput>][] = [
  ['format 1', {}],
  ['format 2', { version: 2, timing: { glideWeights: 'start-of-year', contributions: 'start-of-year' } } as Partial<ScenarioInput>],
];

describe.each(FORMATS)('projection engine against closed forms (%s)', (_label, format) => {
  it('with zero volatility equals the future value of a growing annuity (start-of-year payments, net of charges)', () => {
    const funds = baseScenario().funds.map((f) => ({ ...f, volatility: 0 }));
    const result = runScenario(
      baseScenario({
        ...format,
        funds,
        correlations: undefined,
        paths: 8,
        options: [{ id: 'fixed', name: 'Fixed', glidePath: [{ yearsToRetirement: 0, weights: { eq: 0.6, bd: 0.4 } }] }],
        members: [{ id: 'm', age: 30, retirementAge: 65, salary: 50000, salaryGrowth: 0.03, contributionRate: 0.1, pot: 10000 }],
      }),
    );
    // Growth factor per year q = (1 + Σwm)(1 − Σwc); growing-annuity handbook formula adapted to start-of-year payments.
    const q = (1 + 0.6 * 0.07 + 0.4 * 0.035) * (1 - (0.6 * 0.003 + 0.4 * 0.002));
    const expected = 10000 * q ** 35 + growingAnnuityFutureValue(5000, 0.03, q - 1, 35, 'start');
    const pots = result.results[0].terminalRealPots;
    for (const pot of pots) {
      const nominal = pot * 1.02 ** 35;
      expect(Math.abs(nominal / expected - 1), describeCheck('pot', nominal, expected, 1e-12)).toBeLessThan(1e-12);
    }
    expect(result.results[0].atRetirement.standardError.nominal).toBe(0);
  });

  it('one fund, lump sum, no contributions: terminal pot percentiles and mean match the lognormal', () => {
    const n = 10;
    const paths = 20000;
    const charge = 0.005;
    const result = runScenario(
      baseScenario({
        ...format,
        paths,
        inflation: 0,
        funds: oneFund(0.07, 0.15, charge),
        correlations: undefined,
        options: [{ id: 'o', name: 'O', glidePath: [{ yearsToRetirement: 0, weights: { f: 1 } }] }],
        members: [{ id: 'm', age: 55, retirementAge: 55 + n, salary: 0, salaryGrowth: 0, contributionRate: 0, pot: 100000 }],
        percentiles: [5, 25, 50, 75, 95],
      }),
    );
    const { mu, sigma } = lognormalFromMoments(0.07, 0.15);
    const muN = Math.log(100000) + n * (mu + Math.log(1 - charge));
    const sigmaN = sigma * Math.sqrt(n);
    const at = result.results[0].atRetirement;
    for (const p of [5, 25, 50, 75, 95]) {
      // Reference library: jstat.lognormal.inv. Standard error of a sample p-quantile √(p(1−p)/n)/f(q)
      // (asymptotic normality of sample quantiles, Mosteller 1946).
      const expected = jStat.lognormal.inv(p / 100, muN, sigmaN);
      const se = Math.sqrt(((p / 100) * (1 - p / 100)) / paths) / jStat.lognormal.pdf(expected, muN, sigmaN);
      const computed = at.percentiles.nominal[`p${p}`];
      expect(Math.abs(computed - expected), describeCheck(`p${p}`, computed, expected, 4 * se)).toBeLessThan(4 * se);
    }
    // E[W] = W₀((1+m)(1−c))ⁿ (Aitchison & Brown moments of the product of independent lognormals).
    const expectedMean = 100000 * (1.07 * (1 - charge)) ** n;
    const tol = 3 * at.standardError.nominal;
    expect(Math.abs(at.mean.nominal - expectedMean), describeCheck('mean', at.mean.nominal, expectedMean, tol)).toBeLessThan(tol);
  });

  it('with contributions and a glide path the mean matches the closed-form expectation', () => {
    const base = baseScenario({ ...format, paths: 6000 });
    const result = runScenario(base);
    const funds = base.funds;
    const a = [0.1, 0.3, 0.6]; // weights at 0 years to retirement
    const b = [0.8, 0.2, 0]; // weights at 10 years and more
    base.members.forEach((member, m) => {
      const years = member.retirementAge - member.age;
      // Expectation is linear and years are independent: E[pot] ← (E[pot] + c_y)(1 + Σwᵢmᵢ)(1 − Σwᵢcᵢ).
      let expected = member.pot;
      for (let y = 0; y < years; y++) {
        const t = Math.min(years - y, 10) / 10;
        const w = a.map((x, i) => x + (b[i] - x) * t);
        const growth = 1 + w.reduce((s, wi, i) => s + wi * funds[i].expectedReturn, 0);
        const charge = w.reduce((s, wi, i) => s + wi * funds[i].annualCharge, 0);
        expected = (expected + member.contributionRate * member.salary * (1 + member.salaryGrowth) ** y) * growth * (1 - charge);
      }
      const at = result.results[m].atRetirement; // option 0 ('glide'), member m
      const tol = 3 * at.standardError.nominal;
      expect(Math.abs(at.mean.nominal - expected), describeCheck(`mean for ${member.id}`, at.mean.nominal, expected, tol)).toBeLessThan(tol);
    });
  });

  it('applies the stress as a fall of the fund in the year that many years before retirement', () => {
    const result = runScenario(
      baseScenario({
        ...format,
        paths: 4,
        inflation: 0,
        funds: [
          { id: 'g', name: 'G', expectedReturn: 0.05, volatility: 0, annualCharge: 0 },
          { id: 's', name: 'S', expectedReturn: 0.03, volatility: 0, annualCharge: 0 },
        ],
        correlations: undefined,
        options: [{ id: 'half', name: 'Half', glidePath: [{ yearsToRetirement: 0, weights: { g: 0.5, s: 0.5 } }] }],
        members: [
          { id: 'five', age: 60, retirementAge: 65, salary: 1000, salaryGrowth: 0, contributionRate: 0.1, pot: 1000 },
          { id: 'one', age: 64, retirementAge: 65, salary: 1000, salaryGrowth: 0, contributionRate: 0.1, pot: 1000 },
        ],
        stress: { fundId: 'g', yearsBeforeRetirement: 2, fall: 0.3 },
      }),
    );
    let pot = 1000;
    for (let y = 0; y < 5; y++) pot = (pot + 100) * (y === 3 ? 0.5 * 0.7 + 0.5 * 1.03 : 1.04);
    expect(result.results[0].terminalRealPots[0]).toBeCloseTo(pot, 9);
    // A member with one year to go has no year two years before retirement: not shocked.
    expect(result.results[1].terminalRealPots[0]).toBeCloseTo(1100 * 1.04, 9);
  });
});

describe.each([
  ['format 1', {}],
  ['format 2', { version: 2 }],
] as [string, Partial<ScenarioInput>][])('random numbers and reproducibility (%s)', (_label, format) => {
  it('uses common random numbers: identical options get identical pots; adding an option changes nothing', () => {
    const base = baseScenario({ ...format, paths: 500 });
    const twin = { ...base.options[0], id: 'twin' };
    const withTwin = runScenario({ ...base, options: [base.options[0], twin] });
    expect(withTwin.results[0].terminalRealPots).toEqual(withTwin.results[2].terminalRealPots);
    const alone = runScenario({ ...base, options: [base.options[0]] });
    expect(alone.results[0].terminalRealPots).toEqual(withTwin.results[0].terminalRealPots);
    expect(withTwin.breakEven[0].status).toBe('identical');
  });

  it('antithetic pairs see negated normals', () => {
    const prepared = prepareScenario(parseScenario(baseScenario({ ...format, antithetic: true, paths: 10 })));
    const x0 = pathLogReturns(prepared, 4);
    const x1 = pathLogReturns(prepared, 5);
    const mu = prepared.mu;
    x0.forEach((x, k) => expect(x + x1[k]).toBeCloseTo(2 * mu[k % 3], 12));
    expect(Array.from(pathLogReturns(prepared, 6))).not.toEqual(Array.from(x0));
  });

  it('gives the same result for the same seed and a different one for another seed', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e9, max: 1e9 }), fc.boolean(), (seed, antithetic) => {
        const s = baseScenario({ ...format, seed, paths: 300, antithetic });
        const a = JSON.stringify(resultToJson(runScenario(s), { includePots: true }));
        const b = JSON.stringify(resultToJson(runScenario(s), { includePots: true }));
        expect(a === b).toBe(true);
        const c = JSON.stringify(resultToJson(runScenario({ ...s, seed: seed + 1 }), { includePots: true }));
        expect(a === c).toBe(false);
      }),
      { numRuns: 5 },
    );
  });

  it('produces byte-identical pots, bands and summaries however the paths are split', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 699 }), { maxLength: 4 }),
        fc.boolean(),
        (cuts, antithetic) => {
          const scenario = parseScenario(baseScenario({ ...format, paths: 700, antithetic }));
          const prepared = prepareScenario(scenario);
          const pairs = prepared.pairs.map((p) => p.pairIndex);
          const whole = createPairStores(prepared, pairs);
          simulateRange(prepared, 0, 700, whole);
          const bounds = [0, ...[...cuts].sort((x, y) => x - y), 700];
          const parts = createPairStores(prepared, pairs);
          // Ranges computed in reverse order, as another thread might.
          for (let k = bounds.length - 2; k >= 0; k--) simulateRange(prepared, bounds[k], bounds[k + 1], parts);
          for (const pairIndex of pairs) {
            const bytes = (a: Float64Array | Float32Array | null) => Buffer.from(a!.buffer);
            expect(bytes(parts[pairIndex].terminal).equals(bytes(whole[pairIndex].terminal))).toBe(true);
            expect(bytes(parts[pairIndex].bands).equals(bytes(whole[pairIndex].bands))).toBe(true);
            const a = JSON.stringify(resultToJson({ results: [summarisePair(prepared, parts[pairIndex]).result] } as never, { includePots: true }));
            const b = JSON.stringify(resultToJson({ results: [summarisePair(prepared, whole[pairIndex]).result] } as never, { includePots: true }));
            expect(a === b).toBe(true);
          }
        },
      ),
      { numRuns: 12 },
    );
  });
});

describe.each([
  ['format 1', {}],
  ['format 2', { version: 2 }],
] as [string, Partial<ScenarioInput>][])('result contents (%s)', (_label, format) => {
  it('has consistent bands, target probability and expected shortfall', () => {
    const s: ScenarioInput = baseScenario({ ...format, paths: 1000 });
    const result = runScenario(s);
    expect(result.results).toHaveLength(4);
    for (const r of result.results) {
      const member = s.members.find((m) => m.id === r.memberId)!;
      expect(r.ages[0]).toBe(member.age);
      expect(r.ages.at(-1)).toBe(member.retirementAge);
      const keys = ['p5', 'p10', 'p25', 'p50', 'p75', 'p90', 'p95'];
      for (const key of keys) {
        expect(r.bands.nominal[key]).toHaveLength(r.years + 1);
        expect(r.bands.nominal[key][0]).toBe(member.pot);
        expect(r.bands.nominal[key][r.years]).toBe(r.atRetirement.percentiles.nominal[key]);
        expect(r.bands.real[key][r.years]).toBeCloseTo(r.bands.nominal[key][r.years] / 1.02 ** r.years, 6);
      }
      for (let t = 0; t <= r.years; t++) {
        for (let k = 1; k < keys.length; k++) expect(r.bands.nominal[keys[k]][t]).toBeGreaterThanOrEqual(r.bands.nominal[keys[k - 1]][t]);
      }
      const pots = Array.from(r.terminalRealPots).sort((x, y) => x - y);
      const target = r.atRetirement.targetRealPot;
      const reach = pots.filter((x) => x >= target * (1 - 1e-12)).length / pots.length;
      expect(Math.abs(r.atRetirement.probabilityReachingTarget! - reach)).toBeLessThanOrEqual(1 / pots.length);
      const worst = pots.slice(0, Math.ceil(0.05 * pots.length));
      const es = worst.reduce((a, b) => a + b, 0) / worst.length;
      expect(r.atRetirement.expectedShortfall.real).toBeCloseTo(es, 6);
      expect(r.atRetirement.realIncome.p50 * result.annuityFactor).toBeCloseTo(r.atRetirement.percentiles.real.p50, 6);
    }
    const json = JSON.stringify(resultToJson(result));
    expect(json).not.toContain('terminalRealPots');
    expect(json).not.toMatch(/NaN|Infinity/);
  });
});
