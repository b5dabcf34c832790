import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { assumptionSets, auditEvents, illustrativeMembers, reports } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { breakEvenCell, CAUTION_TEXT, DRAFT_TEXT, lambda as lambdaText, money, percent } from '../../figures';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { insertFinishedRun } from './route-examples/reports';
import { download, pdfText, waitForRun } from './reports-helpers';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let trustee: Client;
let board: Client;
let worker: RunWorker;
let run: any;
let reportId: string;

const R = () => `/schemes/${s.schemeId}/reports`;
const squash = (t: string) => t.replace(/\s+/g, ' ');

beforeAll(async () => {
  s = await startTestServer();
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  board = new Client(s.baseUrl);
  await board.signIn('board@fernleigh.example');
  // The real path: a run requested through the runs API and computed by the queue's worker.
  const [set] = await s.db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, s.schemeId), eq(assumptionSets.status, 'approved')));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  const created = await trustee.post(`/schemes/${s.schemeId}/runs`, {
    assumptionSetId: set.id,
    optionIds: options.slice(0, 2).map((o) => o.id),
    memberIds: members.slice(1, 3).map((m) => m.id),
    paths: 600,
    seed: 2026,
    riskAversion: 2,
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('board scenario reports', () => {
  it('stores a report from a finished run and lists it for the board', async () => {
    const r = await trustee.post(R(), { runId: run.id, title: 'Default option review 2026' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({ runId: run.id, title: 'Default option review 2026', riskAversion: 2, draft: false });
    expect(r.body.sizeBytes).toBeGreaterThan(5000);
    reportId = r.body.id;
    const list = await board.get(R());
    expect(list.status).toBe(200);
    expect(list.body.reports.map((x: { id: string }) => x.id)).toContain(reportId);
    const events = await s.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, reportId), eq(auditEvents.action, 'report.created')));
    expect(events).toHaveLength(1);
  });

  it("prints the run's figures exactly as the runs API reports them, formatted the same way, with the cautions", async () => {
    const pdf = await download(board, `${R()}/${reportId}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.type).toBe('application/pdf');
    expect(pdf.body.subarray(0, 5).toString()).toBe('%PDF-');
    const { text, pages } = await pdfText(pdf.body);
    expect(pages).toBeGreaterThanOrEqual(5);
    expect(text).toContain('Default option review 2026');
    expect(text).toContain('Fernleigh Mills Staff Pension Plan');
    expect(text).toContain(run.id);
    expect(text).toContain(`version ${run.assumptionSet.version} (approved)`);
    expect(text).toContain(`seed ${run.seed}`);
    expect(text).toContain(`engine version ${run.engineVersion}`);
    const results = run.result.base.result.results;
    expect(results).toHaveLength(4);
    for (const pair of results) {
      const a = pair.atRetirement;
      for (const p of run.result.base.result.percentiles as number[]) expect(text, `p${p} of ${pair.optionId}`).toContain(money(a.percentiles.real[`p${p}`], 'GBP'));
      expect(text).toContain(money(a.mean.real, 'GBP'));
      expect(text).toContain(money(a.certaintyEquivalent.realPot, 'GBP'));
      expect(text).toContain(percent(a.certaintyEquivalent.realAnnualReturn, 'return'));
      expect(text).toContain(percent(a.probabilityReachingTarget, 'chance'));
      expect(text).toContain(money(a.standardError.real, 'GBP', 'standardError'));
    }
    // Break-even λ as one table: each pair's cell (none, or every crossing with its interval).
    for (const b of run.result.base.result.breakEven) {
      const cell = breakEvenCell(b);
      if (b.status === 'found') expect(cell.text).toContain(lambdaText(b.crossings[0].lambda));
      expect(text).toContain(cell.text);
    }
    expect(text).toContain('Break-even λ (95% interval)');
    expect(text).not.toMatch(/ranks above/);
    expect(text).not.toMatch(/not sampling noise/);
    expect(text).toContain(squash(CAUTION_TEXT));
    expect(text).not.toContain('DRAFT');
  });

  it('shows in the app the same figures as the file', async () => {
    const r = await board.get(`${R()}/${reportId}`);
    expect(r.status).toBe(200);
    const { text } = await pdfText((await download(board, `${R()}/${reportId}/pdf`)).body);
    for (const row of r.body.content.comparison) {
      expect(text).toContain(row.display.percentilesReal.p50);
      expect(text).toContain(row.display.certaintyEquivalentPot);
    }
    expect(r.body.content.breakEven).toEqual([]);
    for (const row of r.body.content.breakEvenTable) expect(text).toContain(row.text);
    for (const line of [r.body.content.summary.question, ...r.body.content.summary.keyFigures]) expect(text).toContain(squash(line));
    expect(r.body.content.caution).toBe(CAUTION_TEXT);
  });

  it('exports the comparison table as CSV with exact values', async () => {
    const csv = await download(board, `${R()}/${reportId}/comparison.csv`);
    expect(csv.status).toBe(200);
    expect(csv.type).toMatch(/^text\/csv/);
    expect(csv.disposition).toMatch(/^attachment; filename=".*\.csv"$/);
    const rows = parse(csv.body.toString('utf8'), { columns: true, relax_column_count: true }) as Record<string, string>[];
    const data = rows.filter((r) => r.option);
    expect(data).toHaveLength(4);
    const optionId = (name: string) => run.options.find((o: { name: string }) => o.name === name).id;
    const memberId = (label: string) => run.members.find((m: { label: string }) => m.label === label).id;
    for (const row of data) {
      const a = run.result.base.result.results.find((p: { optionId: string; memberId: string }) => p.optionId === optionId(row.option) && p.memberId === memberId(row.member)).atRetirement;
      expect(Number(row.real_pot_p50_exact)).toBe(a.percentiles.real.p50);
      expect(Number(row.real_pot_p5_exact)).toBe(a.percentiles.real.p5);
      expect(Number(row.certainty_equivalent_real_pot_exact)).toBe(a.certaintyEquivalent.realPot);
      expect(Number(row.probability_reaching_target_exact)).toBe(a.probabilityReachingTarget);
      expect(Number(row.real_pot_mean_standard_error_exact)).toBe(a.standardError.real);
      expect(Number(row.risk_aversion_lambda)).toBe(2);
      // The text as printed sits beside the exact value, rounded by the one rule.
      expect(row.real_pot_median_as_shown).toBe(money(a.percentiles.real.p50, 'GBP'));
      expect(row.probability_reaching_target_as_shown).toBe(percent(a.probabilityReachingTarget, 'chance'));
    }
    // Ranked within each member, highest certainty-equivalent pot first.
    for (const m of new Set(data.map((r) => r.member))) {
      const ranks = data.filter((r) => r.member === m).map((r) => Number(r.certainty_equivalent_real_pot_exact));
      expect(ranks).toEqual([...ranks].sort((x, y) => y - x));
    }
    expect(csv.body.toString('utf8')).toContain(CAUTION_TEXT);
  });

  it('states certainty equivalents at a chosen λ other than the run’s exactly as the comparison endpoint gives them (every path)', async () => {
    const r = await trustee.post(R(), { runId: run.id, riskAversion: 5 });
    expect(r.status).toBe(201);
    const got = await board.get(`${R()}/${r.body.id}`);
    const exact = await board.get(`/schemes/${s.schemeId}/runs/${run.id}/comparison?lambda=5`);
    expect(exact.status).toBe(200);
    const { text } = await pdfText((await download(board, `${R()}/${r.body.id}/pdf`)).body);
    for (const row of got.body.content.comparison) {
      const own = exact.body.pairs.find((p: { optionId: string; memberId: string }) => p.optionId === row.optionId && p.memberId === row.memberId).certaintyEquivalent;
      expect(row.exact.certaintyEquivalentPot).toBe(own.realPot);
      expect(row.exactStandardErrors.certaintyEquivalentPot).toBe(own.standardError);
      const pair = run.result.base.result.results.find((p: { optionId: string; memberId: string }) => p.optionId === row.optionId && p.memberId === row.memberId);
      // More risk-averse ⇒ a lower certainty equivalent than at λ = 2.
      expect(own.realPot).toBeLessThan(pair.atRetirement.certaintyEquivalent.realPot);
      expect(text).toContain(money(own.realPot, 'GBP'));
    }
    expect(text).toContain('certainty equivalents at λ = 5 are computed again from every one of the 600 paths');
  });

  it('marks a report from draft assumptions as DRAFT on every page', async () => {
    const { run: draftRun } = await insertFinishedRun(s.db, s.schemeId, { draft: true, paths: 200 });
    const r = await trustee.post(R(), { runId: draftRun.id });
    expect(r.status).toBe(201);
    expect(r.body.draft).toBe(true);
    const { text, pages } = await pdfText((await download(trustee, `${R()}/${r.body.id}/pdf`)).body);
    expect(text).toContain(DRAFT_TEXT);
    expect(text.match(/DRAFT/g)!.length).toBeGreaterThanOrEqual(pages);
  });

  it('refuses bad requests with the field and reason, and writes nothing', async () => {
    const count = async () => (await s.db.select({ n: sql<number>`count(*)::int` }).from(reports))[0].n;
    const before = await count();
    const bad = await trustee.post(R(), { runId: 'not-an-id', riskAversion: 'high' });
    expect(bad.status).toBe(400);
    expect(bad.body.issues.map((i: { path: string }) => i.path).sort()).toEqual(['riskAversion', 'runId']);
    const extra = await trustee.post(R(), { runId: run.id, colour: 'blue' });
    expect(extra.status).toBe(400);
    const unknown = await trustee.post(R(), { runId: '00000000-0000-4000-8000-000000000000' });
    expect(unknown.status).toBe(404);
    const other = await insertFinishedRun(s.db, s.secondSchemeId, { paths: 100 });
    expect((await trustee.post(R(), { runId: other.run.id })).status).toBe(404);
    expect((await board.post(R(), { runId: run.id })).status).toBe(403);
    expect(await count()).toBe(before);
  });
});
