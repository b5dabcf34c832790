import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

import { DEFAULT_PERCENTILES, runScenario, ScenarioValidationError, validateScenario } from '@/simulation';

import { baseScenario } from './helpers';

function issuesOf(input: unknown) {
  const result = validateScenario(input);
  if (result.ok) throw new Error('expected the scenario to be invalid');
  return result.issues;
}

describe('scenario validation', () => {
  it('accepts both shipped examples and fills defaults', () => {
    for (const file of ['thornwick-default-review.json', 'thornwick-crash-before-retirement.json']) {
      const raw = JSON.parse(readFileSync(path.join(__dirname, '../../../simulation/examples', file), 'utf8'));
      const result = validateScenario(raw);
      expect(result.ok, JSON.stringify(result)).toBe(true);
    }
    const result = validateScenario(baseScenario());
    expect(result.ok && result.scenario.percentiles).toEqual(DEFAULT_PERCENTILES);
    expect(result.ok && result.scenario.antithetic).toBe(false);
  });

  it('names each bad field with a reason', () => {
    const bad = baseScenario();
    bad.funds[1].volatility = -0.1;
    bad.members[0].salary = -5;
    bad.members[1].retirementAge = 50;
    bad.options[0].glidePath[0].weights = { eq: 0.7, bd: 0.2 };
    bad.options[1].glidePath[0].weights = { eq: 1.2, bd: -0.2 };
    bad.options[1].glidePath.push({ yearsToRetirement: 5, weights: { eq: 0.5, gold: 0.5 } });
    bad.correlations = [
      [1, 0.3, 0],
      [0.2, 1, 0.1],
      [0, 0.1, 1],
    ];
    const issues = issuesOf(bad);
    const at = (p: string) => issues.filter((i) => i.path === p).map((i) => i.message);
    expect(at('funds.1.volatility')).toEqual(['must not be negative']);
    expect(at('members.0.salary')).toEqual(['must not be negative']);
    expect(at('members.1.retirementAge')[0]).toMatch(/must be above age \(55\)/);
    expect(at('options.0.glidePath.0.weights')[0]).toMatch(/sum to 0\.9.*must sum to 1/);
    expect(at('options.1.glidePath.0.weights.bd')).toEqual(['weight must not be negative']);
    expect(at('options.1.glidePath.0.weights.eq')).toEqual(['weight must not exceed 1']);
    expect(at('options.1.glidePath.1.weights.gold')).toEqual(['unknown fund id "gold"']);
    expect(at('correlations.0.1')[0]).toMatch(/not symmetric/);
  });

  it('reports a matrix that is not positive semidefinite with its eigenvalue, and a wrong size', () => {
    const notPsd = baseScenario({ correlations: [[1, 0.9, -0.9], [0.9, 1, 0.9], [-0.9, 0.9, 1]] });
    expect(issuesOf(notPsd)).toEqual([{ path: 'correlations', message: expect.stringMatching(/positive semidefinite.*-0\.8/) }]);
    const wrongSize = baseScenario({ correlations: [[1, 0], [0, 1]] });
    expect(issuesOf(wrongSize)[0]).toEqual({ path: 'correlations', message: expect.stringMatching(/must be 3×3/) });
    const diag = baseScenario({ correlations: [[1, 0, 0], [0, 2, 0], [0, 0, 1]] });
    expect(issuesOf(diag)[0].path).toBe('correlations.1.1');
  });

  it('accepts weights within 1e-9 of summing to one and rejects them beyond', () => {
    const near = baseScenario();
    near.options[1].glidePath[0].weights = { eq: 0.6 + 5e-10, bd: 0.4 };
    expect(validateScenario(near).ok).toBe(true);
    near.options[1].glidePath[0].weights = { eq: 0.6 + 5e-9, bd: 0.4 };
    expect(validateScenario(near).ok).toBe(false);
  });

  it('rejects duplicate ids, odd antithetic path counts, unknown stress funds and non-objects', () => {
    const dup = baseScenario({ antithetic: true, paths: 1001, stress: { fundId: 'gold', yearsBeforeRetirement: 1, fall: 0.2 } });
    dup.members[1].id = 'young';
    const issues = issuesOf(dup);
    expect(issues).toEqual(
      expect.arrayContaining([
        { path: 'members.1.id', message: 'duplicate id "young"' },
        { path: 'paths', message: expect.stringMatching(/even/) },
        { path: 'stress.fundId', message: 'unknown fund id "gold"' },
      ]),
    );
    expect(issuesOf(null)[0].message).toMatch(/JSON object/);
    expect(issuesOf({})[0].path).toBe('seed');
  });

  it('makes runScenario throw an error carrying every issue instead of producing NaN', () => {
    const bad = baseScenario({ paths: 0, inflation: Number.NaN });
    try {
      runScenario(bad);
      throw new Error('runScenario accepted an invalid scenario');
    } catch (error) {
      expect(error).toBeInstanceOf(ScenarioValidationError);
      const paths = (error as ScenarioValidationError).issues.map((i) => i.path);
      expect(paths).toEqual(expect.arrayContaining(['paths', 'inflation']));
    }
  });
});
