import type { AppContext } from './context';
import { startMailAndExports } from './email/start';
import { startRunWorker } from './jobs';
import { log } from './log';

export type Workers = { stop: () => Promise<void> };

/**
 * Everything that works through the queue: projection runs (on worker threads), mail delivery
 * and statement exports. `npm run worker` runs these in a process of their own (what
 * `npm start` does), so no heavy work shares the API's event loop; KEELSON_INLINE_WORKER=true
 * runs them inside the server process instead.
 */
export async function startWorkers(ctx: AppContext): Promise<Workers> {
  const runs = await startRunWorker({ db: ctx.db, pool: ctx.pool });
  const background = await startMailAndExports(ctx);
  log.info('projection, mail and export workers waiting for jobs');
  return {
    stop: async () => {
      await runs.stop().catch((err) => log.warn({ err }, 'projection worker did not stop cleanly'));
      await background.stop().catch((err) => log.warn({ err }, 'mail and export workers did not stop cleanly'));
    },
  };
}
