import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import {
  accumulate,
  breakEvenLambda,
  ceAnnualReturn,
  certaintyEquivalentPot,
  lambdaFromGamble,
  lognormalFromMoments,
  runScenario,
  standardNormalQuantile,
} from './engineImports';
import { baseScenario, describeCheck } from './helpers';

/** Deterministic lognormal "sample" exp(μ + σ Φ⁻¹((i + ½)/N)): no Monte Carlo noise. */
function lognormalGrid(mu: number, sigma: number, n = 200000): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.exp(mu + sigma * standardNormalQuantile((i + 0.5) / n));
  return out;
}

function lumpSumOneYear(expectedReturn: number, volatility: number, riskAversion: number, paths = 20000) {
  return baseScenario({
    paths,
    inflation: 0,
    riskAversion,
    funds: [{ id: 'f', name: 'Only Fund', expectedReturn, volatility, annualCharge: 0 }],
    correlations: undefined,
    options: [{ id: 'o', name: 'O', glidePath: [{ yearsToRetirement: 0, weights: { f: 1 } }] }],
    members: [{ id: 'm', age: 64, retirementAge: 65, salary: 0, salaryGrowth: 0, contributionRate: 0, pot: 100000 }],
  });
}

describe('certainty equivalent', () => {
  it('matches mean–variance utility U = E(r) − ½Aσ² = 0.0526 to first order with A = 2λ', () => {
    // Bodie, Kane & Marcus, Investments, ch. 6: U = E(r) − ½Aσ²; E(r) = 8.2%, σ = 14%, A = 3 gives 0.0526.
    const U = 0.082 - 0.5 * 3 * 0.14 ** 2;
    expect(U).toBeCloseTo(0.0526, 10);
    const result = runScenario(lumpSumOneYear(0.082, 0.14, 1.5));
    const ceReturn = result.results[0].atRetirement.certaintyEquivalent.realAnnualReturn!;
    // Neglected second-order terms (γσ²·E r, γ²σ⁴, skewness of the lognormal) are about 0.003 here.
    expect(Math.abs(ceReturn - U), describeCheck('CE return', ceReturn, U, 0.005)).toBeLessThan(0.005);
  });

  it('approaches E(r) − λσ² faster than σ² as the risk shrinks (first-order agreement)', () => {
    const gap = (m: number, s: number, lambda: number) => {
      const { mu, sigma } = lognormalFromMoments(m, s);
      const ce = certaintyEquivalentPot(lognormalGrid(mu, sigma), lambda) - 1;
      return Math.abs(ce - (m - lambda * s * s));
    };
    for (const lambda of [0.5, 1.5, 4]) {
      const big = gap(0.08, 0.16, lambda) / 0.16 ** 2;
      const small = gap(0.02, 0.04, lambda) / 0.04 ** 2;
      expect(small, `λ=${lambda}: relative gap ${small} vs ${big}`).toBeLessThan(0.35 * big);
    }
  });

  it('CRRA certainty equivalent of ln W ~ N(ln 100000, 0.2²) at γ = 3 is 96,078.94', () => {
    // Pratt (1964): for lognormal W, CE = exp(μ + (1 − γ)σ²/2).
    const closedForm = Math.exp(Math.log(100000) + ((1 - 3) * 0.04) / 2);
    expect(Math.abs(closedForm - 96078.94)).toBeLessThan(0.005);
    const grid = certaintyEquivalentPot(lognormalGrid(Math.log(100000), 0.2), 1.5);
    expect(Math.abs(grid - 96078.94), describeCheck('grid CE', grid, 96078.94, 1)).toBeLessThan(1);
    // Engine: one year on a fund whose ln(1 + R) ~ N(0, 0.2²): m = e^0.02 − 1, s = √(e^0.04 − 1)·e^0.02.
    const m = Math.exp(0.02) - 1;
    const s = Math.sqrt(Math.expm1(0.04)) * Math.exp(0.02);
    const result = runScenario(lumpSumOneYear(m, s, 1.5));
    const r = result.results[0];
    const ce = r.atRetirement.certaintyEquivalent.realPot;
    // Delta method: CE = Ȳ^(1/(1−γ)) with Y = W^(1−γ), so SE(CE) ≈ CE·SE(Ȳ)/(|1−γ|·Ȳ).
    const y = Array.from(r.terminalRealPots, (w) => (w / 100000) ** -2);
    const ybar = y.reduce((a, b) => a + b, 0) / y.length;
    const sd = Math.sqrt(y.reduce((a, b) => a + (b - ybar) ** 2, 0) / (y.length - 1));
    const se = (ce * sd) / Math.sqrt(y.length) / (2 * ybar);
    expect(Math.abs(ce - 96078.94), describeCheck('engine CE', ce, 96078.94, 4 * se)).toBeLessThan(4 * se);
  });

  it('is the mean at λ = 0, the geometric mean at λ = ½, above the mean for λ < 0, and finite for huge λ', () => {
    const pots = [50, 100, 150, 400];
    const mean = 175;
    expect(certaintyEquivalentPot(pots, 0)).toBeCloseTo(mean, 10);
    expect(certaintyEquivalentPot(pots, 0.5)).toBeCloseTo(Math.exp(pots.reduce((s, w) => s + Math.log(w), 0) / 4), 10);
    expect(certaintyEquivalentPot(pots, -1)).toBeGreaterThan(mean);
    const huge = certaintyEquivalentPot([1e6, 2e6, 3e6], 400);
    expect(Number.isFinite(huge)).toBe(true);
    expect(huge).toBeGreaterThanOrEqual(1e6);
    expect(huge).toBeLessThan(1.01e6);
    // A zero pot: worthless under γ ≥ 1, counted as zero under γ < 1 (γ = ½: ((0 + √100)/2)² = 25).
    expect(certaintyEquivalentPot([0, 100], 1)).toBe(0);
    expect(certaintyEquivalentPot([0, 100], 0.25)).toBeCloseTo(25, 10);
  });

  it('never rises when λ rises', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 1, max: 1e7, noNaN: true }), { minLength: 1, maxLength: 40 }),
        fc.double({ min: -5, max: 50, noNaN: true }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        (pots, lambda, step) => {
          const low = certaintyEquivalentPot(pots, lambda);
          const high = certaintyEquivalentPot(pots, lambda + step);
          expect(high, `λ=${lambda}→${lambda + step}`).toBeLessThanOrEqual(low * (1 + 1e-12));
        },
      ),
    );
  });
});

describe('certainty-equivalent annual return', () => {
  it('is (CE/P)^(1/n) − 1 for a lump sum and reproduces the pot with contributions', () => {
    expect(ceAnnualReturn(150000, { initialPot: 100000, contributions: new Float64Array(10) })).toBeCloseTo(1.5 ** 0.1 - 1, 10);
    const contributions = Array.from({ length: 30 }, (_, y) => 3000 * 1.02 ** y);
    const r = ceAnnualReturn(250000, { initialPot: 5000, contributions })!;
    expect(accumulate(5000, contributions, r)).toBeCloseTo(250000, 4);
    expect(ceAnnualReturn(0, { initialPot: 1, contributions: [] })).toBe(-1);
    expect(ceAnnualReturn(10, { initialPot: 0, contributions: [0, 0] })).toBeNull();
  });
});

describe('break-even risk aversion', () => {
  it('finds the λ where a lognormal pot and a certain pot have equal certainty equivalents', () => {
    // Lognormal CE = exp(μ + (1 − 2λ)σ²/2) = b  ⇒  λ = ½ + (μ − ln b)/σ² (Pratt 1964 with γ = 2λ).
    const mu = Math.log(120);
    const sigma = 0.25;
    const risky = lognormalGrid(mu, sigma, 100000);
    const safe = new Float64Array(risky.length).fill(110);
    const expected = 0.5 + (mu - Math.log(110)) / sigma ** 2;
    const found = breakEvenLambda(risky, safe);
    expect(found.status).toBe('found');
    expect(Math.abs(found.lambda! - expected), describeCheck('λ', found.lambda!, expected, 1e-3)).toBeLessThan(1e-3);
    const ceA = certaintyEquivalentPot(risky, found.lambda!);
    expect(Math.abs(ceA / 110 - 1)).toBeLessThan(1e-9);
  });

  it('reports none in range when one option dominates, and identical options', () => {
    const a = lognormalGrid(Math.log(100), 0.2, 1000);
    expect(breakEvenLambda(a, a.map((x) => x * 1.1))).toEqual({ lambda: null, status: 'none-in-range' });
    expect(breakEvenLambda(a, a.slice())).toEqual({ lambda: null, status: 'identical' });
  });
});

describe('λ from a board gamble', () => {
  it('makes the even-odds gamble worth exactly the pot', () => {
    for (const [loss, gain] of [
      [10, 12],
      [10, 30],
      [20, 21],
      [10, 8],
    ]) {
      const lambda = lambdaFromGamble({ pot: 100, loss, gain });
      expect(Math.sign(lambda)).toBe(Math.sign(gain - loss));
      expect(Math.abs(certaintyEquivalentPot([100 - loss, 100 + gain], lambda) - 100)).toBeLessThan(1e-7);
    }
    expect(lambdaFromGamble({ pot: 100, loss: 10, gain: 10 })).toBe(0);
  });

  it('throws a clear error for impossible amounts', () => {
    expect(() => lambdaFromGamble({ pot: 100, loss: 100, gain: 10 })).toThrow(/loss/);
    expect(() => lambdaFromGamble({ pot: 100, loss: 10, gain: 0 })).toThrow(/gain/);
    expect(() => lambdaFromGamble({ pot: 100, loss: 0.01, gain: 1e6 })).toThrow(/no λ/);
  });
});
