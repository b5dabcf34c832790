/**
 * Load benchmark: 50 signed-in readers for 30 s against the real server process, first idle,
 * then while the largest run the API allows (8 options × 10 members × 100,000 paths, ages
 * 16 → 80) executes in the worker process — both started from the compiled build, as
 * `npm start` runs them. Prints requests/s, p50/p95/p99, the slowest answer and errors per
 * phase, and whether the targets are met: during the run p99 < 500 ms, no errors, and at least
 * 70% of the idle throughput. Creates its own database and drops it at the end.
 *
 *   npx tsx scripts/bench-load.ts        (BENCH_LOAD_READERS, BENCH_LOAD_SECONDS to change)
 */
import { insertOptions, schemeOptions } from '../tests/helpers/options';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { Client as PgClient } from 'pg';
import { eq } from 'drizzle-orm';
import { createDb, databaseUrl } from '../db/client';
import { runMigrations } from '../db/migrate';
import { DEMO_PASSWORD, DEMO_USERS, seedDemo } from '../db/seed';
import { assumptionSets, illustrativeMembers, projectionRuns } from '../db/schema';

const READERS = Number(process.env.BENCH_LOAD_READERS ?? 50);
const SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 30);
const ROOT = path.resolve(__dirname, '..');

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
function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const p = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(p));
    });
  });
}
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const pct = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] : NaN);

type Phase = { name: string; requests: number; errors: number; seconds: number; latencies: number[] };

/** READERS clients, each reading one page after another until the time is up. */
async function readers(base: string, cookies: string[], schemeId: string, seconds: number, name: string): Promise<Phase> {
  const paths = ['/auth/me', `/schemes/${schemeId}/overview`, `/schemes/${schemeId}/runs?limit=20`, `/schemes/${schemeId}/options`, `/schemes/${schemeId}/funds`];
  const latencies: number[] = [];
  let errors = 0;
  const end = performance.now() + seconds * 1000;
  const t0 = performance.now();
  await Promise.all(
    cookies.map(async (cookie, k) => {
      for (let i = k; performance.now() < end; i++) {
        const started = performance.now();
        try {
          const res = await fetch(`${base}${paths[i % paths.length]}`, { headers: { Cookie: cookie, Accept: 'application/json' }, signal: AbortSignal.timeout(10_000) });
          await res.arrayBuffer();
          if (!res.ok) errors++;
        } catch {
          errors++;
        }
        latencies.push(performance.now() - started);
      }
    }),
  );
  return { name, requests: latencies.length, errors, seconds: (performance.now() - t0) / 1000, latencies: latencies.sort((a, b) => a - b) };
}

async function main() {
  console.log(`bench-load: ${READERS} signed-in readers × ${SECONDS} s, idle and during the largest allowed run`);
  console.log(`  machine: ${os.cpus().length} cores, load average ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} at start (shared with other work: figures vary)`);
  const built = spawnSync(process.execPath, ['--require', 'tsx/cjs', path.join(ROOT, 'scripts/build-server.ts')], { cwd: ROOT, encoding: 'utf8' });
  if (built.status !== 0) throw new Error(`server build failed: ${built.stderr}`);
  const name = `keelson_bench_${randomBytes(4).toString('hex')}`;
  await admin(`CREATE DATABASE "${name}"`);
  const url = withDatabase(databaseUrl(), name);
  const procs: ChildProcess[] = [];
  const { db, pool } = createDb(url, 3);
  try {
    await runMigrations(url);
    const { schemeId } = await seedDemo(db, { memberCount: 200 });
    const [set] = await db.select().from(assumptionSets).where(eq(assumptionSets.schemeId, schemeId));
    const [template] = await schemeOptions(db, schemeId);
    const options = await insertOptions(db, schemeId, Array.from({ length: 8 }, (_, i) => ({ name: `Bench option ${i + 1}`, glidePath: template.glidePath })));
    const members = await db
      .insert(illustrativeMembers)
      .values(Array.from({ length: 10 }, (_, i) => ({ schemeId, label: `Bench saver ${i + 1}`, age: 16, retirementAge: 80, salary: 20_000 + 1500 * i, contributionRate: 0.08, pot: 0 })))
      .returning();

    const port = await freePort();
    const base = `http://127.0.0.1:${port}/api`;
    const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'test', KEELSON_LOG_LEVEL: 'info', DATABASE_URL: url, PORT: String(port), SESSION_SECRET: 'bench-load-secret-0123456789abcdef', SIGN_IN_RATE_LIMIT: '10000' };
    const start = (file: string) => {
      const p = spawn(process.execPath, [path.join(ROOT, 'build', file)], { cwd: ROOT, env, stdio: ['ignore', 'ignore', 'inherit'] });
      procs.push(p);
      return p;
    };
    start('server.js');
    for (let i = 0; ; i++) {
      if ((await fetch(`${base}/health`).catch(() => null))?.status === 200) break;
      if (i > 150) throw new Error('the server did not start');
      await sleep(200);
    }
    // Readers: separate sessions of the roles that read runs.
    const readerEmails = DEMO_USERS.filter((u) => u.role !== 'administrator').map((u) => u.email);
    const cookies: string[] = [];
    for (let i = 0; i < READERS; i++) {
      const r = await fetch(`${base}/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1' }, body: JSON.stringify({ email: readerEmails[i % readerEmails.length], password: DEMO_PASSWORD }) });
      if (r.status !== 200) throw new Error(`sign-in ${i} failed: ${r.status}`);
      cookies.push(r.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '));
    }
    const trusteeCookie = cookies[readerEmails.indexOf('trustee@fernleigh.example')];

    const idle = await readers(base, cookies, schemeId, SECONDS, 'idle');

    const res = await fetch(`${base}/schemes/${schemeId}/runs`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-Keelson-Client': '1', Cookie: trusteeCookie },
      body: JSON.stringify({ assumptionSetId: set.id, optionIds: options.map((o) => o.id), memberIds: members.map((m) => m.id), paths: 100_000, seed: 2026 }),
    });
    if (res.status !== 201) throw new Error(`run request failed: ${res.status} ${await res.text()}`);
    const { id } = (await res.json()) as { id: string };
    start('worker.js');
    for (let i = 0; ; i++) {
      const [r] = await db.select({ status: projectionRuns.status, progress: projectionRuns.progress }).from(projectionRuns).where(eq(projectionRuns.id, id));
      if (r.status === 'running' && r.progress > 0) break;
      if (r.status === 'done' || r.status === 'failed' || i > 600) throw new Error(`the run is ${r.status}; cannot measure during it`);
      await sleep(200);
    }
    const during = await readers(base, cookies, schemeId, SECONDS, 'during the run');
    const [after] = await db.select({ status: projectionRuns.status, progress: projectionRuns.progress }).from(projectionRuns).where(eq(projectionRuns.id, id));

    console.log('  phase            requests   req/s    p50 ms   p95 ms   p99 ms   max ms   errors');
    for (const p of [idle, during]) {
      const row = [p.name.padEnd(16), String(p.requests).padStart(8), (p.requests / p.seconds).toFixed(0).padStart(7), ...[50, 95, 99].map((q) => pct(p.latencies, q).toFixed(0).padStart(8)), p.latencies[p.latencies.length - 1].toFixed(0).padStart(8), String(p.errors).padStart(8)];
      console.log(`  ${row.join(' ')}`);
    }
    console.log(`  the run was still ${after.status} (${Math.round(after.progress * 100)}%) when the second phase ended`);
    const ratio = during.requests / during.seconds / (idle.requests / idle.seconds);
    const p99 = pct(during.latencies, 99);
    const met = (ok: boolean) => (ok ? 'met' : 'NOT met');
    console.log(`  target p99 < 500 ms during the run: ${p99.toFixed(0)} ms — ${met(p99 < 500)}`);
    console.log(`  target no errors during the run: ${during.errors} — ${met(during.errors === 0)}`);
    console.log(`  target throughput ≥ 70% of idle: ${(ratio * 100).toFixed(0)}% — ${met(ratio >= 0.7)}`);
    console.log(`  load average at the end: ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} (other helpers' work shares these 2 cores)`);
  } finally {
    for (const p of procs) p.kill('SIGKILL');
    await pool.end();
    await sleep(300);
    await admin(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error('bench-load failed:', err);
    process.exit(1);
  },
);
