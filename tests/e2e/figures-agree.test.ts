import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { and, eq } from 'drizzle-orm';
import { assumptionSets, illustrativeMembers } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { download, pdfText, waitForRun } from '../api/reports-helpers';
import { launch, screenshot, signIn, WIDE } from './browser';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

/**
 * One run's key figures read the same everywhere: the comparison screen (rendered in the
 * browser), the board report's PDF text and its CSV export ("as shown" columns) carry the
 * same strings, because all three take them from figures/.
 */
let s: TestServer;
let worker: RunWorker;
let trustee: Client;
let run: any;
let reportId: string;

beforeAll(async () => {
  s = await startTestServer({ env: { WEB_DIST: process.env.KEELSON_WEB_DIST ?? 'dist' } });
  worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const [set] = await s.db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, s.schemeId), eq(assumptionSets.status, 'approved')));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  const created = await trustee.post(`/schemes/${s.schemeId}/runs`, { assumptionSetId: set.id, optionIds: options.slice(0, 3).map((o) => o.id), memberIds: members.slice(0, 2).map((m) => m.id), paths: 700, seed: 4711, riskAversion: 2 });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  run = await waitForRun(trustee, s.schemeId, created.body.id);
  expect(run.status).toBe('done');
  const rep = await trustee.post(`/schemes/${s.schemeId}/reports`, { runId: run.id, title: 'Figures agree' });
  expect(rep.status).toBe(201);
  reportId = rep.body.id;
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

const squash = (t: string) => t.replace(/\s+/g, ' ').trim();
const KEYS = ['certaintyEquivalentPot', 'medianReal', 'p5Real', 'probabilityReachingTarget', 'meanReal', 'certaintyEquivalentReturn'] as const;
const CSV: Record<(typeof KEYS)[number], string> = {
  certaintyEquivalentPot: 'certainty_equivalent_real_pot_as_shown',
  medianReal: 'real_pot_median_as_shown',
  p5Real: 'real_pot_p5_as_shown',
  probabilityReachingTarget: 'probability_reaching_target_as_shown',
  meanReal: 'real_pot_mean_as_shown',
  certaintyEquivalentReturn: 'certainty_equivalent_real_return_as_shown',
};

describe('one figure, one string, on screen, in the PDF and in the CSV', () => {
  it('shows the first member’s ranking at the run’s λ exactly as the report prints and exports it', async () => {
    const b = await launch(WIDE);
    let screen: { rank: string; option: string; cells: Record<string, string> }[] = [];
    let sentences: string[] = [];
    let differences: string[] = [];
    let breakEven: string[] = [];
    let baseline = '';
    try {
      await signIn(b.page, s.baseUrl, 'trustee@fernleigh.example');
      await b.page.goto(`${s.baseUrl}/projections/${run.id}`);
      const table = b.page.getByTestId('comparison-table').first();
      await table.waitFor({ timeout: 60_000 });
      const names = await table.getByTestId('ranked-option').allInnerTexts();
      const values: Record<string, string[]> = {};
      // Each cell shows the figure, then "± …" where it has a standard error: the figure is the first line.
      for (const key of KEYS) values[key] = (await table.getByTestId(`cell-${key}`).allInnerTexts()).map((t) => t.split('\n')[0].trim());
      // Each row reads "rank. option" (the scheme's current default, pinned first, is marked on a second line).
      screen = names.map((n, i) => {
        const [, rank, option] = /^(\d+)\.\s*(.+)$/m.exec(n.trim())!;
        return { rank, option: option.trim(), cells: Object.fromEntries(KEYS.map((k) => [k, values[k][i]])) };
      });
      // The ranking's sentences (lead, too close to call) and the break-even table's cells.
      sentences = [...(await b.page.getByTestId('lead-sentence').allInnerTexts()), ...(await b.page.getByTestId('too-close').allInnerTexts())].map(squash);
      breakEven = (await b.page.getByTestId('break-even-table').innerText()).split('\n').map(squash).filter(Boolean);
      differences = (await b.page.getByTestId('differences').innerText()).split('\n').map(squash).filter(Boolean);
      baseline = squash(await b.page.getByTestId('baseline-note').innerText());
      await screenshot(b.page, 'figures-agree-screen');
    } finally {
      await b.close();
    }
    expect(screen).toHaveLength(3);
    expect(sentences.length).toBeGreaterThanOrEqual(1);
    // Headings and, for each of the two other options, its three differences ± their standard errors.
    expect(differences.filter((l) => l.startsWith('±')).length).toBeGreaterThanOrEqual(6);
    expect(breakEven.length).toBeGreaterThan(3);

    const { text } = await pdfText((await download(trustee, `/schemes/${s.schemeId}/reports/${reportId}/pdf`)).body);
    const csv = parse((await download(trustee, `/schemes/${s.schemeId}/reports/${reportId}/comparison.csv`)).body.toString('utf8'), { columns: true, relax_column_count: true }) as Record<string, string>[];
    const member = run.members[0].label;
    const rows = csv.filter((r) => r.member === member);
    // The same ranking, laid out in the same order (the current default first) …
    expect(rows.map((r) => r.option)).toEqual(screen.map((x) => x.option));
    expect(rows.map((r) => r.rank)).toEqual(screen.map((x) => x.rank));
    expect([...screen.map((x) => Number(x.rank))].sort()).toEqual([1, 2, 3]);
    for (const [i, x] of screen.entries()) {
      expect(text, `rank ${x.rank} in the PDF`).toContain(`${x.rank}. ${x.option}`);
      for (const key of KEYS) {
        // … every key figure identical as a string in the CSV's "as shown" column …
        expect(rows[i][CSV[key]], `${key} of ${x.option} in the CSV`).toBe(x.cells[key]);
        // … and printed in the PDF.
        expect(text, `${key} of ${x.option} (${x.cells[key]}) in the PDF`).toContain(x.cells[key]);
      }
    }
    // The sentences about λ and about the baseline read the same in the PDF.
    expect(baseline).toMatch(/current default/);
    for (const sentence of [...sentences, ...differences, ...breakEven, baseline]) expect(text).toContain(sentence);
  }, 120_000);
});
