import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { assumptionSets, defaultOptions, illustrativeMembers, projectionRuns } from '../../db/schema';
import { enqueueRun, producerFor } from '../../server/jobs/queue';
import { processRun, startRunWorker, type RunWorker } from '../../server/jobs';
import { createDb } from '../../db/client';
import { Client, startTestServer, type TestServer } from '../helpers/app';

// At most three runs of one scheme waiting or running at once.
process.env.KEELSON_SCHEME_MAX_RUNS = '3';
process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let worker: RunWorker | null = null;
const own = { pool: null as ReturnType<typeof createDb>['pool'] | null };
beforeAll(async () => {
  s = await startTestServer();
});
afterAll(async () => {
  await worker?.stop();
  await own.pool?.end();
  await s?.close();
});

describe('runs of several schemes', () => {
  it("caps one scheme's waiting runs and lets another scheme's run go ahead of its backlog", { timeout: 180_000 }, async () => {
    const trustee = new Client(s.baseUrl);
    await trustee.signIn('trustee@fernleigh.example');
    const [set] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
    const [option] = await s.db.select().from(defaultOptions).where(eq(defaultOptions.schemeId, s.schemeId));
    const [member] = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId));
    const body = { assumptionSetId: set.id, optionIds: [option.id], memberIds: [member.id], paths: 300 };
    // No worker yet: scheme A queues three runs, and a fourth is refused.
    const a: string[] = [];
    for (let i = 0; i < 3; i++) {
      const r = await trustee.post(`/schemes/${s.schemeId}/runs`, { ...body, seed: i + 1 });
      expect(r.status, JSON.stringify(r.body)).toBe(201);
      a.push(r.body.id);
    }
    const fourth = await trustee.post(`/schemes/${s.schemeId}/runs`, { ...body, seed: 4 });
    expect(fourth.status).toBe(429);
    expect(fourth.body.message).toMatch(/already has 3 projection runs/);
    // Then scheme B queues one (its input copied from A's first; queued the way the API queues).
    const [a1] = await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, a[0]));
    own.pool = createDb(s.url, 2).pool;
    await producerFor(own.pool);
    const b1 = await s.db.transaction(async (tx) => {
      const [row] = await tx
        .insert(projectionRuns)
        .values({ schemeId: s.secondSchemeId, status: 'queued', assumptionsDraft: false, seed: 9, paths: 300, riskAversion: 2, input: a1.input })
        .returning();
      await enqueueRun(own.pool!, tx, row.id);
      return row.id;
    });
    worker = await startRunWorker({ databaseUrl: s.url, threads: 1, log: () => {} });
    const all = [...a, b1];
    for (let t = Date.now(); ; ) {
      const rows = await s.db.select().from(projectionRuns).where(inArray(projectionRuns.id, all));
      if (rows.every((r) => r.status === 'done')) {
        const order = rows.sort((x, y) => x.startedAt!.getTime() - y.startedAt!.getTime()).map((r) => r.id);
        // A's first run, then B's, then the rest of A's backlog.
        expect(order).toEqual([a[0], b1, a[1], a[2]]);
        break;
      }
      if (Date.now() - t > 150_000) throw new Error(`runs not done: ${rows.map((r) => r.status).join(', ')}`);
      await new Promise((r) => setTimeout(r, 200));
    }
  });

  it("lets a scheme run only its share at once: the next run of a scheme with a live run waits its turn", async () => {
    const [a1] = await s.db.select().from(projectionRuns).where(eq(projectionRuns.schemeId, s.schemeId)).limit(1);
    const [busy] = await s.db.insert(projectionRuns).values({ schemeId: s.secondSchemeId, status: 'running', heartbeatAt: new Date(), assumptionsDraft: false, seed: 1, paths: 300, riskAversion: 2, input: a1.input }).returning();
    const [next] = await s.db.insert(projectionRuns).values({ schemeId: s.secondSchemeId, status: 'queued', assumptionsDraft: false, seed: 2, paths: 300, riskAversion: 2, input: a1.input }).returning();
    expect(await processRun(s.db, next.id, { threads: 1 })).toBe('deferred');
    expect((await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, next.id)))[0].status).toBe('queued');
    // Once the other run's worker has gone quiet (or it finished), this one may start.
    await s.db.update(projectionRuns).set({ heartbeatAt: new Date(Date.now() - 3_600_000) }).where(eq(projectionRuns.id, busy.id));
    expect(await processRun(s.db, next.id, { threads: 1 })).toBe('done');
  });
});
