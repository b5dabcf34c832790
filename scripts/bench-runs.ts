/**
 * End-to-end run benchmark: 4 options × 3 members × 10,000 paths through the API, the
 * PostgreSQL queue and a worker, timed from "run requested" (the POST) to "results stored"
 * (the run row reads done). Creates its own database and drops it at the end.
 *
 *   npx tsx scripts/bench-runs.ts
 */
import { monitorEventLoopDelay } from 'node:perf_hooks';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import { Client as PgClient } from 'pg';
import { eq } from 'drizzle-orm';
import { createDb, databaseUrl } from '../db/client';
import { runMigrations } from '../db/migrate';
import { DEMO_PASSWORD, seedDemo } from '../db/seed';
import { assumptionSets, defaultOptions, illustrativeMembers, projectionRuns } from '../db/schema';
import { createApp } from '../server/app';
import { loadConfig } from '../server/config';
import { startRunWorker } from '../server/jobs';

process.env.KEELSON_QUEUE_POLL_SECONDS ??= '0.5';
const PATHS = Number(process.env.BENCH_RUN_PATHS ?? 10_000);

function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

async function admin(sql: string) {
  const c = new PgClient({ connectionString: withDatabase(databaseUrl(), 'postgres') });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

async function main() {
  const name = `keelson_bench_${randomBytes(4).toString('hex')}`;
  await admin(`CREATE DATABASE "${name}"`);
  const url = withDatabase(databaseUrl(), name);
  let cleanup: (() => Promise<void>)[] = [];
  try {
    await runMigrations(url);
    const { db, pool } = createDb(url, 5);
    cleanup.push(() => pool.end());
    const { schemeId } = await seedDemo(db, { memberCount: 10 });
    const app = createApp({ db, pool, config: loadConfig({ ...process.env, NODE_ENV: 'test', DATABASE_URL: url, SESSION_SECRET: 'bench-secret-0123456789abcdef' }) });
    const server = http.createServer(app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    cleanup = [() => new Promise<void>((r) => server.close(() => r())), ...cleanup];
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api`;
    const worker = await startRunWorker({ databaseUrl: url, log: () => {} });
    cleanup = [() => worker.stop(), ...cleanup];

    const signIn = await fetch(`${base}/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' },
      body: JSON.stringify({ email: 'trustee@fernleigh.example', password: DEMO_PASSWORD }),
    });
    const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const [set] = await db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, schemeId));
    const options = await db.select().from(defaultOptions).where(eq(defaultOptions.schemeId, schemeId));
    const members = await db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, schemeId));
    const body = { assumptionSetId: set.id, optionIds: options.map((o) => o.id), memberIds: members.map((m) => m.id), paths: PATHS, seed: 2026, riskAversion: 2 };

    // The worker shares this process with the API, as with `npm start`: record how long the event loop stalls.
    const loop = monitorEventLoopDelay({ resolution: 10 });
    loop.enable();
    const t0 = performance.now();
    const res = await fetch(`${base}/schemes/${schemeId}/runs`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1', Cookie: cookie },
      body: JSON.stringify(body),
    });
    if (res.status !== 201) throw new Error(`run request failed: ${res.status} ${await res.text()}`);
    const { id } = (await res.json()) as { id: string };
    const tQueued = performance.now();
    let row;
    for (;;) {
      [row] = await db.select({ status: projectionRuns.status, error: projectionRuns.error, startedAt: projectionRuns.startedAt, finishedAt: projectionRuns.finishedAt }).from(projectionRuns).where(eq(projectionRuns.id, id));
      if (row.status === 'done' || row.status === 'failed') break;
      await new Promise((r) => setTimeout(r, 20));
    }
    const t1 = performance.now();
    loop.disable();
    if (row.status !== 'done') throw new Error(`run failed: ${row.error}`);
    const [{ size }] = (await pool.query(`select pg_column_size(result) as size from projection_runs where id = $1`, [id])).rows;
    console.log(`bench-runs: ${options.length} options × ${members.length} members × ${PATHS.toLocaleString('en-GB')} paths`);
    console.log(`  request answered (run queued):      ${(tQueued - t0).toFixed(0)} ms`);
    console.log(`  simulation (worker start → stored): ${(row.finishedAt!.getTime() - row.startedAt!.getTime()).toFixed(0)} ms`);
    console.log(`  run requested → results stored:     ${(t1 - t0).toFixed(0)} ms`);
    console.log(`  stored result: ${(Number(size) / 1024).toFixed(0)} KiB (compressed by PostgreSQL)`);
    console.log(`  longest event-loop stall in the API process meanwhile: ${(loop.max / 1e6).toFixed(0)} ms (p99 ${(loop.percentile(99) / 1e6).toFixed(0)} ms)`);
  } finally {
    for (const c of cleanup) await c().catch(() => undefined);
    await admin(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error('bench-runs failed:', err);
    process.exit(1);
  },
);
