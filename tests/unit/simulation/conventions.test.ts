import { describe, expect, it } from 'vitest';

import { memberTimeline, runScenario, UK_QUALIFYING_EARNINGS, validateScenario, type ScenarioInput } from '@/simulation';

import { baseScenario, describeCheck } from './helpers';

const oneFund = (expectedReturn: number, annualCharge: number) => [{ id: 'f', name: 'Only Fund', expectedReturn, volatility: 0, annualCharge }];
const fixed = { id: 'o', name: 'O', glidePath: [{ yearsToRetirement: 0, weights: { f: 1 } }] };

/** A format-2 scenario at zero volatility, so every path is the deterministic pot. */
function deterministic(overrides: Partial<Extract<ScenarioInput, { version: 2 }>>): ScenarioInput {
  return { ...baseScenario(), version: 2, paths: 4, correlations: undefined, funds: oneFund(0.05, 0.004), options: [fixed], ...overrides } as ScenarioInput;
}

const nominalPot = (s: ScenarioInput, pair = 0) => {
  const r = runScenario(s);
  const n = r.results[pair].years;
  return r.results[pair].terminalRealPots[0] * (1 + s.inflation) ** n;
};

describe('contributions spread through the year', () => {
  it('at zero volatility equal a monthly-paid growing annuity in closed form to 1e-9', () => {
    const member = { id: 'm', age: 40, retirementAge: 65, salary: 36000, salaryGrowth: 0.025, contributionRate: 0.09, pot: 20000 };
    const s = deterministic({ members: [member], inflation: 0.02 });
    // Closed form: net growth q = (1 + m)(1 − c) a year; the year's contribution Cᵧ = rate × salary × (1 + g)^y is
    // paid in twelve end-of-month instalments, worth Cᵧ · i/i⁽¹²⁾ at the year's end, i = q − 1,
    // i⁽¹²⁾ = 12(q^(1/12) − 1) (monthly accumulation, standard actuarial notation; from memory). Then the
    // growing annuity-immediate: Σᵧ Cᵧ q^(n−1−y) = C₀ (qⁿ − (1 + g)ⁿ)/(q − (1 + g)).
    const n = 25;
    const q = 1.05 * (1 - 0.004);
    const monthly = (q - 1) / (12 * (q ** (1 / 12) - 1));
    const c0 = 0.09 * 36000;
    const expected = 20000 * q ** n + monthly * c0 * ((q ** n - 1.025 ** n) / (q - 1.025));
    const computed = nominalPot(s);
    expect(Math.abs(computed / expected - 1), describeCheck('pot', computed, expected, 1e-9)).toBeLessThan(1e-9);
    // Paid at the start of the year instead, the same contributions earn a whole year: the
    // annuity-due, Σᵧ Cᵧ q^(n−y).
    const start = nominalPot({ ...s, timing: { contributions: 'start-of-year' } } as ScenarioInput);
    const due = 20000 * q ** n + q * c0 * ((q ** n - 1.025 ** n) / (q - 1.025));
    expect(Math.abs(start / due - 1)).toBeLessThan(1e-9);
    // Spreading the contributions through the year gives less than paying them at its start.
    expect(computed).toBeLessThan(start);
  });

  it('give a certainty-equivalent real return equal to the deterministic real return', () => {
    const s = deterministic({ inflation: 0.025, riskAversion: 3 });
    const r = runScenario(s);
    // Fisher: (1 + nominal)/(1 + inflation) − 1 with nominal = (1 + m)(1 − c) − 1.
    const expected = (1.05 * (1 - 0.004)) / 1.025 - 1;
    for (const pair of r.results) {
      const ce = pair.atRetirement.certaintyEquivalent.realAnnualReturn!;
      expect(Math.abs(ce - expected), describeCheck('CE return', ce, expected, 1e-10)).toBeLessThan(1e-10);
    }
  });
});

describe('contribution basis', () => {
  it('qualifying earnings: contributions equal the band arithmetic to the penny, with limits raised by inflation', () => {
    const basis = { basis: 'qualifying-earnings' as const, lowerLimit: UK_QUALIFYING_EARNINGS.lowerLimit, upperLimit: UK_QUALIFYING_EARNINGS.upperLimit, indexation: 'inflation' as const };
    const cases = [
      { salary: 30000, growth: 0.03 }, // inside the band
      { salary: 62000, growth: 0.01 }, // above the upper limit: capped at the band
      { salary: 5000, growth: 0.06 }, // below the lower limit at first, then inside
    ];
    for (const c of cases) {
      const t = memberTimeline({ age: 30, retirementAge: 60, salary: c.salary, salaryGrowth: c.growth, contributionRate: 0.08, pot: 0 }, 0.02, basis);
      for (let y = 0; y < 30; y++) {
        const salary = c.salary * (1 + c.growth) ** y;
        const lower = 6240 * 1.02 ** y;
        const upper = 50270 * 1.02 ** y;
        const band = Math.min(Math.max(salary - lower, 0), upper - lower);
        expect(Math.abs(t.contributions[y] - 0.08 * band), `salary ${c.salary}, year ${y}`).toBeLessThan(0.005);
      }
    }
    // At zero return the pot is the sum of the contributions; limits fixed in money of the day when not indexed.
    const member = { id: 'm', age: 60, retirementAge: 63, salary: 20000, salaryGrowth: 0, contributionRate: 0.1, pot: 0 };
    const s = deterministic({ funds: oneFund(0, 0), inflation: 0.03, members: [member], contributionBasis: { basis: 'qualifying-earnings', indexation: 'none' } });
    expect(Math.abs(nominalPot(s) - 3 * 0.1 * (20000 - 6240))).toBeLessThan(0.005);
    const indexed = deterministic({ funds: oneFund(0, 0), inflation: 0.03, members: [member], contributionBasis: { basis: 'qualifying-earnings' } });
    const bandSum = [0, 1, 2].reduce((sum, y) => sum + 0.1 * (20000 - 6240 * 1.03 ** y), 0);
    expect(Math.abs(nominalPot(indexed) - bandSum)).toBeLessThan(0.005);
  });

  it('rejects an upper limit below the lower one and an unknown basis, naming the field', () => {
    const bad = validateScenario({ ...baseScenario(), version: 2, contributionBasis: { basis: 'qualifying-earnings', lowerLimit: 9000, upperLimit: 8000 } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues).toContainEqual({ path: 'contributionBasis.upperLimit', message: 'must not be below the lower limit (9000)' });
    const unknown = validateScenario({ ...baseScenario(), version: 2, contributionBasis: { basis: 'gross' }, timing: { glideWeights: 'end-of-year' } });
    expect(unknown.ok).toBe(false);
    if (!unknown.ok) {
      const paths = unknown.issues.map((i) => i.path);
      expect(paths).toContain('timing.glideWeights');
      expect(paths.some((p) => p.startsWith('contributionBasis'))).toBe(true);
    }
    const formatOne = validateScenario({ ...baseScenario(), timing: { contributions: 'spread' } });
    expect(formatOne).toEqual({ ok: false, issues: [{ path: 'timing', message: 'is a scenario format 2 field: add "version": 2' }] });
    const version = validateScenario({ ...baseScenario(), version: 3 });
    expect(version).toEqual({ ok: false, issues: [{ path: 'version', message: 'must be 1 or 2 (got 3)' }] });
  });

  it('format 2 defaults to mid-year weights, spread contributions and full salary; format 1 keeps the start of the year', () => {
    const two = validateScenario({ ...baseScenario(), version: 2 });
    expect(two.ok && [two.scenario.version, two.scenario.timing, two.scenario.contributionBasis]).toEqual([
      2,
      { glideWeights: 'mid-year', contributions: 'spread' },
      { basis: 'full-salary' },
    ]);
    const one = validateScenario(baseScenario());
    expect(one.ok && [one.scenario.version, one.scenario.timing]).toEqual([1, { glideWeights: 'start-of-year', contributions: 'start-of-year' }]);
    expect(runScenario({ ...baseScenario({ paths: 10 }), version: 2 } as ScenarioInput).conventions).toEqual({
      timing: { glideWeights: 'mid-year', contributions: 'spread' },
      contributionBasis: { basis: 'full-salary' },
    });
  });
});

describe('glide-path weights read at the middle of each year', () => {
  it('a two-point glide path at zero volatility gives the closed-form pot to 1e-9', () => {
    const funds = [
      { id: 'g', name: 'Growth', expectedReturn: 0.08, volatility: 0, annualCharge: 0.005 },
      { id: 's', name: 'Secure', expectedReturn: 0.02, volatility: 0, annualCharge: 0.001 },
    ];
    const glidePath: { yearsToRetirement: number; weights: Record<string, number> }[] = [
      { yearsToRetirement: 2, weights: { g: 1 } },
      { yearsToRetirement: 0, weights: { s: 1 } },
    ];
    const option = { id: 'glide', name: 'Glide', glidePath };
    const member = { id: 'm', age: 60, retirementAge: 65, salary: 40000, salaryGrowth: 0.02, contributionRate: 0.1, pot: 100000 };
    const s = deterministic({ funds, options: [option], members: [member], timing: { contributions: 'start-of-year' } });
    // Year y of 5 holds the mix at 5 − y − ½ years to go: 4.5, 3.5, 2.5 (all growth), 1.5 (¾ growth), 0.5 (¼ growth).
    const growthShare = [1, 1, 1, 0.75, 0.25];
    let expected = 100000;
    growthShare.forEach((w, y) => {
      const q = (1 + w * 0.08 + (1 - w) * 0.02) * (1 - (w * 0.005 + (1 - w) * 0.001));
      expected = (expected + 4000 * 1.02 ** y) * q;
    });
    const computed = nominalPot(s);
    expect(Math.abs(computed / expected - 1), describeCheck('pot', computed, expected, 1e-9)).toBeLessThan(1e-9);
    // At the start of each year the final year holds the mix at 1 year to go (half growth), and the mix at 0 is never held.
    const startShare = [1, 1, 1, 1, 0.5];
    let start = 100000;
    startShare.forEach((w, y) => {
      const q = (1 + w * 0.08 + (1 - w) * 0.02) * (1 - (w * 0.005 + (1 - w) * 0.001));
      start = (start + 4000 * 1.02 ** y) * q;
    });
    const startComputed = nominalPot({ ...s, timing: { glideWeights: 'start-of-year', contributions: 'start-of-year' } } as ScenarioInput);
    expect(Math.abs(startComputed / start - 1)).toBeLessThan(1e-9);
  });
});
