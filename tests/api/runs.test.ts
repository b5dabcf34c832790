import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { assumptionSets, auditEvents, funds, illustrativeMembers, projectionRuns } from '../../db/schema';
import { insertOption, schemeOptions } from '../helpers/options';
import { createDb } from '../../db/client';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { enqueueRun, producerFor } from '../../server/jobs/queue';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import type { ScenarioSnapshot } from '../../server/services/scenario';

// Poll the queue quickly in tests.
process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let trustee: Client;
let worker: RunWorker | null = null;
let ids: { setId: string; optionIds: string[]; memberIds: string[]; fundIds: string[] };

const runsPath = () => `/schemes/${s.schemeId}/runs`;

async function waitFor(runId: string, timeoutMs = 60_000, seen?: Set<string>) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const r = await trustee.get(`${runsPath()}/${runId}`);
    expect(r.status).toBe(200);
    seen?.add(r.body.status);
    if (r.body.status === 'done' || r.body.status === 'failed') return r.body;
    if (Date.now() > until) throw new Error(`run ${runId} still ${r.body.status} after ${timeoutMs} ms`);
    await new Promise((res) => setTimeout(res, 50));
  }
}

beforeAll(async () => {
  s = await startTestServer();
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  const [set] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
  const options = await schemeOptions(s.db, s.schemeId);
  const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId)).orderBy(illustrativeMembers.age);
  ids = { setId: set.id, optionIds: options.map((o) => o.id), memberIds: members.map((m) => m.id), fundIds: set.fundOrder };
});

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('projection runs', () => {
  it('queues a run (run row and job together), then a worker takes it through running to done and stores the result', async () => {
    const created = await trustee.post(runsPath(), {
      assumptionSetId: ids.setId,
      optionIds: ids.optionIds.slice(0, 2),
      memberIds: [ids.memberIds[0]],
      paths: 30_000,
      seed: 11,
      riskAversion: 2,
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body).toMatchObject({ status: 'queued', progress: 0, seed: 11, paths: 30_000, assumptionsDraft: false });
    const runId = created.body.id as string;
    const job = await s.db.execute(sql`select state, data from pgboss.job where id = ${runId}`);
    expect(job.rows).toEqual([{ state: 'created', data: { runId } }]);

    worker = await startRunWorker({ databaseUrl: s.url, threads: 1, progressIntervalMs: 50, log: () => {} });
    const seen = new Set<string>();
    const done = await waitFor(runId, 90_000, seen);
    expect(done.status).toBe('done');
    expect(seen.has('running'), `statuses seen while polling: ${[...seen].join(', ')}`).toBe(true);
    expect(done.progress).toBe(1);
    expect(done.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    const result = done.result;
    expect(result.kind).toBe('keelson-run-result');
    expect(result.base.result.results).toHaveLength(2);
    // Larger runs keep a quantile sample of the terminal pots, ascending, not every path.
    expect(result.sample).toEqual({ kind: 'quantiles', size: 2000 });
    const pots: number[] = result.base.samples[0].realPots;
    expect(pots.every((v, i) => i === 0 || v >= pots[i - 1])).toBe(true);
    const pair = result.base.result.results[0];
    expect(pair.atRetirement.percentiles.real.p5).toBeLessThan(pair.atRetirement.percentiles.real.p50);
    expect(pair.extraStandardErrors.p50Real).toBeGreaterThan(0);
    expect(result.stressed).toBeNull();
    const events = await s.db.select().from(auditEvents).where(eq(auditEvents.entityId, runId));
    expect(events.map((e) => e.action).sort()).toEqual(['run.completed', 'run.requested']);
  });

  it('gives identical results for the same inputs and seed, and different ones for another seed', async () => {
    const body = { assumptionSetId: ids.setId, optionIds: ids.optionIds.slice(1, 3), memberIds: ids.memberIds.slice(1, 3), paths: 300, riskAversion: 3 };
    const a = await trustee.post(runsPath(), { ...body, seed: 4242 });
    const b = await trustee.post(runsPath(), { ...body, seed: 4242 });
    const c = await trustee.post(runsPath(), { ...body, seed: 4243 });
    const [ra, rb, rc] = await Promise.all([waitFor(a.body.id), waitFor(b.body.id), waitFor(c.body.id)]);
    expect(ra.status).toBe('done');
    // Every path is kept when there are at most 2,000.
    expect(ra.result.sample).toEqual({ kind: 'all', size: 300 });
    expect(rb.result.base).toEqual(ra.result.base);
    expect(rc.result.base.result.results[0].atRetirement.mean.real).not.toBe(ra.result.base.result.results[0].atRetirement.mean.real);
  });

  it('runs a finished run again from its snapshot and reports that the results match', async () => {
    const a = await trustee.post(runsPath(), { assumptionSetId: ids.setId, optionIds: [ids.optionIds[0]], memberIds: [ids.memberIds[2]], paths: 200 });
    expect(a.body.seed).toBeGreaterThanOrEqual(0); // random by default, and shown
    const first = await waitFor(a.body.id);
    // The scheme's data changes afterwards; the rerun uses the stored snapshot, not the new data.
    await s.db.update(illustrativeMembers).set({ salary: 99_999 }).where(eq(illustrativeMembers.id, ids.memberIds[2]));
    const again = await trustee.post(`${runsPath()}/${a.body.id}/rerun`);
    expect(again.status).toBe(201);
    expect(again.body).toMatchObject({ rerunOf: a.body.id, seed: a.body.seed, paths: 200 });
    const second = await waitFor(again.body.id);
    expect(second.result.reproduction).toMatchObject({ of: a.body.id, matches: true, firstDifference: null });
    expect(second.result.base).toEqual(first.result.base);
  });

  it('reports the first difference when a stored result does not reproduce', async () => {
    const a = await trustee.post(runsPath(), { assumptionSetId: ids.setId, optionIds: [ids.optionIds[1]], memberIds: [ids.memberIds[2]], paths: 100, seed: 5 });
    const first = await waitFor(a.body.id);
    const tampered = structuredClone(first.result);
    tampered.base.result.results[0].atRetirement.mean.real += 1;
    await s.db.update(projectionRuns).set({ result: tampered }).where(eq(projectionRuns.id, a.body.id));
    const again = await trustee.post(`${runsPath()}/${a.body.id}/rerun`);
    const second = await waitFor(again.body.id);
    expect(second.result.reproduction.matches).toBe(false);
    expect(second.result.reproduction.firstDifference.path).toBe('base.result.results.0.atRetirement.mean.real');
  });

  it('runs the stress variant beside the unstressed one with the same seed', async () => {
    const equity = ids.fundIds[0];
    const a = await trustee.post(runsPath(), {
      assumptionSetId: ids.setId,
      optionIds: [ids.optionIds[0]],
      memberIds: [ids.memberIds[2]],
      paths: 400,
      seed: 9,
      stress: { fundId: equity, yearsBeforeRetirement: 2, fall: 0.35 },
    });
    expect(a.status, JSON.stringify(a.body)).toBe(201);
    const done = await waitFor(a.body.id);
    expect(done.result.stressed.result.stress).toEqual({ fundId: equity, yearsBeforeRetirement: 2, fall: 0.35 });
    const base = done.result.base.result.results[0].atRetirement.percentiles.real.p50;
    const stressed = done.result.stressed.result.results[0].atRetirement.percentiles.real.p50;
    expect(stressed).toBeLessThan(base);
  });

  it('marks a run failed with the reason when its stored input cannot run', async () => {
    const [row] = await s.db
      .insert(projectionRuns)
      .values({
        schemeId: s.schemeId,
        assumptionsDraft: false,
        seed: 1,
        paths: 100,
        riskAversion: 2,
        // A stored input the engine cannot run, on purpose.
        input: { assumptionSet: {}, funds: [], options: [], members: [], scenario: { seed: 1, paths: 100, funds: [] }, stress: null } as unknown as ScenarioSnapshot,
      })
      .returning();
    const { db, pool } = createDb(s.url, 2);
    await producerFor(pool);
    await db.transaction((tx) => enqueueRun(pool, tx, row.id));
    (await producerFor(pool)).stop({ close: false, graceful: false }).catch(() => undefined);
    await pool.end();
    const failed = await waitFor(row.id);
    expect(failed.status).toBe('failed');
    expect(failed.error).toMatch(/invalid scenario/);
    expect(failed.result).toBeNull();
  });
});

describe('bad run requests', () => {
  const good = () => ({ assumptionSetId: ids.setId, optionIds: ids.optionIds.slice(0, 2), memberIds: ids.memberIds.slice(0, 1), paths: 200 });
  const cases: [string, () => Record<string, unknown>, string][] = [
    ['no assumption set', () => ({ ...good(), assumptionSetId: undefined }), 'assumptionSetId'],
    ['an assumption set id that is not an id', () => ({ ...good(), assumptionSetId: 'set-1' }), 'assumptionSetId'],
    ['no options', () => ({ ...good(), optionIds: [] }), 'optionIds'],
    ['the same option twice', () => ({ ...good(), optionIds: [ids.optionIds[0], ids.optionIds[0]] }), 'optionIds'],
    ['too few paths', () => ({ ...good(), paths: 10 }), 'paths'],
    ['fractional paths', () => ({ ...good(), paths: 1000.5 }), 'paths'],
    ['a negative seed', () => ({ ...good(), seed: -1 }), 'seed'],
    ['λ as text', () => ({ ...good(), riskAversion: 'high' }), 'riskAversion'],
    ['a stress fall of 120%', () => ({ ...good(), stress: { fundId: ids.fundIds[0], yearsBeforeRetirement: 1, fall: 1.2 } }), 'stress.fall'],
    ['an unknown field', () => ({ ...good(), pathz: 5 }), '(body)'],
    ['an unknown member id', () => ({ ...good(), memberIds: ['7d0f6e39-8b7a-4d1e-9c1e-1a2b3c4d5e6f'] }), 'memberIds.0'],
    ['a stress on a fund outside the set', () => ({ ...good(), stress: { fundId: '7d0f6e39-8b7a-4d1e-9c1e-1a2b3c4d5e6f', yearsBeforeRetirement: 1, fall: 0.2 } }), 'stress.fundId'],
  ];

  it.each(cases)('answers 400 naming the field for %s, and stores nothing', async (_label, body, field) => {
    const before = await s.db.select({ n: sql<number>`count(*)::int` }).from(projectionRuns);
    const r = await trustee.post(runsPath(), body());
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    const paths = (r.body.issues as { path: string }[]).map((i) => i.path);
    expect(paths.some((p) => p === field || p.startsWith(`${field}.`)), `issues ${JSON.stringify(r.body.issues)} should name ${field}`).toBe(true);
    const after = await s.db.select({ n: sql<number>`count(*)::int` }).from(projectionRuns);
    expect(after[0].n).toBe(before[0].n);
  });

  it("refuses another scheme's option under this scheme", async () => {
    const [fund] = await s.db.insert(funds).values({ schemeId: s.secondSchemeId, name: 'Other scheme fund' }).returning();
    const other = await insertOption(s.db, s.secondSchemeId, { name: 'Other scheme option', glidePath: [{ yearsToRetirement: 0, weights: { [fund.id]: 1 } }] });
    const r = await trustee.post(runsPath(), { ...good(), optionIds: [ids.optionIds[0], other.id] });
    expect(r.status).toBe(400);
    expect(r.body.issues).toEqual([{ path: 'optionIds.1', message: 'is not a default option of this scheme' }]);
    const jobs = await s.db.execute(sql`select count(*)::int as n from pgboss.job j where not exists (select 1 from projection_runs r where r.id = j.id)`);
    expect(jobs.rows[0]).toEqual({ n: 0 });
  });

  it('does not let a board reviewer start a run, but lets them read runs', async () => {
    const board = new Client(s.baseUrl);
    await board.signIn('board@fernleigh.example');
    expect((await board.post(runsPath(), good())).status).toBe(403);
    const list = await board.get(runsPath());
    expect(list.status).toBe(200);
    expect(list.body.runs.length).toBeGreaterThan(0);
    expect(list.body.runs[0]).not.toHaveProperty('result');
  });
});
