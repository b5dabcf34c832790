/**
 * Stand-alone projection worker: `npm run worker` (DATABASE_URL selects the database).
 * Several may run at once, on one machine or many; each takes one run at a time.
 */
import { databaseUrl } from '../../db/client';
import { startRunWorker } from './index';

async function main() {
  const worker = await startRunWorker({ databaseUrl: databaseUrl() });
  console.log('keelson: projection worker waiting for runs');
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`keelson: ${signal} received, stopping the worker...`);
    worker.stop().finally(() => process.exit(0));
    setTimeout(() => process.exit(0), 8000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

main().catch((err) => {
  console.error('keelson: projection worker failed to start:', err instanceof Error ? err.message : err);
  process.exit(1);
});
