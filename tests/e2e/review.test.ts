import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { reviews, schemeSettings } from '../../db/schema';
import { DEMO_SECOND_TRUSTEE } from '../../db/seed';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { schemeOptions } from '../helpers/options';
import { finishedSchemeRun } from '../api/reports-helpers';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let worker: RunWorker;
let cautiousId: string;

beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  // The evidence: a finished comparison of the demo options and a board report made from it.
  const trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  cautiousId = (await schemeOptions(s.db, s.schemeId)).find((o) => o.name === 'Cautious glide')!.id;
  const run = await finishedSchemeRun(trustee, s.db, s.schemeId, { paths: 500, seed: 4242 });
  expect((await trustee.post(`/schemes/${s.schemeId}/reports`, { runId: run.id, title: 'Review evidence pack' })).status).toBe(201);
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('a review of the default option in the browser', () => {
  it('is opened and filled in by one trustee (wide), signed by a second on a phone, and then reads as final', async () => {
    const wide = await launch(WIDE);
    let reviewUrl = '';
    try {
      const page = wide.page;
      await signIn(page, s.baseUrl, 'trustee@fernleigh.example');
      await page.getByTestId('nav-Reviews').first().click();
      await page.getByTestId('review-title').fill('Default review 2027');
      await page.getByTestId('open-review').click();
      await page.getByRole('heading', { name: 'Default review 2027' }).waitFor();
      reviewUrl = page.url();
      // Opened with the approved assumptions and every approved option version already ticked.
      expect(await page.getByRole('checkbox', { name: /Version 1/ }).first().getAttribute('aria-checked')).toBe('true');
      await page.getByTestId('missing').waitFor();
      expect(await page.getByTestId('missing').innerText()).toContain('add at least one finished projection run');

      await page.getByRole('checkbox', { name: /seed 4242/ }).click();
      await page.getByRole('checkbox', { name: /Review evidence pack/ }).click();
      await page.getByRole('radio', { name: 'Choose an option' }).click();
      await page.getByRole('radio', { name: 'Cautious glide v1' }).click();
      await page.getByTestId('review-lambda').fill('3');
      await page.getByTestId('review-calibration').fill('Each trustee chose between sure and uncertain pots; the median answer was λ = 3.');
      await page.getByTestId('review-reasons').fill('It protects members close to retirement at little cost to the median pot.');
      await page.getByTestId('review-dissent').fill('One trustee preferred more equity until retirement.');
      await page.getByTestId('save-review').click();
      await page.getByText('Ready to sign.', { exact: false }).waitFor();
      await screenshot(page, 'review-filled-wide');
      await page.getByTestId('sign-review').click();
      await page.getByText('Open · 1 of 2 signatures').waitFor();
      expect(await page.getByTestId('signature').allInnerTexts()).toEqual([expect.stringContaining('Idris Pellow')]);
      await screenshot(page, 'review-one-signature-wide');
    } finally {
      await wide.close();
    }

    const phone = await launch(PHONE);
    try {
      const page = phone.page;
      await signIn(page, s.baseUrl, DEMO_SECOND_TRUSTEE.email);
      await page.goto(reviewUrl);
      await page.getByRole('heading', { name: 'Default review 2027' }).waitFor();
      await screenshot(page, 'review-open-phone');
      await page.getByTestId('sign-review').scrollIntoViewIfNeeded();
      await page.getByTestId('sign-review').click();
      await page.getByText('This record can no longer change', { exact: false }).waitFor();
      expect(await page.getByTestId('decision-sentence').innerText()).toBe("The trustees chose Cautious glide (version 1) as the scheme's default option.");
      expect(await page.getByTestId('sign-review').count()).toBe(0);
      expect(await page.getByTestId('save-review').count()).toBe(0);
      await screenshot(page, 'review-signed-phone');
      // The decision record downloads from the same screen.
      const href = await page.getByTestId('record-pdf').getAttribute('href');
      const pdf = await page.request.get(`${s.baseUrl}${href}`);
      expect(pdf.status()).toBe(200);
      expect(pdf.headers()['content-type']).toBe('application/pdf');
    } finally {
      await phone.close();
    }

    const [row] = await s.db.select().from(reviews).where(eq(reviews.title, 'Default review 2027'));
    expect(row.status).toBe('signed_off');
    const [settings] = await s.db.select().from(schemeSettings).where(eq(schemeSettings.schemeId, s.schemeId));
    expect(settings.currentDefaultOptionId).toBe(cautiousId);
    expect(settings.nextReviewDue).toBe(row.nextReviewDue);

    // The overview shows the new current default and the next review date, wide.
    const again = await launch(WIDE);
    try {
      await signIn(again.page, s.baseUrl, 'board@fernleigh.example');
      await again.page.getByTestId('overview-current-default').waitFor();
      expect(await again.page.getByTestId('overview-current-default').innerText()).toContain('Current default: Cautious glide (v1)');
      expect(await again.page.getByTestId('overview-next-review').innerText()).toMatch(/Next review due \d+ \w+ \d{4}/);
      await screenshot(again.page, 'overview-governance-wide');
      await again.page.goto(reviewUrl);
      await again.page.getByText('This record can no longer change', { exact: false }).waitFor();
      await screenshot(again.page, 'review-signed-wide');
    } finally {
      await again.close();
    }
  });

  it('shows four-eyes approval of an option version: the editor is told to ask another trustee, who approves it', async () => {
    const wide = await launch(WIDE);
    try {
      const page = wide.page;
      await signIn(page, s.baseUrl, 'trustee@fernleigh.example');
      await page.goto(`${s.baseUrl}/options/${cautiousId}`);
      await page.getByTestId('edit-option').click();
      await page.getByLabel('Description').fill('De-risks early into bonds and cash; reviewed in 2027.');
      await page.getByTestId('save-option').click();
      await page.getByTestId('version-2').waitFor();
      await page.getByText('You made the last change to Cautious glide v2', { exact: false }).waitFor();
      expect(await page.getByTestId('approve').count()).toBe(0);
      await screenshot(page, 'option-draft-editor-wide');
      await page.getByRole('radio', { name: 'v1', exact: true }).click();
      await page.getByTestId('compare-versions').click();
      await page.getByTestId('version-weights').waitFor();
      await page.getByText('Changed between them: description.').waitFor();
      await screenshot(page, 'option-versions-compare-wide');
    } finally {
      await wide.close();
    }
    const phone = await launch(PHONE);
    try {
      const page = phone.page;
      await signIn(page, s.baseUrl, DEMO_SECOND_TRUSTEE.email);
      await page.goto(`${s.baseUrl}/options/${cautiousId}`);
      await page.getByTestId('approve').scrollIntoViewIfNeeded();
      await page.getByTestId('approve').click();
      await page.getByText('Approved by Ninian Castellow', { exact: false }).waitFor();
      await screenshot(page, 'option-approved-phone');
    } finally {
      await phone.close();
    }
  });
});
