import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertOptions, schemeOptions } from '../helpers/options';
import type { ChildProcess } from 'node:child_process';
import { eq } from 'drizzle-orm';
import { assumptionSets, illustrativeMembers, projectionRuns } from '../../db/schema';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { alive, startProcess, until } from '../helpers/processes';

/**
 * The largest run the API allows (8 options × 10 members × 100,000 paths, ages 16 → 80) runs in
 * the worker process, as `npm start` runs it, while the API keeps answering. A generous bound
 * here (no answer slower than 2 s); the real latency figures are in `npm run bench`.
 */
let s: TestServer;
let worker: (ChildProcess & { output: () => string }) | null = null;
beforeAll(async () => {
  s = await startTestServer();
});
afterAll(async () => {
  if (worker && alive(worker)) worker.kill('SIGKILL');
  await s?.close();
});

describe('the API during the largest allowed run', () => {
  it('keeps answering /api/health and readers within 2 s', { timeout: 240_000 }, async () => {
    const [set] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
    const [template] = await schemeOptions(s.db, s.schemeId);
    const options = await insertOptions(s.db, s.schemeId, Array.from({ length: 8 }, (_, i) => ({ name: `Largest-run option ${i + 1}`, glidePath: template.glidePath })));
    const members = await s.db
      .insert(illustrativeMembers)
      .values(Array.from({ length: 10 }, (_, i) => ({ schemeId: s.schemeId, label: `Youngest saver ${i + 1}`, age: 16, retirementAge: 80, salary: 18_000 + 1000 * i, contributionRate: 0.08, pot: 0 })))
      .returning();
    const trustee = new Client(s.baseUrl);
    await trustee.signIn('trustee@fernleigh.example');
    const created = await trustee.post(`/schemes/${s.schemeId}/runs`, { assumptionSetId: set.id, optionIds: options.map((o) => o.id), memberIds: members.map((m) => m.id), paths: 100_000, seed: 1 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    worker = startProcess('server/jobs/worker.ts', { DATABASE_URL: s.url, SESSION_SECRET: s.config.SESSION_SECRET, KEELSON_QUEUE_POLL_SECONDS: '0.5' });
    await until(
      'the run to be under way',
      async () => {
        const [r] = await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, created.body.id));
        return r.status === 'running' && r.progress > 0;
      },
      120_000,
    );
    const times: number[] = [];
    const end = Date.now() + 15_000;
    while (Date.now() < end) {
      const t0 = performance.now();
      const [h, o] = await Promise.all([fetch(`${s.baseUrl}/api/health`), trustee.get(`/schemes/${s.schemeId}/overview`)]);
      times.push(performance.now() - t0);
      expect(h.status).toBe(200);
      expect(o.status).toBe(200);
      await new Promise((r) => setTimeout(r, 100));
    }
    const [r] = await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, created.body.id));
    expect(r.status, 'the run was still executing while measured').toBe('running');
    expect(times.length).toBeGreaterThan(20);
    expect(Math.max(...times), `slowest of ${times.length} answers, ms`).toBeLessThan(2000);
  });
});
