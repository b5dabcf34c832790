import { randomUUID } from 'node:crypto';
import type PgBoss from 'pg-boss';
import type { Pool } from 'pg';
import type { DbOrTx } from '../../db/client';
import { ensureQueue, envNumber, producerFor, transactionExecutor } from './queue';

/**
 * Queues for mail delivery and statement exports, next to the projection queue in the same
 * pg-boss schema. Jobs carry only an id; the row holds the rest and its status. This module
 * only queues (services import it); the workers that take the jobs start in
 * backgroundWorkers.ts, which imports the services — so no import cycle.
 */
export const MAIL_QUEUE = 'mail-send';
export const EXPORT_QUEUE = 'statement-export';

/** Retries for a failed send: attempts after the first, and the first delay (doubling after). */
export function mailRetrySettings() {
  return { retryLimit: envNumber(process.env, 'KEELSON_MAIL_RETRY_LIMIT', 5, 0), retryDelay: envNumber(process.env, 'KEELSON_MAIL_RETRY_DELAY_SECONDS', 30, 0), retryBackoff: true };
}

export function queueOptions(name: string): PgBoss.Queue & { retryLimit: number; retryDelay: number; retryBackoff: boolean; expireInSeconds: number } {
  if (name === MAIL_QUEUE) return { name, policy: 'standard' as const, ...mailRetrySettings(), expireInSeconds: 120 };
  return { name, policy: 'standard' as const, retryLimit: 2, retryDelay: 5, retryBackoff: false, expireInSeconds: 30 * 60 };
}

const ready = new WeakMap<Pool, Promise<PgBoss>>();

/** The started producer with this module's queues created; call before opening the transaction that queues. */
export function backgroundProducer(pool: Pool): Promise<PgBoss> {
  let p = ready.get(pool);
  if (!p) {
    p = (async () => {
      const boss = await producerFor(pool);
      await ensureQueue(boss, queueOptions(MAIL_QUEUE));
      await ensureQueue(boss, queueOptions(EXPORT_QUEUE));
      return boss;
    })();
    p.catch(() => ready.delete(pool));
    ready.set(pool, p);
  }
  return p;
}

/** Queues a job inside the caller's transaction, so it exists exactly when the row does. */
export async function enqueue(pool: Pool, tx: DbOrTx, queue: string, data: { id: string }): Promise<void> {
  const boss = await backgroundProducer(pool);
  const o = queueOptions(queue);
  await boss.send(queue, data, { id: randomUUID(), retryLimit: o.retryLimit, retryDelay: o.retryDelay, retryBackoff: o.retryBackoff, expireInSeconds: o.expireInSeconds, db: transactionExecutor(tx) });
}
