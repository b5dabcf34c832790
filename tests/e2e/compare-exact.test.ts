import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { illustrativeMembers } from '../../db/schema';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { money, TOO_CLOSE_TEXT } from '../../figures';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { currentDefaultWithCopy, waitForRun } from '../api/reports-helpers';
import { launch, PHONE, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

/**
 * Moving λ on the comparison screen shows the exact certainty equivalents the comparison
 * endpoint computes from every path, and marks options too close to call. The run compares the
 * scheme's current default with an exact copy of it (equal on every path: never separated) and
 * one other option.
 */
let s: TestServer;
let worker: RunWorker;
let trustee: Client;
let run: any;

beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const { set, optionIds } = await currentDefaultWithCopy(trustee, s.db, s.schemeId);
  const [member] = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  const created = await trustee.post(`/schemes/${s.schemeId}/runs`, { assumptionSetId: set.id, optionIds, memberIds: [member.id], paths: 1000, seed: 31337, riskAversion: 2 });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('the comparison screen at any λ', () => {
  it.each([
    ['wide', WIDE],
    ['phone', PHONE],
  ] as const)('shows the exact CE the API returns and the too-close mark as λ moves (%s)', async (name, size) => {
    const b = await launch(size);
    try {
      const { page } = b;
      await signIn(page, s.baseUrl, 'trustee@fernleigh.example');
      await page.goto(`${s.baseUrl}/projections/${run.id}`);
      await page.getByTestId('comparison-table').first().waitFor({ timeout: 60_000 });
      for (const lambda of [8, 0]) {
        await page.getByRole('button', { name: `λ ${lambda}`, exact: true }).click();
        await page.getByText(`Options ranked at λ = ${lambda}`).waitFor({ timeout: 30_000 });
        const api = await trustee.get(`/schemes/${s.schemeId}/runs/${run.id}/comparison?lambda=${lambda}`);
        expect(api.status).toBe(200);
        const table = page.getByTestId('comparison-table').first();
        const names = (await table.getByTestId('ranked-option').allInnerTexts()).map((t) => /^\d+\.\s*(.+)$/m.exec(t.trim())![1].trim());
        const ces = (await table.getByTestId('cell-certaintyEquivalentPot').allInnerTexts()).map((t) => t.split('\n').map((x) => x.trim()));
        expect(names).toHaveLength(3);
        for (const [i, option] of names.entries()) {
          const id = run.options.find((o: { name: string }) => o.name === option).id;
          const exact = api.body.pairs.find((p: { optionId: string }) => p.optionId === id).certaintyEquivalent;
          expect(ces[i][0], `${option} at λ = ${lambda}`).toBe(money(exact.realPot, 'GBP'));
          expect(ces[i][1]).toBe(`± ${money(exact.standardError, 'GBP', 'standardError')}`);
        }
        // The current default and its copy are equal on every path: the one ranked above is marked.
        const marks = await table.getByTestId('too-close-mark').allInnerTexts();
        expect(marks.length).toBeGreaterThanOrEqual(1);
        expect(marks[0].trim()).toBe(TOO_CLOSE_TEXT);
        expect(await page.getByTestId('too-close').first().innerText()).toMatch(/Copy of the current default.*too close to call at this number of paths/);
        // Never a winner between the two: whichever is first is "not separated" from the other.
        const lead = await page.getByTestId('lead-sentence').innerText();
        const original = run.options[0].name;
        expect(lead).not.toContain(`${original} has the highest certainty-equivalent pot, ahead of Copy of the current default`);
        expect(lead).not.toContain(`Copy of the current default has the highest certainty-equivalent pot, ahead of ${original}`);
      }
      await page.getByTestId('break-even-table').scrollIntoViewIfNeeded();
      expect(await page.getByTestId('break-even-table').innerText()).toMatch(/same pot on every path/);
      await screenshot(page, `compare-exact-${name}`);
    } finally {
      await b.close();
    }
  }, 120_000);
});
