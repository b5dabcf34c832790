import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { assumptionSets, auditEvents, illustrativeMembers, projectionRuns } from '../../db/schema';
import { schemeOptions } from '../helpers/options';
import { Client, startTestServer, type TestServer } from '../helpers/app';

// A job whose worker vanished is expired after 8 s (longer than one attempt here takes) and
// offered again; the restarted worker checks for expired jobs every second.
process.env.KEELSON_RUN_EXPIRE_SECONDS = '8';
process.env.KEELSON_RUN_RETRY_DELAY_SECONDS = '0';

let s: TestServer;
const children: ChildProcess[] = [];

function startWorkerProcess(url: string): ChildProcess {
  const root = path.resolve(__dirname, '../..');
  // One process (no tsx launcher in between), so SIGKILL reaches the worker itself.
  const child = spawn(process.execPath, ['--require', 'tsx/cjs', path.join(root, 'server/jobs/worker.ts')], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: url, KEELSON_RUN_THREADS: '1', KEELSON_QUEUE_MAINTENANCE_SECONDS: '1', KEELSON_QUEUE_POLL_SECONDS: '0.5' },
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

describe('a worker killed mid-run', () => {
  it('is retried by the next worker and the run completes once, with one result set', { timeout: 120_000 }, async () => {
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
    expect((await read()).status).toBe('running');

    startWorkerProcess(s.url);
    const seen = new Set<string>();
    const deadline = Date.now() + 90_000;
    do {
      await new Promise((r) => setTimeout(r, 100));
      row = await read();
      seen.add(row.status);
    } while (row.status !== 'done' && row.status !== 'failed' && Date.now() < deadline);
    expect(row.status, row.error ?? '').toBe('done');
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
