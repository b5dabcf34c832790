import type { Pool } from 'pg';
import type PgBoss from 'pg-boss';
import { createDb, type Db } from '../../db/client';
import { processRun, requeueAbandoned, type HandlerOptions } from './handler';
import { BOSS_SCHEMA, createBoss, ensureRunQueue, queueSettings, RUN_QUEUE, type RunJob } from './queue';

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
  const own = opts.pool ? null : createDb(opts.databaseUrl, 4);
  const db = opts.db ?? own!.db;
  const pool = opts.pool ?? own!.pool;
  const log = opts.log ?? ((m: string) => console.log(`keelson: ${m}`));
  const settings = queueSettings();
  const boss = createBoss(pool, 'worker', settings);
  await boss.start();
  await ensureRunQueue(boss, settings);

  const sync = () => requeueAbandoned(db, BOSS_SCHEMA, RUN_QUEUE).catch(() => 0);
  boss.on('maintenance', () => void sync());
  await sync();

  await boss.work<RunJob>(
    RUN_QUEUE,
    { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: settings.pollingIntervalSeconds },
    async ([job]) => {
      const lastAttempt = job.retryCount >= job.retryLimit;
      if (job.retryCount > 0) log(`run ${job.data.runId}: attempt ${job.retryCount + 1} of ${job.retryLimit + 1}`);
      const outcome = await processRun(db, job.data.runId, { threads: opts.threads, progressIntervalMs: opts.progressIntervalMs, lastAttempt });
      log(`run ${job.data.runId}: ${outcome}`);
    },
  );

  let stopped = false;
  return {
    boss,
    stop: async () => {
      if (stopped) return;
      stopped = true;
      await boss.stop({ graceful: true, timeout: 5000, close: false });
      if (own) await own.pool.end();
    },
  };
}
