import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { assumptionSets, illustrativeMembers, projectionRunPots, projectionRuns } from '../../db/schema';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { decodePots, storeVariant, type StoredResult } from '../../server/jobs/result';
import { certaintyEquivalentPot, runScenario, type ScenarioInput } from '../../simulation';
import { insertFinishedRun } from './route-examples/reports';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { schemeOptions } from '../helpers/options';
import { waitForRun } from './reports-helpers';

// Poll the queue quickly in tests.
process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let trustee: Client;
let worker: RunWorker;
let ids: { setId: string; optionIds: string[]; memberIds: string[] };

const runsPath = () => `/schemes/${s.schemeId}/runs`;

beforeAll(async () => {
  s = await startTestServer();
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const [set] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  ids = { setId: set.id, optionIds: options.map((o) => o.id), memberIds: members.map((m) => m.id) };
  worker = await startRunWorker({ databaseUrl: s.url, threads: 2, progressIntervalMs: 50, log: () => {} });
});

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('comparing the options of a finished run at any λ', () => {
  let run: { id: string; input: { scenario: ScenarioInput }; result: StoredResult };
  let engine: ReturnType<typeof runScenario>;

  beforeAll(async () => {
    const created = await trustee.post(runsPath(), {
      assumptionSetId: ids.setId,
      optionIds: ids.optionIds.slice(0, 3),
      memberIds: ids.memberIds.slice(0, 2),
      paths: 5000,
      seed: 31,
      riskAversion: 2,
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    run = await waitForRun(trustee, s.schemeId, created.body.id);
    expect(run.result.engineVersion).toBe('2.0.0');
    // The run's own scenario, computed again here: every terminal real pot.
    engine = runScenario(run.input.scenario);
  });

  it('runs new projections in scenario format 2 and records the conventions in the snapshot and the result', () => {
    expect(run.input.scenario).toMatchObject({ version: 2, timing: { glideWeights: 'mid-year', contributions: 'spread' }, contributionBasis: { basis: 'full-salary' } });
    expect(run.result.base.result.conventions).toEqual({ timing: { glideWeights: 'mid-year', contributions: 'spread' }, contributionBasis: { basis: 'full-salary' } });
    expect(run.result.base.result.comparisons).toHaveLength(2 * 3);
  });

  it('stores every terminal real pot, compressed, exactly as the engine computed them', async () => {
    const rows = await s.db.select().from(projectionRunPots).where(eq(projectionRunPots.runId, run.id));
    expect(rows).toHaveLength(3 * 2);
    for (const pair of engine.results) {
      const row = rows.find((r) => r.optionId === pair.optionId && r.memberId === pair.memberId)!;
      expect(row.variant).toBe('base');
      const pots = decodePots(row.data, row.paths, row.encoding);
      expect(Buffer.from(pots.buffer).equals(Buffer.from(pair.terminalRealPots.buffer))).toBe(true);
      expect(row.data.length).toBeLessThan(8 * row.paths);
    }
  });

  it.each([5, 10, 50])('gives the certainty equivalent of all the terminal pots at λ = %d to 1e-9 relative', async (lambda) => {
    const r = await trustee.get(`${runsPath()}/${run.id}/comparison?lambda=${lambda}`);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body).toMatchObject({ runId: run.id, variant: 'base', lambda, paths: 5000, scenarioVersion: 2 });
    expect(r.body.pairs).toHaveLength(6);
    for (const pair of engine.results) {
      const expected = certaintyEquivalentPot(pair.terminalRealPots, lambda);
      const got = r.body.pairs.find((p: { optionId: string; memberId: string }) => p.optionId === pair.optionId && p.memberId === pair.memberId);
      const relative = Math.abs(got.certaintyEquivalent.realPot / expected - 1);
      expect(relative, `CE at λ=${lambda}: API ${got.certaintyEquivalent.realPot}, all pots ${expected}`).toBeLessThan(1e-9);
      expect(got.certaintyEquivalent.standardError).toBeGreaterThan(0);
      expect(typeof got.certaintyEquivalent.realAnnualReturn).toBe('number');
      // The stored 2,000-quantile sample misses the lower tail: at high λ its CE is off by far more.
      const sample = run.result.base.samples.find((x) => x.optionId === pair.optionId && x.memberId === pair.memberId)!.realPots;
      if (lambda === 50) expect(certaintyEquivalentPot(sample, lambda) / expected - 1).toBeGreaterThan(1e-6);
    }
    // Paired differences: A − B of the certainty equivalents, with the 2-standard-error rule.
    expect(r.body.differences).toHaveLength(2 * 3);
    for (const d of r.body.differences) {
      const ce = (o: string) => r.body.pairs.find((p: { optionId: string; memberId: string }) => p.optionId === o && p.memberId === d.memberId).certaintyEquivalent.realPot;
      expect(d.certaintyEquivalent.value).toBeCloseTo(ce(d.optionA) - ce(d.optionB), 6);
      expect(d.certaintyEquivalent.tooCloseToCall).toBe(Math.abs(d.certaintyEquivalent.value) < 2 * d.certaintyEquivalent.standardError);
      expect(d.medianPot.standardError).toBeGreaterThan(0);
    }
    // Ranking: highest CE first, each against the next.
    for (const rank of r.body.ranking) {
      const pots = rank.options.map((o: { realPot: number }) => o.realPot);
      expect(pots).toEqual([...pots].sort((a: number, b: number) => b - a));
      expect(rank.options.at(-1).toNext).toBeNull();
    }
    // Break-even λs come from the run (they do not depend on λ), with every crossing and its interval.
    expect(r.body.breakEven).toEqual(run.result.base.result.breakEven.map(({ memberId, optionA, optionB, status, crossings }) => ({ memberId, optionA, optionB, status, crossings })));
  });

  it('at the run’s own λ agrees with the figures stored with the run', async () => {
    const r = await trustee.get(`${runsPath()}/${run.id}/comparison?lambda=2`);
    for (const stored of run.result.base.result.comparisons) {
      const d = r.body.differences.find((x: { memberId: string; optionA: string; optionB: string }) => x.memberId === stored.memberId && x.optionA === stored.optionA && x.optionB === stored.optionB);
      expect(d).toEqual(stored);
    }
  });

  it.each([
    ['no λ', '', 'lambda'],
    ['λ as text', '?lambda=high', 'lambda'],
    ['λ above the range', '?lambda=51', 'lambda'],
    ['a stressed variant the run does not have', '?lambda=2&variant=stressed', 'variant'],
    ['an unknown variant', '?lambda=2&variant=worst', 'variant'],
  ])('answers 400 naming the field for %s', async (_label, query, field) => {
    const r = await trustee.get(`${runsPath()}/${run.id}/comparison${query}`);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.issues.map((i: { path: string }) => i.path)).toContain(field);
  });

  it('answers 404 for another scheme’s run and 409 for a run stored before pots were kept', async () => {
    const other = await insertFinishedRun(s.db, s.secondSchemeId, { paths: 100 });
    expect((await trustee.get(`${runsPath()}/${other.run.id}/comparison?lambda=2`)).status).toBe(404);
    const old = await insertFinishedRun(s.db, s.schemeId, { paths: 100 });
    const r = await trustee.get(`${runsPath()}/${old.run.id}/comparison?lambda=2`);
    expect(r.status).toBe(409);
    expect(r.body.message).toMatch(/run it again/i);
  });
});

describe('running again a run stored by engine 1', () => {
  it('reproduces every stored figure through scenario format 1, and then compares at any λ', async () => {
    // A run as engine 1.0.0 stored it: a format-1 snapshot, its figures without the fields engine 2 adds, no pots.
    const { run, input } = await insertFinishedRun(s.db, s.schemeId, { paths: 300, seed: 5 });
    const v1 = storeVariant(runScenario(input.scenario)).variant;
    const strip = (variant: typeof v1) => {
      const { conventions: _c, comparisons: _k, ...result } = variant.result;
      return {
        ...variant,
        result: {
          ...result,
          engineVersion: '1.0.0',
          results: result.results.map((p) => {
            const { uncertainty: _u, ...atRetirement } = p.atRetirement;
            return { ...p, atRetirement };
          }),
          breakEven: result.breakEven.map(({ crossings: _x, ...b }) => b),
        },
      };
    };
    const original = { kind: 'keelson-run-result', engineVersion: '1.0.0', sample: { kind: 'all', size: 300 }, base: strip(v1), stressed: null };
    await s.db.update(projectionRuns).set({ result: original as unknown as StoredResult, engineVersion: '1.0.0' }).where(eq(projectionRuns.id, run.id));
    const again = await trustee.post(`${runsPath()}/${run.id}/rerun`);
    expect(again.status).toBe(201);
    const second = await waitForRun(trustee, s.schemeId, again.body.id);
    expect(second.result.reproduction).toMatchObject({ of: run.id, matches: true, firstDifference: null });
    expect(second.engineVersion).toBe('2.0.0');
    expect(second.input.scenario.version).toBe(1);
    const c = await trustee.get(`${runsPath()}/${again.body.id}/comparison?lambda=10`);
    expect(c.status).toBe(200);
    expect(c.body.scenarioVersion).toBe(1);
  });
});
