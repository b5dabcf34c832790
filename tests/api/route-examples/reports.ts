import { randomUUID } from 'node:crypto';
import type { Db } from '../../../db/client';
import { assumptionSets, fundAssumptions, funds, illustrativeMembers, outboxAttachments, outboxMessages, projectionRuns, reports, runOptionVersions, statementExports } from '../../../db/schema';
import { insertOptions } from '../../helpers/options';
import { ENGINE_VERSION, runScenario, type ScenarioInput } from '../../../simulation';
import { storeVariant, type StoredResult } from '../../../server/jobs/result';
import type { ScenarioSnapshot } from '../../../server/services/scenario';
import { buildReportContent } from '../../../server/reports/content';
import { storedFigures } from '../../../figures';
import type { Examples, Fixtures } from './types';

/**
 * A finished run inside `schemeId` with a real engine result: two funds, two options and one
 * member of its own, computed with the engine directly (no worker) and stored as the worker
 * stores it.
 */
export async function insertFinishedRun(db: Db, schemeId: string, opts: { paths?: number; seed?: number; draft?: boolean; tag?: string } = {}) {
  const tag = opts.tag ?? randomUUID().slice(0, 8);
  const fs = await db
    .insert(funds)
    .values([
      { schemeId, name: `Growth fixture ${tag}` },
      { schemeId, name: `Bond fixture ${tag}` },
    ])
    .returning();
  const [set] = await db
    .insert(assumptionSets)
    .values({
      schemeId,
      version: 1000 + Math.floor(Math.random() * 1_000_000),
      status: opts.draft ? 'draft' : 'approved',
      setAt: '2026-01-01',
      inflation: 0.02,
      salaryGrowth: 0.03,
      annuityRealRate: 0.01,
      annuityYears: 20,
      fundOrder: fs.map((f) => f.id),
      correlations: [
        [1, 0.2],
        [0.2, 1],
      ],
      approvedAt: opts.draft ? null : new Date('2026-01-15T00:00:00Z'),
    })
    .returning();
  await db.insert(fundAssumptions).values([
    { assumptionSetId: set.id, fundId: fs[0].id, expectedReturn: 0.07, volatility: 0.16, annualCharge: 0.002 },
    { assumptionSetId: set.id, fundId: fs[1].id, expectedReturn: 0.035, volatility: 0.06, annualCharge: 0.0015 },
  ]);
  const os = await insertOptions(db, schemeId, [
    { name: `All growth ${tag}`, glidePath: [{ yearsToRetirement: 0, weights: { [fs[0].id]: 1 } }] },
    { name: `Glide to bonds ${tag}`, glidePath: [{ yearsToRetirement: 10, weights: { [fs[0].id]: 1 } }, { yearsToRetirement: 0, weights: { [fs[0].id]: 0.25, [fs[1].id]: 0.75 } }] },
  ]);
  const [member] = await db
    .insert(illustrativeMembers)
    .values({ schemeId, label: `Fixture saver ${tag}`, age: 50, retirementAge: 65, salary: 36000, contributionRate: 0.1, pot: 40000 })
    .returning();
  const paths = opts.paths ?? 400;
  const seed = opts.seed ?? 99;
  const scenario: ScenarioInput = {
    version: 1,
    seed,
    paths,
    antithetic: false,
    inflation: 0.02,
    funds: [
      { id: fs[0].id, name: fs[0].name, expectedReturn: 0.07, volatility: 0.16, annualCharge: 0.002 },
      { id: fs[1].id, name: fs[1].name, expectedReturn: 0.035, volatility: 0.06, annualCharge: 0.0015 },
    ],
    correlations: set.correlations,
    options: os.map((o) => ({ id: o.id, name: o.name, glidePath: o.glidePath })),
    members: [{ id: member.id, age: 50, retirementAge: 65, salary: 36000, salaryGrowth: 0.03, contributionRate: 0.1, pot: 40000 }],
    riskAversion: 2,
    targetReplacementRatio: 0.5,
    annuity: { realRate: 0.01, years: 20 },
  };
  const input: ScenarioSnapshot = {
    assumptionSet: { id: set.id, version: set.version, status: set.status, setAt: set.setAt, approvedAt: set.approvedAt?.toISOString() ?? null },
    funds: fs.map((f) => ({ id: f.id, name: f.name })),
    options: os.map((o) => ({ id: o.id, name: o.name, description: '', versionId: o.versionId, version: 1, status: 'approved' as const })),
    members: [{ id: member.id, label: member.label, age: 50, retirementAge: 65, salary: 36000, pot: 40000, contributionRate: 0.1 }],
    scenario,
    stress: null,
  };
  const { variant, sampleKind } = storeVariant(runScenario(scenario));
  const result: StoredResult = { kind: 'keelson-run-result', engineVersion: ENGINE_VERSION, sample: { kind: sampleKind, size: variant.samples[0].realPots.length }, base: variant, stressed: null };
  const [run] = await db
    .insert(projectionRuns)
    .values({ schemeId, status: 'done', progress: 1, assumptionSetId: set.id, assumptionsDraft: !!opts.draft, seed, paths, riskAversion: 2, input, result, engineVersion: ENGINE_VERSION, finishedAt: new Date() })
    .returning();
  await db.insert(runOptionVersions).values(os.map((o, position) => ({ runId: run.id, position, optionId: o.id, optionVersionId: o.versionId })));
  return { run, input, result, options: os, member, set };
}

async function insertReport(fx: Fixtures) {
  const { run, input, result } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
  const content = buildReportContent(
    { id: run.id, finishedAt: run.finishedAt, assumptionsDraft: false, riskAversion: 2, engineVersion: ENGINE_VERSION, input, result, baselineOptionId: run.baselineOptionId, figures: { base: storedFigures(result.base), stressed: null } },
    { title: `Fixture report ${fx.nonce}`, schemeName: 'Fixture', currency: 'GBP', lambda: 2, createdAt: new Date(), approvedBy: null },
  );
  const [r] = await fx.db.insert(reports).values({ schemeId: fx.schemeId, runId: run.id, title: content.title, riskAversion: 2, draft: false, content, pdf: Buffer.from('%PDF-1.3 fixture') }).returning();
  return r;
}

async function insertMessage(fx: Fixtures, status: 'failed') {
  const [m] = await fx.db
    .insert(outboxMessages)
    .values({ schemeId: fx.schemeId, kind: 'board-report', recipients: [`board-${fx.nonce}@example.org`], subject: `Fixture ${fx.nonce}`, body: 'Fixture', status, attempts: 1, lastError: status === 'failed' ? 'fixture failure' : null })
    .returning();
  await fx.db.insert(outboxAttachments).values({ messageId: m.id, filename: 'fixture.pdf', contentType: 'application/pdf', content: Buffer.from('%PDF-1.3 fixture') });
  return { m };
}

export const examples: Examples = {
  'GET /schemes/:schemeId/reports': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/reports': async (fx) => {
    const { run } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    return { params: { schemeId: fx.schemeId }, body: { runId: run.id, title: `Matrix ${fx.nonce}` } };
  },
  'GET /schemes/:schemeId/reports/:reportId': async (fx) => ({ params: { schemeId: fx.schemeId, reportId: (await insertReport(fx)).id } }),
  'GET /schemes/:schemeId/reports/:reportId/pdf': async (fx) => ({ params: { schemeId: fx.schemeId, reportId: (await insertReport(fx)).id } }),
  'GET /schemes/:schemeId/reports/:reportId/comparison.csv': async (fx) => ({ params: { schemeId: fx.schemeId, reportId: (await insertReport(fx)).id } }),
  'POST /schemes/:schemeId/reports/:reportId/email': async (fx) => {
    // The demo scheme has a board reviewer; give any other scheme one too.
    await fx.makeUser('board');
    return { params: { schemeId: fx.schemeId, reportId: (await insertReport(fx)).id } };
  },
  'GET /schemes/:schemeId/statement-sources': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'GET /schemes/:schemeId/statements/preview': async (fx) => {
    const { run, options, member } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    return { params: { schemeId: fx.schemeId }, query: { runId: run.id, optionId: options[0].id, memberId: member.id } };
  },
  'GET /schemes/:schemeId/statements/file': async (fx) => {
    const { run, options, member } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    return { params: { schemeId: fx.schemeId }, query: { runId: run.id, optionId: options[0].id, memberId: member.id, format: 'csv' } };
  },
  'GET /schemes/:schemeId/statement-exports': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/statement-exports': async (fx) => {
    const { run, options } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    return { params: { schemeId: fx.schemeId }, body: { runId: run.id, optionId: options[0].id, scope: 'illustrative', format: 'csv' } };
  },
  'GET /schemes/:schemeId/statement-exports/:exportId': async (fx) => {
    const { run, options } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    const [e] = await fx.db.insert(statementExports).values({ schemeId: fx.schemeId, runId: run.id, optionId: options[0].id, scope: 'illustrative', format: 'csv' }).returning();
    return { params: { schemeId: fx.schemeId, exportId: e.id } };
  },
  'GET /schemes/:schemeId/statement-exports/:exportId/file': async (fx) => {
    const { run, options } = await insertFinishedRun(fx.db, fx.schemeId, { paths: 100, tag: fx.nonce });
    const [e] = await fx.db
      .insert(statementExports)
      .values({ schemeId: fx.schemeId, runId: run.id, optionId: options[0].id, scope: 'illustrative', format: 'csv', status: 'done', progress: 1, filename: 'fixture.csv', file: Buffer.from('member\r\n') })
      .returning();
    return { params: { schemeId: fx.schemeId, exportId: e.id } };
  },
  'GET /schemes/:schemeId/outbox': (fx) => ({ params: { schemeId: fx.schemeId } }),
  'POST /schemes/:schemeId/outbox/:messageId/retry': async (fx) => {
    const { m } = await insertMessage(fx, 'failed');
    return { params: { schemeId: fx.schemeId, messageId: m.id } };
  },
};
