import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { assumptionSets, illustrativeMembers, statementExports } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { createDb } from '../../db/client';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { startBackgroundWorkers, type BackgroundWorkers } from '../../server/jobs/backgroundWorkers';
import { linkSettings } from '../../server/auth/links';
import { CAUTION_TEXT, money, moneyRoundingNote, roundMoney } from '../../figures';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { insertFinishedRun } from './route-examples/reports';
import { download, eventually, pdfText, waitForRun } from './reports-helpers';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let comms: Client;
let runWorker: RunWorker;
let background: BackgroundWorkers;
let workerDb: ReturnType<typeof createDb>;
let run: any;
let midCareer: { id: string; label: string };

const S = () => `/schemes/${s.schemeId}`;
const squash = (t: string) => t.replace(/\s+/g, ' ');
const pot = (v: number) => money(v, 'GBP', 'pot');
const income = (v: number) => money(v, 'GBP', 'income');

beforeAll(async () => {
  s = await startTestServer();
  workerDb = createDb(s.url, 4);
  background = await startBackgroundWorkers({ db: workerDb.db, pool: workerDb.pool, transport: { send: async () => ({ providerId: 'unused' }), close: () => {} }, links: linkSettings(s.config), log: () => {} });
  runWorker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  const trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  comms = new Client(s.baseUrl);
  await comms.signIn('comms@fernleigh.example');
  const [set] = await s.db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, s.schemeId), eq(assumptionSets.status, 'approved')));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  midCareer = members.find((m) => m.label === 'Mid career')!;
  expect(midCareer, 'the demo scheme has a "Mid career" illustrative member').toBeTruthy();
  const created = await trustee.post(`${S()}/runs`, { assumptionSetId: set.id, optionIds: options.slice(0, 2).map((o) => o.id), memberIds: members.map((m) => m.id), paths: 800, seed: 31 });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
}, 120_000);

afterAll(async () => {
  await runWorker?.stop();
  await background?.stop();
  await workerDb?.pool.end();
  await s?.close();
});

function pairOf(optionId: string, memberId: string) {
  return run.result.base.result.results.find((r: { optionId: string; memberId: string }) => r.optionId === optionId && r.memberId === memberId);
}

describe('plain-language member statements', () => {
  it('offers finished runs with their options and members, and the documented rounding', async () => {
    const r = await comms.get(`${S()}/statement-sources`);
    expect(r.status).toBe(200);
    expect(r.body.runs.map((x: { id: string }) => x.id)).toContain(run.id);
    expect(r.body.rounding).toEqual({ pot: moneyRoundingNote('pot', 'GBP'), income: moneyRoundingNote('income', 'GBP') });
    expect(r.body.membershipCount).toBe(40);
  });

  it("states a demo member's 10th, 50th and 90th percentile pots and incomes from the run, rounded as documented", async () => {
    const optionId = run.options[0].id;
    const r = await comms.get(`${S()}/statements/preview?runId=${run.id}&optionId=${optionId}&memberId=${midCareer.id}`);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    const a = pairOf(optionId, midCareer.id).atRetirement;
    const cases = Object.fromEntries(r.body.text.cases.map((c: { key: string }) => [c.key, c]));
    expect(cases.weak.pot).toBe(pot(a.percentiles.real.p10));
    expect(cases.typical.pot).toBe(pot(a.percentiles.real.p50));
    expect(cases.strong.pot).toBe(pot(a.percentiles.real.p90));
    expect(cases.weak.income).toBe(income(a.realIncome.p10));
    expect(cases.typical.income).toBe(income(a.realIncome.p50));
    expect(cases.strong.income).toBe(income(a.realIncome.p90));
    expect(r.body.figures.pots.typical).toBe(a.percentiles.real.p50);
    expect(r.body.text.notes.join(' ')).toContain('10th, 50th and 90th percentiles');
    expect(r.body.text.notes.join(' ')).toContain('nearest £1,000');
    expect(r.body.text.caution).toContain(CAUTION_TEXT);
    // Paying more in can only raise the pot on every path, so it raises the median.
    expect(r.body.figures.whatIf.extraContribution).toBeGreaterThan(0);
    expect(r.body.text.changes[0]).toContain('could add about');
  });

  it('exports the same wording and figures as a PDF and exact figures as CSV', async () => {
    const optionId = run.options[1].id;
    const q = `runId=${run.id}&optionId=${optionId}&memberId=${midCareer.id}`;
    const a = pairOf(optionId, midCareer.id).atRetirement;
    const pdf = await download(comms, `${S()}/statements/file?${q}&format=pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.type).toBe('application/pdf');
    expect(pdf.disposition).toMatch(/attachment; filename="statement-mid-career-.*\.pdf"/);
    const { text } = await pdfText(pdf.body);
    const preview = await comms.get(`${S()}/statements/preview?${q}`);
    for (const c of preview.body.text.cases) expect(text).toContain(squash(c.sentence));
    for (const line of preview.body.text.changes) expect(text).toContain(squash(line));
    expect(text).toContain(pot(a.percentiles.real.p50));
    expect(text).toContain(squash(CAUTION_TEXT));
    const csv = await download(comms, `${S()}/statements/file?${q}&format=csv`);
    const [row] = parse(csv.body.toString('utf8'), { columns: true }) as Record<string, string>[];
    expect(Number(row.typical_pot_p50_exact)).toBe(a.percentiles.real.p50);
    expect(Number(row.weak_pot_p10_exact)).toBe(a.percentiles.real.p10);
    expect(Number(row.typical_pot_p50_rounded)).toBe(roundMoney(a.percentiles.real.p50, 'pot'));
    expect(Number(row.strong_income_p90_rounded)).toBe(roundMoney(a.realIncome.p90, 'income'));
    expect(row.caution).toBe(CAUTION_TEXT);
  });

  it('exports a statement for every member of the uploaded membership in a background job, with progress, then offers the file', async () => {
    const r = await comms.post(`${S()}/statement-exports`, { runId: run.id, optionId: run.options[0].id, scope: 'membership', format: 'csv' });
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    expect(r.body).toMatchObject({ status: 'queued', memberCount: 40, scope: 'membership' });
    const early = await comms.get(`${S()}/statement-exports/${r.body.id}/file`);
    if (early.status !== 200) expect(early.status).toBe(409);
    const done = await eventually(
      'the export to finish',
      async () => {
        const x = await comms.get(`${S()}/statement-exports/${r.body.id}`);
        return x.body.status === 'done' || x.body.status === 'failed' ? x.body : null;
      },
      90_000,
    );
    expect(done.status, done.error).toBe('done');
    expect(done.progress).toBe(1);
    const csv = await download(comms, `${S()}/statement-exports/${r.body.id}/file`);
    expect(csv.status).toBe(200);
    const rows = parse(csv.body.toString('utf8'), { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(40);
    for (const row of rows) {
      expect(row.member).toMatch(/^Member /);
      expect(Number(row.typical_pot_p50_rounded)).toBe(roundMoney(Number(row.typical_pot_p50_exact), 'pot'));
      expect(Number(row.weak_pot_p10_exact)).toBeLessThanOrEqual(Number(row.typical_pot_p50_exact));
      expect(Number(row.typical_pot_p50_exact)).toBeLessThanOrEqual(Number(row.strong_pot_p90_exact));
    }
    const list = await comms.get(`${S()}/statement-exports`);
    expect(list.body.exports[0]).toMatchObject({ id: r.body.id, status: 'done' });
  }, 120_000);

  it('exports every illustrative member as one PDF, a page each', async () => {
    const r = await comms.post(`${S()}/statement-exports`, { runId: run.id, optionId: run.options[0].id, scope: 'illustrative', format: 'pdf' });
    expect(r.status).toBe(202);
    await eventually('the PDF export', async () => ((await comms.get(`${S()}/statement-exports/${r.body.id}`)).body.status === 'done' ? true : null), 60_000);
    const pdf = await download(comms, `${S()}/statement-exports/${r.body.id}/file`);
    const { text, pages } = await pdfText(pdf.body);
    expect(pages).toBe(run.members.length);
    for (const m of run.members) expect(text).toContain(`This is for ${m.label}`);
  }, 90_000);

  it('refuses bad requests with the field and reason, and writes nothing', async () => {
    const count = async () => (await s.db.select({ n: sql<number>`count(*)::int` }).from(statementExports))[0].n;
    const before = await count();
    const badMember = await comms.get(`${S()}/statements/preview?runId=${run.id}&optionId=${run.options[0].id}&memberId=someone-else`);
    expect(badMember.status).toBe(400);
    expect(badMember.body.issues).toEqual([{ path: 'memberId', message: 'is not an illustrative member of that run' }]);
    const badFormat = await comms.get(`${S()}/statements/file?runId=${run.id}&optionId=${run.options[0].id}&memberId=${midCareer.id}&format=doc`);
    expect(badFormat.status).toBe(400);
    expect(badFormat.body.issues[0].path).toBe('format');
    const badScope = await comms.post(`${S()}/statement-exports`, { runId: run.id, optionId: run.options[0].id, scope: 'everyone', format: 'csv' });
    expect(badScope.status).toBe(400);
    expect(badScope.body.issues[0].path).toBe('scope');
    const badOption = await comms.post(`${S()}/statement-exports`, { runId: run.id, optionId: 'nope', scope: 'illustrative', format: 'csv' });
    expect(badOption.status).toBe(400);
    expect(badOption.body.issues[0].path).toBe('optionId');
    const other = await insertFinishedRun(s.db, s.secondSchemeId, { paths: 100 });
    const foreign = await comms.get(`${S()}/statements/preview?runId=${other.run.id}&optionId=${other.options[0].id}&memberId=${other.member.id}`);
    expect(foreign.status).toBe(404);
    expect(await count()).toBe(before);
  });
});
