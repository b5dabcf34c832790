import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { funds, illustrativeMembers } from '../../db/schema';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { money, NOT_SEPARATED_TEXT } from '../../figures';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { currentDefaultWithCopy, download, pdfText, waitForRun } from './reports-helpers';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

/**
 * The board report of a stressed run: a first-page summary, the stressed figures beside the base
 * ones (PDF and the copy the app shows), and no winner named where the simulation noise cannot
 * separate two options. The run compares the scheme's current default with an exact copy of it
 * (equal on every path, so never separated) and one other option.
 */
let s: TestServer;
let worker: RunWorker;
let trustee: Client;
let run: any;
let report: any;
let text: string;
let pages: number;
const squash = (t: string) => t.replace(/\s+/g, ' ').trim();

beforeAll(async () => {
  s = await startTestServer();
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const { set, optionIds } = await currentDefaultWithCopy(trustee, s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  const [equity] = await s.db.select().from(funds).where(eq(funds.schemeId, s.schemeId)).orderBy(funds.name);
  const created = await trustee.post(`/schemes/${s.schemeId}/runs`, {
    assumptionSetId: set.id,
    optionIds,
    memberIds: members.slice(0, 2).map((m) => m.id),
    paths: 800,
    seed: 9091,
    riskAversion: 2,
    stress: { fundId: equity.id, yearsBeforeRetirement: 3, fall: 0.3 },
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
  const r = await trustee.post(`/schemes/${s.schemeId}/reports`, { runId: run.id, title: 'Stressed review' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  report = (await trustee.get(`/schemes/${s.schemeId}/reports/${r.body.id}`)).body;
  ({ text, pages } = await pdfText((await download(trustee, `/schemes/${s.schemeId}/reports/${r.body.id}/pdf`)).body));
}, 180_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('the board report of a stressed run', () => {
  it('opens with a summary: the question, the options, the baseline, key figures ± their errors, the stress, the decision and the cautions', () => {
    const sm = report.content.summary;
    expect(sm.options).toHaveLength(3);
    expect(sm.keyFigures.length).toBeGreaterThanOrEqual(2);
    expect(sm.stress.sentences).toHaveLength(2);
    // All on the first pages, before the assumptions.
    const summaryAt = text.indexOf('Summary');
    expect(summaryAt).toBeGreaterThanOrEqual(0);
    expect(text.indexOf('Assumptions')).toBeGreaterThan(summaryAt);
    for (const line of [sm.question, sm.baseline, ...sm.keyFigures, ...sm.stress.sentences, sm.decision, ...sm.cautions]) {
      expect(text, line).toContain(squash(line));
      expect(text.indexOf(squash(line))).toBeLessThan(text.indexOf('Assumptions'));
    }
    expect(sm.keyFigures.join(' ')).toMatch(/± £[\d,]+/);
    expect(sm.decision).toMatch(/^No signed-off review has recorded a decision on this run yet/);
    expect(pages).toBeGreaterThanOrEqual(5);
  });

  it('prints the stressed figures beside the base ones, exactly as the comparison endpoint gives them', async () => {
    const base = await trustee.get(`/schemes/${s.schemeId}/runs/${run.id}/comparison?lambda=2&variant=base`);
    const stressed = await trustee.get(`/schemes/${s.schemeId}/runs/${run.id}/comparison?lambda=2&variant=stressed`);
    expect([base.status, stressed.status]).toEqual([200, 200]);
    expect(text).toContain('Under stress');
    expect(report.content.stressed.members).toHaveLength(2);
    for (const m of report.content.stressed.members) {
      expect(m.rows).toHaveLength(3);
      for (const row of m.rows) for (const cell of Object.values(row) as string[]) expect(text).toContain(cell);
    }
    let lower = 0;
    for (const p of stressed.body.pairs) {
      const b = base.body.pairs.find((x: { optionId: string; memberId: string }) => x.optionId === p.optionId && x.memberId === p.memberId);
      expect(text).toContain(money(p.certaintyEquivalent.realPot, 'GBP'));
      expect(text).toContain(money(b.certaintyEquivalent.realPot, 'GBP'));
      if (p.certaintyEquivalent.realPot < b.certaintyEquivalent.realPot) lower++;
    }
    // A 30% fall three years before retirement lowers the certainty equivalents.
    expect(lower).toBeGreaterThan(0);
    // The app shows the same stressed rows as the file.
    expect(report.content.stressed.description).toMatch(/^a 30% fall in .+ in the year starting 3 years before retirement$/);
  });

  it('names no winner inside the noise, and drops the claim that differences are not sampling noise', async () => {
    const base = await trustee.get(`/schemes/${s.schemeId}/runs/${run.id}/comparison?lambda=2&variant=base`);
    expect(text).not.toMatch(/not sampling noise/);
    const name = (id: string) => run.options.find((o: { id: string }) => o.id === id).name;
    for (const ranking of base.body.ranking) {
      const [top, next] = ranking.options;
      const topName = name(top.optionId);
      if (top.toNext.tooCloseToCall || top.toNext.value === 0) {
        expect(text).not.toContain(`${topName} has the highest certainty-equivalent pot`);
        expect(text).toContain(`${topName} and ${name(next.optionId)} are ${NOT_SEPARATED_TEXT}`);
      } else {
        expect(text).toContain(`${topName} has the highest certainty-equivalent pot, ahead of ${name(next.optionId)}`);
      }
    }
    // The copy of the current default equals it on every path: its differences are never separated.
    for (const t of report.content.differenceTables) {
      const copy = t.rows.find((r: { option: string }) => r.option === 'Copy of the current default');
      expect(copy.ce).toMatchObject({ text: '£0', tooCloseToCall: true });
    }
    expect(text).toContain(`£0 ± £0 ${NOT_SEPARATED_TEXT}`);
    // Break-even λ as one table; the copy is the same pot on every path.
    expect(text).toContain('Break-even λ (95% interval)');
    expect(text).toContain('same pot on every path');
    expect(text).not.toMatch(/ranks above/);
  });
});
