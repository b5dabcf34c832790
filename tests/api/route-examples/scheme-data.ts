import { sql } from 'drizzle-orm';
import { assumptionSets, fundAssumptions, funds, illustrativeMembers } from '../../../db/schema';
import { insertOption } from '../../helpers/options';
import type { Examples, Fixtures } from './types';

/** A fund of fx.schemeId that nothing refers to. */
async function makeFund(fx: Fixtures, name = `Fixture fund ${fx.nonce}`) {
  const [f] = await fx.db.insert(funds).values({ schemeId: fx.schemeId, name, assetClass: 'Fixture' }).returning();
  return f;
}

/** An assumption set of fx.schemeId (its own two funds), draft unless told otherwise. */
async function makeSet(fx: Fixtures, status: 'draft' | 'approved' = 'draft') {
  const a = await makeFund(fx, `Fixture A ${fx.nonce}-${Math.random().toString(36).slice(2, 7)}`);
  const b = await makeFund(fx, `Fixture B ${fx.nonce}-${Math.random().toString(36).slice(2, 7)}`);
  const [{ v }] = (await fx.db.execute(sql`select coalesce(max(version), 0)::int + 1 as v from assumption_sets where scheme_id = ${fx.schemeId}`)).rows as { v: number }[];
  const [set] = await fx.db
    .insert(assumptionSets)
    .values({
      schemeId: fx.schemeId,
      version: v,
      status,
      setAt: '2026-06-30',
      inflation: 0.02,
      salaryGrowth: 0.03,
      annuityRealRate: 0.01,
      annuityYears: 25,
      fundOrder: [a.id, b.id],
      correlations: [
        [1, 0.3],
        [0.3, 1],
      ],
      approvedAt: status === 'approved' ? new Date() : null,
    })
    .returning();
  await fx.db.insert(fundAssumptions).values([
    { assumptionSetId: set.id, fundId: a.id, expectedReturn: 0.06, volatility: 0.15, annualCharge: 0.003 },
    { assumptionSetId: set.id, fundId: b.id, expectedReturn: 0.03, volatility: 0.05, annualCharge: 0.002 },
  ]);
  return { set, a, b };
}

function setBody(fundIds: string[]) {
  return {
    setAt: '2026-12-31',
    rationale: 'Fixture',
    inflation: 0.025,
    salaryGrowth: 0.03,
    annuityRealRate: 0.01,
    annuityYears: 25,
    funds: fundIds.map((fundId) => ({ fundId, expectedReturn: 0.05, volatility: 0.1, annualCharge: 0.003 })),
    correlations: fundIds.map((_, i) => fundIds.map((__, j) => (i === j ? 1 : 0.2))),
  };
}

async function makeOption(fx: Fixtures, status: 'approved' | 'draft' = 'approved') {
  const f = await makeFund(fx);
  const o = await insertOption(fx.db, fx.schemeId, { name: `Fixture option ${fx.nonce}`, glidePath: [{ yearsToRetirement: 0, weights: { [f.id]: 1 } }] }, status);
  return { o, f };
}

async function makeMember(fx: Fixtures) {
  const [m] = await fx.db.insert(illustrativeMembers).values({ schemeId: fx.schemeId, label: `Fixture ${fx.nonce}`, age: 30, retirementAge: 67, salary: 30000, contributionRate: 0.08, pot: 1000 }).returning();
  return m;
}

function csvForm(name: string, text: string) {
  return () => {
    const fd = new FormData();
    fd.append('file', new Blob([text], { type: 'text/csv' }), name);
    return fd;
  };
}

const member = { label: 'Example', age: 35, retirementAge: 67, salary: 32000, salaryGrowth: null, contributionRate: 0.08, pot: 12000 };

export const examples: Examples = {
  'GET /schemes/:schemeId/funds': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/funds': (fx) => ({ params: { schemeId: fx.schemeId }, body: { name: `New fund ${fx.nonce}`, assetClass: 'Example' } }),
  'PATCH /schemes/:schemeId/funds/:fundId': async (fx) => ({ params: { schemeId: fx.schemeId, fundId: (await makeFund(fx)).id }, body: { assetClass: 'Changed' } }),
  'DELETE /schemes/:schemeId/funds/:fundId': async (fx) => ({ params: { schemeId: fx.schemeId, fundId: (await makeFund(fx)).id } }),

  'GET /schemes/:schemeId/assumption-sets': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/assumption-sets': async (fx) => {
    const a = await makeFund(fx);
    return { params: { schemeId: fx.schemeId }, body: setBody([a.id]) };
  },
  'POST /schemes/:schemeId/assumption-sets/history': async (fx) => {
    const f = await makeFund(fx);
    return { params: { schemeId: fx.schemeId }, form: csvForm('history.csv', `date,${f.name}\n2026-01-31,100\n2026-02-28,101\n2026-03-31,99.5\n2026-04-30,102\n`) };
  },
  'GET /schemes/:schemeId/assumption-sets/:setId': async (fx) => ({ params: { schemeId: fx.schemeId, setId: (await makeSet(fx)).set.id } }),
  'PUT /schemes/:schemeId/assumption-sets/:setId': async (fx) => {
    const { set, a, b } = await makeSet(fx);
    return { params: { schemeId: fx.schemeId, setId: set.id }, body: setBody([a.id, b.id]) };
  },
  'DELETE /schemes/:schemeId/assumption-sets/:setId': async (fx) => ({ params: { schemeId: fx.schemeId, setId: (await makeSet(fx)).set.id } }),
  'POST /schemes/:schemeId/assumption-sets/:setId/drafts': async (fx) => ({ params: { schemeId: fx.schemeId, setId: (await makeSet(fx, 'approved')).set.id } }),
  'POST /schemes/:schemeId/assumption-sets/:setId/approve': async (fx) => ({ params: { schemeId: fx.schemeId, setId: (await makeSet(fx)).set.id } }),
  'GET /schemes/:schemeId/assumption-sets/:setId/compare/:otherId': async (fx) => ({
    params: { schemeId: fx.schemeId, setId: (await makeSet(fx, 'approved')).set.id, otherId: (await makeSet(fx)).set.id },
  }),

  'GET /schemes/:schemeId/options': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/options': async (fx) => {
    const f = await makeFund(fx);
    return { params: { schemeId: fx.schemeId }, body: { name: `Option ${fx.nonce}`, description: '', glidePath: [{ yearsToRetirement: 0, weights: { [f.id]: 1 } }] } };
  },
  'GET /schemes/:schemeId/options/:optionId': async (fx) => ({ params: { schemeId: fx.schemeId, optionId: (await makeOption(fx)).o.id } }),
  'PUT /schemes/:schemeId/options/:optionId': async (fx) => {
    const { o, f } = await makeOption(fx);
    return { params: { schemeId: fx.schemeId, optionId: o.id }, body: { name: `Renamed ${fx.nonce}`, description: 'Changed', glidePath: [{ yearsToRetirement: 5, weights: { [f.id]: 1 } }] } };
  },
  'POST /schemes/:schemeId/options/:optionId/archive': async (fx) => ({ params: { schemeId: fx.schemeId, optionId: (await makeOption(fx)).o.id }, body: { archived: true } }),

  'GET /schemes/:schemeId/illustrative-members': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/illustrative-members': (fx) => ({ params: { schemeId: fx.schemeId }, body: member }),
  'PUT /schemes/:schemeId/illustrative-members/:memberId': async (fx) => ({ params: { schemeId: fx.schemeId, memberId: (await makeMember(fx)).id }, body: { ...member, label: 'Changed' } }),
  'DELETE /schemes/:schemeId/illustrative-members/:memberId': async (fx) => ({ params: { schemeId: fx.schemeId, memberId: (await makeMember(fx)).id } }),
  'GET /schemes/:schemeId/membership': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/membership': (fx) => ({
    params: { schemeId: fx.schemeId },
    form: csvForm('members.csv', 'reference,age,salary,pot,contribution_rate,retirement_age\nEX-1,30,30000,5000,0.08,67\nEX-2,45,42000,60000,10%,66\n'),
  }),
};
