import type { ScenarioInput } from '@/simulation';

/** A small valid scenario; tests override what they need. */
export function baseScenario(overrides: Partial<ScenarioInput> = {}): ScenarioInput {
  return {
    seed: 12345,
    paths: 2000,
    inflation: 0.02,
    funds: [
      { id: 'eq', name: 'Test Equity', expectedReturn: 0.07, volatility: 0.15, annualCharge: 0.003 },
      { id: 'bd', name: 'Test Bonds', expectedReturn: 0.035, volatility: 0.06, annualCharge: 0.002 },
      { id: 'cs', name: 'Test Cash', expectedReturn: 0.02, volatility: 0.01, annualCharge: 0.001 },
    ],
    correlations: [
      [1, 0.3, 0],
      [0.3, 1, 0.1],
      [0, 0.1, 1],
    ],
    options: [
      {
        id: 'glide',
        name: 'Glide',
        glidePath: [
          { yearsToRetirement: 10, weights: { eq: 0.8, bd: 0.2 } },
          { yearsToRetirement: 0, weights: { eq: 0.1, bd: 0.3, cs: 0.6 } },
        ],
      },
      { id: 'fixed', name: 'Fixed', glidePath: [{ yearsToRetirement: 0, weights: { eq: 0.6, bd: 0.4 } }] },
    ],
    members: [
      { id: 'young', age: 30, retirementAge: 65, salary: 30000, salaryGrowth: 0.03, contributionRate: 0.08, pot: 5000 },
      { id: 'older', age: 55, retirementAge: 65, salary: 40000, salaryGrowth: 0.02, contributionRate: 0.1, pot: 120000 },
    ],
    riskAversion: 1,
    targetReplacementRatio: 0.3,
    annuity: { realRate: 0.01, years: 25 },
    ...overrides,
  };
}

/** "computed vs expected (tolerance)" for failure messages. */
export function describeCheck(label: string, computed: number, expected: number, tolerance: number): string {
  return `${label}: computed ${computed}, expected ${expected}, tolerance ${tolerance}, difference ${computed - expected}`;
}
