/**
 * The worker process: `npm run worker` (`npm start` starts it beside the server). It takes
 * projection runs (on worker threads), mail and statement exports from the queue in
 * PostgreSQL; several may run at once, on one machine or many. It runs at a lower CPU
 * priority (KEELSON_WORKER_NICE, default 10) so that a big run leaves the API responsive.
 */
import { setPriority } from 'node:os';
import { createDb } from '../../db/client';
import { log } from '../log';
import { configOrExit, keepRunningOnRejections, onStopSignal, startWhenReachable } from '../processes';
import { startWorkers, type Workers } from '../workers';

function main() {
  keepRunningOnRejections();
  const config = configOrExit('the worker');
  const nice = Number(process.env.KEELSON_WORKER_NICE ?? 10);
  try {
    // Threads started from here on inherit it (Linux keeps the nice value per thread).
    if (Number.isInteger(nice) && nice > 0) setPriority(Math.min(19, nice));
  } catch (err) {
    log.warn({ err }, 'could not lower the worker priority');
  }
  const { db, pool } = createDb(config.DATABASE_URL, 6, (err) => log.warn({ reason: err.message }, 'database connection lost; the queue resumes when it is back'));
  let stopping = false;
  let workers: Workers | null = null;
  void startWhenReachable('the worker', () => startWorkers({ db, pool, config }), () => stopping).then((w) => {
    workers = w;
  });
  onStopSignal('worker', async () => {
    stopping = true;
    if (workers) await workers.stop();
    await pool.end().catch(() => undefined);
    log.info('worker stopped');
  });
}

main();
