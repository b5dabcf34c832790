import { can, type Role } from '../../constants/permissions';
import type { ScenarioSnapshot } from './scenario';

/**
 * What a role may read of a run's stored input. A run's snapshot holds the capital-market
 * assumptions it ran on (each fund's expected return, volatility and charge, and the
 * correlations); a role without assumptions:read (the communications officer) gets the run
 * without them, whichever route reaches it — the same content the assumptions routes refuse.
 */
export function runForRole<T extends { input: ScenarioSnapshot }>(run: T, role: Role | null | undefined): T & { assumptionsWithheld: boolean } {
  if (can(role, 'assumptions:read')) return { ...run, assumptionsWithheld: false };
  const { correlations: _c, ...scenario } = run.input.scenario;
  return {
    ...run,
    assumptionsWithheld: true,
    input: { ...run.input, scenario: { ...scenario, funds: scenario.funds.map((f) => ({ id: f.id, name: f.name })) } as unknown as ScenarioSnapshot['scenario'] },
  };
}
