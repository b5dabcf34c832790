import type { Pool } from 'pg';
import type { Db } from '../../db/client';
import type { LinkSettings } from '../auth/links';
import { processMail } from '../email/outbox';
import type { MailTransport } from '../email/transport';
import { log as rootLog } from '../log';
import { processStatementExport } from '../services/statements';
import { EXPORT_QUEUE, MAIL_QUEUE, queueOptions } from './background';
import { createBoss, ensureQueue, queueSettings } from './queue';

export type BackgroundWorkers = { stop: () => Promise<void> };

/** Starts the mail and statement-export workers on the given database. */
export async function startBackgroundWorkers(opts: { db: Db; pool: Pool; transport: MailTransport; links: LinkSettings; log?: (m: string) => void }): Promise<BackgroundWorkers> {
  const log = opts.log ?? ((m: string) => rootLog.info(m));
  const boss = createBoss(opts.pool, 'worker');
  await boss.start();
  await ensureQueue(boss, queueOptions(MAIL_QUEUE));
  await ensureQueue(boss, queueOptions(EXPORT_QUEUE));
  const pollingIntervalSeconds = queueSettings().pollingIntervalSeconds;
  await boss.work<{ id: string }>(MAIL_QUEUE, { includeMetadata: true, batchSize: 1, pollingIntervalSeconds }, async ([job]) => {
    const lastAttempt = job.retryCount >= job.retryLimit;
    const outcome = await processMail(opts.db, opts.transport, job.data.id, { lastAttempt, links: opts.links });
    if (outcome !== 'sent') log(`mail ${job.data.id}: ${outcome}`);
  });
  await boss.work<{ id: string }>(EXPORT_QUEUE, { includeMetadata: true, batchSize: 1, pollingIntervalSeconds }, async ([job]) => {
    const lastAttempt = job.retryCount >= job.retryLimit;
    const outcome = await processStatementExport(opts.db, job.data.id, { lastAttempt });
    log(`statement export ${job.data.id}: ${outcome}`);
  });
  let stopped = false;
  return {
    stop: async () => {
      if (stopped) return;
      stopped = true;
      await boss.stop({ graceful: true, timeout: 5000, close: false });
      opts.transport.close();
    },
  };
}
