import { describe, expect, it } from 'vitest';
import seedrandom from 'seedrandom';
import { jStat } from 'jstat';
import {
  annualiseMonthlyReturn,
  annualiseMonthlyVolatility,
  correlation,
  historyStatistics,
  mean,
  sampleStdDev,
  sampleVariance,
  simpleReturns,
} from '../../simulation/history';

/** Close to `expected` within `tol`, printing computed, expected and tolerance on failure. */
function near(computed: number, expected: number, tol: number, what: string) {
  expect(Math.abs(computed - expected), `${what}: computed ${computed}, expected ${expected}, tolerance ${tol}`).toBeLessThanOrEqual(tol);
}

/** A month-end index that moves by a normal monthly return (Box–Muller from a seeded stream). */
function generatedLevels(seed: string, months: number, mu: number, sigma: number, common?: number[]): { levels: number[]; shocks: number[] } {
  const rng = seedrandom(seed);
  const levels = [100];
  const shocks: number[] = [];
  for (let t = 0; t < months; t++) {
    const z = Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
    shocks.push(z);
    const mixed = common ? 0.7 * common[t] + Math.sqrt(1 - 0.49) * z : z;
    levels.push(levels[t] * (1 + mu + sigma * mixed));
  }
  return { levels, shocks };
}

describe('statistics from month-end index levels', () => {
  // Hand-computable: A = 100, 110, 99, 108.9 gives returns +10%, −10%, +10%;
  // B = 100, 105, 110.25, 104.7375 gives +5%, +5%, −5%.
  // Mean A = 0.1/3; deviations 1/15, −2/15, 1/15 ⇒ Σd² = 6/225, variance = (6/225)/2 = 1/75.
  // Mean B = 0.05/3; deviations 1/30, 1/30, −2/30 ⇒ Σd² = 6/900, variance = 1/300.
  // Σ dA·dB = (1 − 2 − 2)/450 = −1/150; √(Σd²A · Σd²B) = √(6/225 · 6/900) = 1/75 ⇒ ρ = −0.5.
  // Annual: (1 + 1/30)¹² − 1 = 0.48213…; volatility √12 · √(1/75) = √0.16 = 0.4.
  const A = [100, 110, 99, 108.9];
  const B = [100, 105, 110.25, 104.7375];

  it('computes simple returns (Pₜ − Pₜ₋₁)/Pₜ₋₁', () => {
    const r = simpleReturns(A);
    expect(r).toHaveLength(3);
    near(r[0], 0.1, 1e-12, 'r1');
    near(r[1], -0.1, 1e-12, 'r2');
    near(r[2], 0.1, 1e-12, 'r3');
  });

  it('matches the worked example: mean, n − 1 variance, sd, annualised figures and correlation', () => {
    const s = historyStatistics([
      { id: 'A', levels: A },
      { id: 'B', levels: B },
    ]);
    expect(s.months).toBe(3);
    const [a, b] = s.funds;
    near(a.monthlyMean, 0.1 / 3, 1e-12, 'mean A');
    near(a.monthlyVariance, 1 / 75, 1e-12, 'variance A');
    near(a.monthlySd, Math.sqrt(1 / 75), 1e-12, 'sd A');
    near(b.monthlyVariance, 1 / 300, 1e-12, 'variance B');
    near(a.annualReturn, Math.pow(1 + 0.1 / 3, 12) - 1, 1e-12, 'annual return A');
    near(a.annualReturn, 0.48213, 1e-4, 'annual return A, written out');
    near(a.annualVolatility, Math.sqrt(12 / 75), 1e-12, 'annual volatility A = √12·√(1/75) = 0.4');
    near(a.annualVolatility, 0.4, 1e-12, 'annual volatility A');
    near(s.correlations[0][1], -0.5, 1e-12, 'correlation A,B');
    expect(s.correlations[1][0]).toBe(s.correlations[0][1]);
    expect(s.correlations[0][0]).toBe(1);
    expect(a.growth.map((g) => Number(g.toFixed(6)))).toEqual([1, 1.1, 0.99, 1.089]);
  });

  // Reference: jStat 1.9 (https://jstat.github.io/all.html): mean, variance(arr, true) = sample
  // variance with n − 1, stdev(arr, true) and corrcoeff (Pearson).
  it.each([
    ['equity-like', 0.006, 0.045, 240],
    ['bond-like', 0.003, 0.018, 120],
    ['short history', 0.004, 0.03, 13],
  ])('agrees with jStat on a generated %s series', (name, mu, sigma, months) => {
    const base = generatedLevels(`hist-${name}`, months, mu, sigma);
    const other = generatedLevels(`hist-${name}-2`, months, mu / 2, sigma / 2, base.shocks);
    const s = historyStatistics([
      { id: 'x', levels: base.levels },
      { id: 'y', levels: other.levels },
    ]);
    const rx = simpleReturns(base.levels);
    const ry = simpleReturns(other.levels);
    near(s.funds[0].monthlyMean, jStat.mean(rx), 1e-14, 'mean');
    near(s.funds[0].monthlyVariance, jStat.variance(rx, true), 1e-14, 'sample variance');
    near(s.funds[0].monthlySd, jStat.stdev(rx, true), 1e-14, 'sample sd');
    near(s.funds[1].monthlySd, jStat.stdev(ry, true), 1e-14, 'sample sd (second)');
    near(s.correlations[0][1], jStat.corrcoeff(rx, ry), 1e-12, 'correlation');
    near(s.funds[0].annualReturn, Math.pow(1 + jStat.mean(rx), 12) - 1, 1e-12, 'annualised return');
    near(s.funds[0].annualVolatility, Math.sqrt(12) * jStat.stdev(rx, true), 1e-12, 'annualised volatility');
    // Generated with correlation 0.7 between the shocks: the sample figure should be near it.
    if (months >= 120) near(s.correlations[0][1], 0.7, 0.15, 'sample correlation near the generating 0.7');
  });

  it('gives the building blocks directly', () => {
    expect(mean([1, 2, 3, 4])).toBe(2.5);
    near(sampleVariance([1, 2, 3, 4]), 5 / 3, 1e-15, 'variance of 1..4 with n − 1');
    near(sampleStdDev([2, 4, 4, 4, 5, 5, 7, 9]), Math.sqrt(32 / 7), 1e-15, 'sd with n − 1');
    near(annualiseMonthlyReturn(0.01), 0.12682503013196977, 1e-15, '(1.01)^12 − 1');
    near(annualiseMonthlyVolatility(0.02), 0.06928203230275509, 1e-15, '√12 · 0.02');
    expect(correlation([1, 1, 1], [1, 2, 3])).toBeNull();
  });

  it('marks a fund that never moves and sets its correlations to 0', () => {
    const s = historyStatistics([
      { id: 'flat', levels: [100, 100, 100, 100] },
      { id: 'moving', levels: [100, 101, 99, 102] },
    ]);
    expect(s.undefinedCorrelations).toEqual(['flat']);
    expect(s.correlations).toEqual([
      [1, 0],
      [0, 1],
    ]);
    expect(s.funds[0].annualVolatility).toBe(0);
  });

  it('refuses too few levels, unequal lengths and non-positive levels', () => {
    expect(() => historyStatistics([{ id: 'a', levels: [1, 2] }])).toThrow(/at least 3/);
    expect(() =>
      historyStatistics([
        { id: 'a', levels: [1, 2, 3] },
        { id: 'b', levels: [1, 2] },
      ]),
    ).toThrow(/series b/);
    expect(() => historyStatistics([{ id: 'a', levels: [1, 0, 3] }])).toThrow(/positive/);
  });
});
