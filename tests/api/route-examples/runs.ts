import { randomUUID } from 'node:crypto';
import { assumptionSets, fundAssumptions, funds, illustrativeMembers, projectionRuns } from '../../../db/schema';
import { insertOption } from '../../helpers/options';
import { potRows } from '../../../server/jobs/result';
import { insertPots } from '../../../server/services/runPots';
import { runScenario } from '../../../simulation';
import { insertFinishedRun } from './reports';
import type { Examples, Fixtures } from './types';
import type { StoredResult } from '../../../server/jobs/result';

/**
 * A tiny scheme dataset inside fx.schemeId (one fund, one option, one member), so that the
 * same examples work for the demo scheme and for a scheme the caller has no role on.
 */
async function tinyScheme(fx: Fixtures) {
  const [fund] = await fx.db.insert(funds).values({ schemeId: fx.schemeId, name: `Fixture fund ${fx.nonce}` }).returning();
  const [set] = await fx.db
    .insert(assumptionSets)
    .values({
      schemeId: fx.schemeId,
      version: 1000 + Math.floor(Math.random() * 1_000_000),
      status: 'approved',
      setAt: '2026-01-01',
      inflation: 0.02,
      salaryGrowth: 0.03,
      annuityRealRate: 0.01,
      annuityYears: 20,
      fundOrder: [fund.id],
      correlations: [[1]],
    })
    .returning();
  await fx.db.insert(fundAssumptions).values({ assumptionSetId: set.id, fundId: fund.id, expectedReturn: 0.05, volatility: 0.1, annualCharge: 0.003 });
  const option = await insertOption(fx.db, fx.schemeId, { name: `Fixture option ${fx.nonce}`, glidePath: [{ yearsToRetirement: 0, weights: { [fund.id]: 1 } }] });
  const [member] = await fx.db
    .insert(illustrativeMembers)
    .values({ schemeId: fx.schemeId, label: `Fixture member ${fx.nonce}`, age: 60, retirementAge: 63, salary: 30000, contributionRate: 0.1, pot: 10000 })
    .returning();
  return { fund, set, option, member };
}

/** A finished run row written directly (no worker needed). */
async function finishedRun(fx: Fixtures) {
  const t = await tinyScheme(fx);
  const [run] = await fx.db
    .insert(projectionRuns)
    .values({
      id: randomUUID(),
      schemeId: fx.schemeId,
      status: 'done',
      progress: 1,
      assumptionSetId: t.set.id,
      assumptionsDraft: false,
      seed: 7,
      paths: 100,
      riskAversion: 2,
      input: {
        assumptionSet: { id: t.set.id, version: t.set.version, status: 'approved', setAt: '2026-01-01', approvedAt: null },
        funds: [{ id: t.fund.id, name: t.fund.name }],
        options: [{ id: t.option.id, name: t.option.name, description: '' }],
        members: [{ id: t.member.id, label: t.member.label, age: 60, retirementAge: 63, salary: 30000, pot: 10000, contributionRate: 0.1 }],
        scenario: {
          version: 1,
          seed: 7,
          paths: 100,
          inflation: 0.02,
          funds: [{ id: t.fund.id, name: 'F', expectedReturn: 0.05, volatility: 0.1, annualCharge: 0.003 }],
          options: [{ id: t.option.id, name: 'O', glidePath: [{ yearsToRetirement: 0, weights: { [t.fund.id]: 1 } }] }],
          members: [{ id: t.member.id, age: 60, retirementAge: 63, salary: 30000, salaryGrowth: 0.03, contributionRate: 0.1, pot: 10000 }],
          riskAversion: 2,
          targetReplacementRatio: 0.5,
          annuity: { realRate: 0.01, years: 20 },
        },
        stress: null,
      },
      // Not a readable result on purpose: routes that need one must answer 409, not crash.
      result: { kind: 'keelson-run-result', note: 'fixture' } as unknown as StoredResult,
      engineVersion: 'fixture',
      finishedAt: new Date(),
    })
    .returning();
  return run;
}

export const examples: Examples = {
  'GET /schemes/:schemeId/run-choices': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/runs': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/runs': async (fx) => {
    const t = await tinyScheme(fx);
    return { params: { schemeId: fx.schemeId }, body: { assumptionSetId: t.set.id, optionIds: [t.option.id], memberIds: [t.member.id], paths: 100, seed: 1 } };
  },
  'GET /schemes/:schemeId/runs/:runId': async (fx) => ({ params: { schemeId: fx.schemeId, runId: (await finishedRun(fx)).id } }),
  'POST /schemes/:schemeId/runs/:runId/rerun': async (fx) => ({ params: { schemeId: fx.schemeId, runId: (await finishedRun(fx)).id } }),
  'GET /schemes/:schemeId/runs/:runId/comparison': async (fx) => {
    // A finished run with its pots stored, as the worker stores them.
    const { run, input } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    await insertPots(fx.db, await potRows(run.id, 'base', runScenario(input.scenario)));
    return { params: { schemeId: fx.schemeId, runId: run.id }, query: { lambda: '5' } };
  },
};
