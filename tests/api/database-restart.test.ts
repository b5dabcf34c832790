import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { ChildProcess } from 'node:child_process';
import { createDb } from '../../db/client';
import { runMigrations } from '../../db/migrate';
import { seedDemo } from '../../db/seed';
import { assumptionSets, defaultOptions, illustrativeMembers } from '../../db/schema';
import { Client } from '../helpers/app';
import { alive, freePort, startProcess, throwawayCluster, until } from '../helpers/processes';

/**
 * The database really stops and starts (a private cluster of this test's own) under a real
 * server process and a real worker process: both answer and carry on, neither restarts.
 */
let cluster: Awaited<ReturnType<typeof throwawayCluster>>;
let server: ChildProcess & { output: () => string };
let worker: ChildProcess & { output: () => string };
let base: string;
let schemeId: string;
let runBody: Record<string, unknown>;

beforeAll(async () => {
  cluster = await throwawayCluster();
  await runMigrations(cluster.url);
  const { db, pool } = createDb(cluster.url, 2);
  try {
    ({ schemeId } = await seedDemo(db, { memberCount: 5 }));
    const [set] = await db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, schemeId));
    const [option] = await db.select().from(defaultOptions).where(eq(defaultOptions.schemeId, schemeId));
    const [member] = await db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, schemeId));
    runBody = { assumptionSetId: set.id, optionIds: [option.id], memberIds: [member.id], paths: 200, seed: 5 };
  } finally {
    await pool.end();
  }
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  const env = { DATABASE_URL: cluster.url, PORT: String(port), SESSION_SECRET: 'restart-test-secret-0123456789', KEELSON_QUEUE_POLL_SECONDS: '0.5', KEELSON_RUN_THREADS: '1', KEELSON_WORKER_NICE: '0' };
  server = startProcess('server/index.ts', env);
  worker = startProcess('server/jobs/worker.ts', env);
  await until('the server to answer', async () => (await fetch(`${base}/api/health`)).status === 200, 60_000);
}, 120_000);

afterAll(async () => {
  for (const p of [server, worker]) if (p && alive(p)) p.kill('SIGKILL');
  await cluster?.destroy();
});

describe('PostgreSQL stopped and started again', () => {
  it('answers 503 while the database is down, and carries on — requests and queued jobs — when it is back, without a restart', { timeout: 180_000 }, async () => {
    const trustee = new Client(base);
    await trustee.signIn('trustee@fernleigh.example');
    const pids = [server.pid, worker.pid];

    await cluster.stop();
    const health = await fetch(`${base}/api/health`);
    expect(health.status).toBe(503);
    expect(await health.json()).toMatchObject({ status: 'degraded', database: 'unreachable' });
    const me = await trustee.get('/auth/me');
    expect(me.status).toBe(503);
    expect(me.headers.get('retry-after')).toBeTruthy();
    // Give the worker's queue polling time to meet the outage too.
    await new Promise((r) => setTimeout(r, 3000));
    expect(alive(server), server.output()).toBe(true);
    expect(alive(worker), worker.output()).toBe(true);

    await cluster.start();
    await until('health to recover', async () => (await fetch(`${base}/api/health`)).status === 200, 60_000);
    expect((await trustee.get('/auth/me')).status).toBe(200);
    // The worker takes jobs again: a run requested now completes.
    const created = await trustee.post(`/schemes/${schemeId}/runs`, runBody);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const done = await until(
      'the run to complete',
      async () => {
        const r = await trustee.get(`/schemes/${schemeId}/runs/${created.body.id}`);
        return r.body.status === 'done' ? r.body : null;
      },
      90_000,
      300,
    );
    expect(done.status).toBe('done');
    expect([server.pid, worker.pid]).toEqual(pids);
    expect(alive(server) && alive(worker)).toBe(true);
  });
});
