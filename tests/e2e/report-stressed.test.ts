import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { assumptionSets, funds, illustrativeMembers } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { waitForRun } from '../api/reports-helpers';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

/** The stored board report of a stressed run, in the app: its summary first, and the stressed figures beside the base ones. */
let s: TestServer;
let worker: RunWorker;
let report: any;

beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  const trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const [set] = await s.db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, s.schemeId), eq(assumptionSets.status, 'approved')));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  const [fund] = await s.db.select().from(funds).where(eq(funds.schemeId, s.schemeId)).orderBy(funds.name);
  const created = await trustee.post(`/schemes/${s.schemeId}/runs`, {
    assumptionSetId: set.id,
    optionIds: options.slice(0, 2).map((o) => o.id),
    memberIds: [members[members.length - 1].id],
    paths: 600,
    seed: 77,
    stress: { fundId: fund.id, yearsBeforeRetirement: 2, fall: 0.25 },
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
  const r = await trustee.post(`/schemes/${s.schemeId}/reports`, { runId: run.id, title: 'Stress on screen' });
  expect(r.status).toBe(201);
  report = (await trustee.get(`/schemes/${s.schemeId}/reports/${r.body.id}`)).body;
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('a stressed board report in the app', () => {
  it.each([
    ['wide', WIDE],
    ['phone', PHONE],
  ] as const)('shows the summary and the stressed figures beside the base ones (%s)', async (name, size) => {
    const b = await launch(size);
    try {
      await signIn(b.page, s.baseUrl, 'board@fernleigh.example');
      await b.page.goto(`${s.baseUrl}/reports/${report.id}`);
      const summary = b.page.getByTestId('report-summary');
      await summary.waitFor({ timeout: 30_000 });
      const summaryText = await summary.innerText();
      expect(summaryText).toContain(report.content.summary.question);
      expect(summaryText).toContain(`Under stress: ${report.content.summary.stress.description}`);
      for (const line of report.content.summary.stress.sentences) expect(summaryText).toContain(line);
      const stressed = b.page.getByTestId('report-stressed');
      await stressed.scrollIntoViewIfNeeded();
      const stressedText = await stressed.innerText();
      expect(report.content.stressed.members[0].rows).toHaveLength(2);
      for (const row of report.content.stressed.members[0].rows) for (const cell of Object.values(row) as string[]) expect(stressedText).toContain(cell);
      await screenshot(b.page, `report-stressed-${name}`);
    } finally {
      await b.close();
    }
  }, 90_000);
});
