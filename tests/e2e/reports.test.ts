import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { money } from '../../figures';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { finishedSchemeRun } from '../api/reports-helpers';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let worker: RunWorker;
let run: any;
let reportTitle: string;

beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  const trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  run = await finishedSchemeRun(trustee, s.db, s.schemeId, { options: 2, paths: 500, seed: 8 });
  reportTitle = 'Default option review, spring 2026';
  const rep = await trustee.post(`/schemes/${s.schemeId}/reports`, { runId: run.id, title: reportTitle });
  expect(rep.status).toBe(201);
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('reports and statements in the browser', () => {
  it('lets the communications officer preview a member statement and download it', async () => {
    for (const [size, name] of [
      [PHONE, 'phone'],
      [WIDE, 'wide'],
    ] as const) {
      const b = await launch(size);
      try {
        await signIn(b.page, s.baseUrl, 'comms@fernleigh.example');
        await b.page.getByRole('navigation').first().getByRole('link', { name: 'Statements' }).click();
        const preview = b.page.getByTestId('statement-preview');
        await preview.getByText('What your pension pot could be worth').waitFor();
        // The first option and the youngest member are chosen first; the preview states the run's median, rounded.
        const firstMember = run.members[0];
        const pair = run.result.base.result.results.find((r: { optionId: string; memberId: string }) => r.optionId === run.options[0].id && r.memberId === firstMember.id);
        await preview.getByText(`In a typical case, your pot could be about ${money(pair.atRetirement.percentiles.real.p50, 'GBP', 'pot')}.`, { exact: false }).waitFor();
        // Choose another member: the wording follows.
        await b.page.getByRole('radio', { name: 'Mid career' }).click();
        await preview.getByText('This is for Mid career').waitFor();
        expect(await b.page.getByTestId('caution-notice').count()).toBeGreaterThan(0);
        await expect(preview.getByText('This is not a promise.', { exact: false }).count()).resolves.toBe(1);
        await screenshot(b.page, `statement-preview-${name}`);
        const [download] = await Promise.all([b.page.waitForEvent('download'), b.page.getByTestId('statement-pdf').click()]);
        expect(download.suggestedFilename()).toMatch(/^statement-mid-career-.*\.pdf$/);
        const file = await download.path();
        expect(fs.readFileSync(file!).subarray(0, 5).toString()).toBe('%PDF-');
      } finally {
        await b.close();
      }
    }
  }, 120_000);

  it('lets a board reviewer open a stored report, with its figures and the caution', async () => {
    for (const [size, name] of [
      [WIDE, 'wide'],
      [PHONE, 'phone'],
    ] as const) {
      const b = await launch(size);
      try {
        await signIn(b.page, s.baseUrl, 'board@fernleigh.example');
        await b.page.getByRole('navigation').first().getByRole('link', { name: 'Reports' }).click();
        await b.page.getByRole('link', { name: new RegExp(reportTitle) }).click();
        await b.page.getByRole('heading', { name: reportTitle }).waitFor();
        await b.page.getByText(`Projection run ${run.id}`).waitFor();
        const median = money(run.result.base.result.results[0].atRetirement.percentiles.real.p50, 'GBP');
        await b.page.getByText(median, { exact: true }).first().waitFor();
        expect(await b.page.getByTestId('caution-notice').count()).toBe(1);
        // Which option the differences are measured from, in the words the PDF prints.
        expect(await b.page.getByTestId('report-baseline').innerText()).toMatch(/current default/);
        // A board reviewer reads and downloads, but does not send.
        expect(await b.page.getByRole('button', { name: 'E-mail to board reviewers' }).count()).toBe(0);
        await screenshot(b.page, `report-board-${name}`);
        const [download] = await Promise.all([b.page.waitForEvent('download'), b.page.getByTestId('report-pdf').click()]);
        expect(download.suggestedFilename()).toMatch(/\.pdf$/);
      } finally {
        await b.close();
      }
    }
  }, 120_000);
});
