import path from 'node:path';
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import type { Page } from 'playwright-core';
import { assumptionSets, fundAssumptions, funds } from '../../db/schema';
import { historyStatistics } from '../../simulation/history';
import { percent } from '../../figures';
import { startTestServer, type TestServer } from '../helpers/app';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

const FIXTURE = path.resolve(__dirname, '../fixtures/fernleigh-price-history.csv');

let s: TestServer;
beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
});
afterAll(async () => s?.close());

/** The actuary also serves a second scheme: pick the demo scheme as the one in view. */
async function pickDemoScheme(page: Page) {
  await page.evaluate((id) => localStorage.setItem('keelson.scheme', id), s.schemeId);
}

async function uploadHistory(page: Page) {
  await pickDemoScheme(page);
  await page.goto(`${s.baseUrl}/assumptions/history`);
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('choose-history').click()]);
  await chooser.setFiles(FIXTURE);
  await page.getByTestId('history-period').waitFor();
}

/** The fixture's suggestions computed independently of the page, from the file itself. */
function expectedFromFixture() {
  const [header, ...rows] = fs.readFileSync(FIXTURE, 'utf8').trim().split('\n');
  const names = header.split(',').slice(1);
  const levels = names.map((_, i) => rows.map((r) => Number(r.split(',')[i + 1])));
  const st = historyStatistics(names.map((n, i) => ({ id: n, levels: levels[i] })));
  return { months: rows.length - 1, byName: Object.fromEntries(st.funds.map((f) => [f.id, f])) };
}

describe('assumptions from a price history, adopted and approved in the browser', () => {
  let draftId = '';

  it('lets the actuary upload a price history, see the suggestions and adopt them into a draft', async () => {
    const b = await launch(WIDE);
    try {
      await signIn(b.page, s.baseUrl, 'actuary@fernleigh.example');
      await uploadHistory(b.page);
      const exp = expectedFromFixture();
      await expect(b.page.getByTestId('history-period').textContent()).resolves.toContain(`${exp.months} monthly returns`);
      const eq = exp.byName['Fernleigh Global Equity'];
      const shown = percent(eq.annualReturn, 'rate');
      const table = b.page.getByTestId('suggestions');
      await expect(table.textContent()).resolves.toContain(shown);
      await b.page.getByText('Growth of one unit').waitFor();
      await screenshot(b.page, 'assumptions-history-wide');

      await b.page.getByTestId('adopt').click();
      await b.page.getByText(/Adopted into draft v2/).waitFor();
      await b.page.getByTestId('open-draft').click();
      await b.page.getByText('Draft: not yet approved', { exact: false }).waitFor();
      const input = b.page.getByLabel('Fernleigh Global Equity: Return (%)');
      expect(Number(await input.inputValue())).toBeCloseTo(eq.annualReturn * 100, 3);
      draftId = b.page.url().split('/').pop()!;
      await screenshot(b.page, 'assumptions-draft-wide');
    } finally {
      await b.close();
    }
    // The stored draft holds the adopted figures; the approved v1 is untouched.
    const [equity] = await s.db.select().from(funds).where(and(eq(funds.schemeId, s.schemeId), eq(funds.name, 'Fernleigh Global Equity')));
    const [draft] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.id, draftId));
    expect(draft).toMatchObject({ version: 2, status: 'draft' });
    const [fa] = await s.db.select().from(fundAssumptions).where(and(eq(fundAssumptions.assumptionSetId, draftId), eq(fundAssumptions.fundId, equity.id)));
    const exp = expectedFromFixture().byName['Fernleigh Global Equity'];
    expect(Math.abs(fa.expectedReturn - exp.annualReturn)).toBeLessThan(1e-6);
    expect(Math.abs(fa.volatility - exp.annualVolatility)).toBeLessThan(1e-6);
    expect(fa.annualCharge).toBe(0.002); // the charge is kept from v1
  });

  it('checks the draft form with the API’s own rules beside each field, and stores percentages without noise', async () => {
    expect(draftId).not.toBe('');
    const b = await launch(WIDE);
    let requests = 0;
    try {
      await signIn(b.page, s.baseUrl, 'actuary@fernleigh.example');
      await pickDemoScheme(b.page);
      await b.page.goto(`${s.baseUrl}/assumptions/${draftId}`);
      b.page.on('request', (r) => void (r.method() === 'PUT' && requests++));
      const inflation = b.page.getByLabel('Inflation (%)');
      await inflation.fill('abc');
      await inflation.blur();
      await b.page.getByText('enter a percentage, e.g. 2.5').waitFor();
      // The engine's limit, checked in the browser by the same schema the API uses: no request is sent.
      await inflation.fill('150');
      await b.page.getByTestId('save-draft').click();
      await b.page.getByText('must be below 1 (a fraction)').waitFor();
      expect(requests).toBe(0);
      await screenshot(b.page, 'assumptions-form-errors-wide');
      await inflation.fill('2.5');
      await b.page.getByLabel('Fernleigh Global Equity: Charge (%)').fill('0.45');
      await b.page.getByTestId('save-draft').click();
      await b.page.getByText('Draft saved.').waitFor();
      expect(requests).toBe(1);
    } finally {
      await b.close();
    }
    const [draft] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.id, draftId));
    expect(draft.inflation).toBe(0.025);
    const [equity] = await s.db.select().from(funds).where(and(eq(funds.schemeId, s.schemeId), eq(funds.name, 'Fernleigh Global Equity')));
    const [fa] = await s.db.select().from(fundAssumptions).where(and(eq(fundAssumptions.assumptionSetId, draftId), eq(fundAssumptions.fundId, equity.id)));
    // Exactly the double nearest 0.0045, not 0.45 / 100 = 0.0045000000000000005.
    expect(fa.annualCharge).toBe(0.0045);
  });

  it('shows the suggestions on a phone with the table scrolling sideways', async () => {
    const b = await launch(PHONE);
    try {
      await signIn(b.page, s.baseUrl, 'actuary@fernleigh.example');
      await uploadHistory(b.page);
      await screenshot(b.page, 'assumptions-history-phone');
      await b.page.getByTestId('suggestions').scrollIntoViewIfNeeded();
      await screenshot(b.page, 'assumptions-suggestions-phone');
    } finally {
      await b.close();
    }
  });

  it('lets a trustee approve the draft, after which it shows as approved and offers no edit controls', async () => {
    expect(draftId).not.toBe('');
    const b = await launch(PHONE);
    try {
      await signIn(b.page, s.baseUrl, 'trustee@fernleigh.example');
      await b.page.goto(`${s.baseUrl}/assumptions`);
      await b.page.getByTestId('versions').waitFor();
      await screenshot(b.page, 'assumptions-list-phone');
      await b.page.goto(`${s.baseUrl}/assumptions/${draftId}`);
      expect(await b.page.getByTestId('save-draft').count()).toBe(0); // trustees do not edit
      await b.page.getByTestId('approve').click();
      await b.page.getByTestId('confirm-approve').click();
      await b.page.getByText(/Approved by Idris Pellow on/).waitFor();
      expect(await b.page.getByTestId('approve').count()).toBe(0);
      await screenshot(b.page, 'assumptions-approved-phone');
    } finally {
      await b.close();
    }
    const [row] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.id, draftId));
    expect(row.status).toBe('approved');
    expect(row.approvedAt).not.toBeNull();
  });

  it('shows the versions side by side and the other scheme-data screens at both sizes', async () => {
    const list = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
    const v1 = list.find((x) => x.version === 1)!;
    for (const [name, viewport] of [
      ['wide', WIDE],
      ['phone', PHONE],
    ] as const) {
      const b = await launch(viewport);
      try {
        await signIn(b.page, s.baseUrl, 'trustee@fernleigh.example');
        await b.page.goto(`${s.baseUrl}/assumptions/compare?a=${v1.id}&b=${draftId}`);
        await b.page.getByTestId('compare-funds').waitFor();
        await screenshot(b.page, `assumptions-compare-${name}`);
        await b.page.goto(`${s.baseUrl}/options`);
        await b.page.getByText('Balanced lifecycle').first().waitFor();
        await screenshot(b.page, `options-${name}`);
        await b.page.getByTestId('new-option').click();
        await b.page.getByText('Fund mix from 40 years to retirement').waitFor();
        await screenshot(b.page, `option-editor-${name}`);
        await b.page.goto(`${s.baseUrl}/members`);
        await b.page.getByTestId('illustrative').waitFor();
        await screenshot(b.page, `members-${name}`);
        await b.page.goto(`${s.baseUrl}/funds`);
        await b.page.getByText('Fernleigh Cash Reserve').first().waitFor();
        await screenshot(b.page, `funds-${name}`);
      } finally {
        await b.close();
      }
    }
  });
});
