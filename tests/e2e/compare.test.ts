import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { startTestServer, type TestServer } from '../helpers/app';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let worker: RunWorker;
beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
});
afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('comparing default options', () => {
  it('lets a trustee start a comparison, watch it finish, read the ranking and move λ', async () => {
    const b = await launch(WIDE);
    try {
      const { page } = b;
      await signIn(page, s.baseUrl, 'trustee@fernleigh.example');
      await page.getByRole('link', { name: 'Projections' }).first().click();
      await page.getByText('New comparison').waitFor();
      // The four demo options and three members are chosen by default; 5,000 paths keeps the bar visible.
      await page.getByRole('checkbox', { name: '5,000' }).click();
      await page.getByRole('button', { name: 'Start comparison' }).click();
      await page.getByRole('progressbar').first().waitFor({ timeout: 15_000 });
      await page.getByTestId('comparison-table').first().waitFor({ timeout: 60_000 });
      expect(await page.getByRole('progressbar').count()).toBe(0);
      expect(await page.getByTestId('caution-notice').count()).toBe(1);

      const charts = page.getByTestId('fan-chart');
      expect(await charts.count()).toBe(4);
      // The chance of reaching the target, one bar per option (react-native-chart-kit), with its figures as text.
      await page.getByTestId('chance-chart').waitFor();
      expect(await page.getByTestId('chance-chart-text').innerText()).toMatch(/^(.+ \d+%; ){3}.+ \d+%\.$/);
      expect(await page.getByTestId('differences').innerText()).toMatch(/percentage point/);
      const text = await page.getByTestId('fan-chart-text').first().innerText();
      expect(text).toMatch(/median £[\d,]+/);
      const ranked = page.getByTestId('ranked-option');
      expect(await ranked.count()).toBe(4);
      // The scheme's current default is pinned first and marked; every rank appears once.
      expect(await ranked.first().innerText()).toMatch(/Balanced lifecycle[\s\S]*Current default · baseline/);
      const ranks = async () => (await ranked.allInnerTexts()).map((t) => Number(/^(\d+)\./.exec(t)?.[1])).sort();
      await screenshot(page, 'compare-wide');

      // Break-even λ as one small table (member × pair of options), not a sentence per pair.
      const breakEven = await page.getByTestId('break-even-table').innerText();
      expect(breakEven).toMatch(/Break-even λ \(95% interval\)/);
      expect(await page.getByTestId('break-even-sentence').count()).toBe(0);
      // Each λ's certainty equivalents come from the server, from every path.
      const ces = async () => (await page.getByTestId('cell-certaintyEquivalentPot').allInnerTexts()).join(' | ');
      const firstAt2 = await ranked.first().innerText();
      const atTwo = await ces();
      await page.getByRole('button', { name: 'λ 0', exact: true }).click();
      await page.getByText('Options ranked at λ = 0').waitFor();
      const atZero = await ces();
      await page.getByRole('button', { name: 'λ 8', exact: true }).click();
      await page.getByText('Options ranked at λ = 8').waitFor();
      const atEight = await ces();
      const firstAt8 = await ranked.first().innerText();
      // A risk-neutral board and a strongly averse one value the same spread of pots differently.
      expect(new Set([atZero, atTwo, atEight]).size, `${atZero} / ${atTwo} / ${atEight}`).toBe(3);
      expect(`${firstAt2} ${firstAt8}`).toMatch(/^\d\. Balanced lifecycle/);
      expect(await ranks()).toEqual([1, 2, 3, 4]);

      // Phone size: the same run, cards stacked.
      const url = page.url();

      // The board's λ carries over into a board report made from this screen.
      await page.getByRole('button', { name: 'Make a board report at λ = 8' }).first().click();
      await page.getByText('Make a report').waitFor();
      await page.getByTestId('make-report').click();
      await page.getByText('Certainty equivalents at risk aversion λ = 8').waitFor({ timeout: 60_000 });

      const phone = await launch(PHONE);
      try {
        await signIn(phone.page, s.baseUrl, 'trustee@fernleigh.example');
        await phone.page.goto(url);
        await phone.page.getByTestId('fan-chart').first().waitFor({ timeout: 30_000 });
        await screenshot(phone.page, 'compare-phone');
        await phone.page.getByTestId('comparison-table').first().scrollIntoViewIfNeeded();
        await screenshot(phone.page, 'compare-phone-table');
      } finally {
        await phone.close();
      }
    } finally {
      await b.close();
    }
  });
});
