import type { Pool } from 'pg';
import type PgBoss from 'pg-boss';
import { sql } from 'drizzle-orm';
import { createDb, type Db } from '../../db/client';
import { log as rootLog } from '../log';
import { processRun, requeueAbandoned, type HandlerOptions } from './handler';
import { BOSS_SCHEMA, createBoss, ensureRunQueue, queueSettings, RUN_QUEUE, type RunJob } from './queue';
import { recoverStalledRuns } from './stall';

export { enqueueRun, RUN_QUEUE } from './queue';
export { processRun } from './handler';

export type RunWorker = { stop: () => Promise<void>; boss: PgBoss };

type WorkerOptions = HandlerOptions & {
  /** Use this database (a pool of its own is opened and closed with the worker)… */
  databaseUrl?: string;
  /** …or share an existing pool and Drizzle handle (closed by their owner). */
  db?: Db;
  pool?: Pool;
  log?: (msg: string) => void;
};

/**
 * Starts a projection worker: takes one run at a time from the queue, runs it on worker
 * threads and stores the result. Used by `npm run worker`, by the server's inline worker
 * and by tests. `stop()` stops taking jobs and waits briefly for the current run; a run cut
 * short goes back to the queue and is retried.
 */
export async function startRunWorker(opts: WorkerOptions = {}): Promise<RunWorker> {
  const own = opts.pool ? null : createDb(opts.databaseUrl, 4, (err) => rootLog.warn({ err: { message: err.message } }, 'database connection lost (worker pool)'));
  const db = opts.db ?? own!.db;
  const pool = opts.pool ?? own!.pool;
  const log = opts.log ?? ((m: string) => rootLog.info(m));
  const settings = queueSettings();
  const boss = createBoss(pool, 'worker', settings);
  await boss.start();
  await ensureRunQueue(boss, settings);

  const sync = () => requeueAbandoned(db, BOSS_SCHEMA, RUN_QUEUE).catch(() => 0);
  boss.on('maintenance', () => void sync());
  await sync();
  // Lost workers are found by their missing heartbeat, a few times a minute.
  let checking = false;
  const checkStalled = async () => {
    if (checking) return;
    checking = true;
    try {
      await recoverStalledRuns(db, boss, settings.stallSeconds);
    } catch {
      // The database may be away; the next check tries again.
    } finally {
      checking = false;
    }
  };
  const monitor = setInterval(() => void checkStalled(), Math.max(1000, (settings.stallSeconds * 1000) / 4));
  monitor.unref();

  await boss.work<RunJob>(
    RUN_QUEUE,
    { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: settings.pollingIntervalSeconds },
    async ([job]) => {
      const lastAttempt = job.retryCount >= job.retryLimit;
      if (job.retryCount > 0) log(`run ${job.data.runId}: attempt ${job.retryCount + 1} of ${job.retryLimit + 1}`);
      const outcome = await processRun(db, job.data.runId, { threads: opts.threads, progressIntervalMs: opts.progressIntervalMs, lastAttempt });
      if (outcome === 'deferred') {
        // The scheme has its share running: put the job back for a few seconds, keeping its
        // attempts (pg-boss then finds it no longer active and leaves it be).
        await db.execute(sql`update ${sql.identifier(BOSS_SCHEMA)}.job set state = 'created', started_on = null, start_after = now() + interval '3 seconds'
                             where name = ${RUN_QUEUE} and id = ${job.id} and state = 'active'`);
      }
      log(`run ${job.data.runId}: ${outcome}`);
    },
  );

  let stopped = false;
  return {
    boss,
    stop: async () => {
      if (stopped) return;
      stopped = true;
      clearInterval(monitor);
      await boss.stop({ graceful: true, timeout: 5000, close: false });
      if (own) await own.pool.end();
    },
  };
}
