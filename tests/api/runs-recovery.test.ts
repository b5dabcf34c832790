import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { assumptionSets, auditEvents, illustrativeMembers, projectionRuns } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { Client, startTestServer, type TestServer } from '../helpers/app';

// The job's own expiry stays at its half-hour default: what brings the run back is the lost
// worker's missing heartbeat (written every second here, stalled after 5 s without one).
process.env.KEELSON_RUN_HEARTBEAT_SECONDS = '1';
process.env.KEELSON_RUN_STALL_SECONDS = '5';
process.env.KEELSON_RUN_RETRY_DELAY_SECONDS = '0';

let s: TestServer;
const children: ChildProcess[] = [];

function startWorkerProcess(url: string): ChildProcess {
  const root = path.resolve(__dirname, '../..');
  // One process (no tsx launcher in between), so SIGKILL reaches the worker itself.
  const child = spawn(process.execPath, ['--require', 'tsx/cjs', path.join(root, 'server/jobs/worker.ts')], {
    cwd: root,
    env: { ...process.env, NODE_ENV: 'test', SESSION_SECRET: s.config.SESSION_SECRET, DATABASE_URL: url, KEELSON_RUN_THREADS: '1', KEELSON_QUEUE_POLL_SECONDS: '0.5' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  return child;
}

beforeAll(async () => {
  s = await startTestServer();
});
afterAll(async () => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
  await s?.close();
});

describe('a worker killed mid-run (kill -9)', () => {
  it('shows the run as stalled, retries it within a minute, and completes it once, with one result set', { timeout: 150_000 }, async () => {
    const trustee = new Client(s.baseUrl);
    await trustee.signIn('trustee@fernleigh.example');
    const [set] = await s.db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, s.schemeId));
    const options = await schemeOptions(s.db, s.schemeId);
    const members = await s.db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, s.schemeId));
    const created = await trustee.post(`/schemes/${s.schemeId}/runs`, {
      assumptionSetId: set.id,
      optionIds: options.map((o) => o.id),
      memberIds: members.map((m) => m.id),
      paths: 6000,
      seed: 77,
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const runId = created.body.id as string;
    const read = async () => (await s.db.select().from(projectionRuns).where(eq(projectionRuns.id, runId)))[0];

    const first = startWorkerProcess(s.url);
    const until = Date.now() + 60_000;
    let row = await read();
    while (!(row.status === 'running' && row.progress > 0)) {
      if (Date.now() > until || row.status === 'done') throw new Error(`run reached ${row.status} before it could be interrupted`);
      await new Promise((r) => setTimeout(r, 50));
      row = await read();
    }
    first.kill('SIGKILL');
    await new Promise((r) => first.once('exit', r));
    const killedAt = Date.now();
    expect((await read()).status).toBe('running');
    // A second worker is up (as with several workers, or a supervisor restarting the dead one).
    startWorkerProcess(s.url);
    // The screen's source says "stalled" once the heartbeat is old, before the run is handed back.
    const seenStalled = await (async () => {
      for (let t = Date.now(); Date.now() - t < 30_000; await new Promise((r) => setTimeout(r, 100))) {
        const r = await trustee.get(`/schemes/${s.schemeId}/runs/${runId}`);
        if (r.body.stalled) return true;
        if (r.body.status !== 'running') return false;
      }
      return false;
    })();
    expect(seenStalled, 'the run was shown as stalled').toBe(true);
    const seen = new Set<string>();
    const deadline = killedAt + 120_000;
    let retriedAfter = -1;
    do {
      await new Promise((r) => setTimeout(r, 100));
      row = await read();
      seen.add(row.status);
      if (retriedAfter < 0 && row.startedAt && row.startedAt.getTime() > killedAt) retriedAfter = row.startedAt.getTime() - killedAt;
    } while (row.status !== 'done' && row.status !== 'failed' && Date.now() < deadline);
    expect(row.status, row.error ?? '').toBe('done');
    expect(retriedAfter, 'ms from the kill to the retry starting').toBeGreaterThan(0);
    expect(retriedAfter).toBeLessThan(60_000);
    expect(seen.has('failed'), `statuses seen after the kill: ${[...seen].join(', ')}`).toBe(false);
    const completed = await s.db.select().from(auditEvents).where(eq(auditEvents.entityId, runId));
    expect(completed.filter((e) => e.action === 'run.completed')).toHaveLength(1);
    const job = await s.db.execute(sql`select state, retry_count from pgboss.job where id = ${runId}`);
    expect(job.rows).toEqual([{ state: 'completed', retry_count: 1 }]);
    const result = row.result as { base: { result: { results: unknown[]; seed: number } } };
    expect(result.base.result.results).toHaveLength(options.length * members.length);
    expect(result.base.result.seed).toBe(77);
  });
});
