import PgBoss from 'pg-boss';
import type { Pool } from 'pg';
import type { Db } from '../../db/client';
import { sendReviewReminders } from '../services/reminders';
import { log as rootLog } from '../log';
import { BOSS_SCHEMA, ensureQueue, poolExecutor, queueSettings } from './queue';

/**
 * The daily review-reminder job on the pg-boss queue: pg-boss's scheduler puts one job on the
 * queue at 07:00 UTC each day (one instance across processes does the scheduling), and a
 * worker runs it. Sending is idempotent (server/services/reminders.ts), so a job that runs
 * twice, or the catch-up run at start, sends nothing more.
 */
export const REMINDER_QUEUE = 'review-reminders';
export const REMINDER_CRON = '0 7 * * *';

/** Today's date in UTC, as the reminder job reads it. */
export const todayUtc = (now = new Date()) => now.toISOString().slice(0, 10);

export async function startReviewReminders(opts: { db: Db; pool: Pool; log?: (m: string) => void; catchUp?: boolean }): Promise<{ stop: () => Promise<void> }> {
  const log = opts.log ?? ((m: string) => rootLog.info(m));
  // A pg-boss instance of its own that keeps the schedule; the others run with schedule: false.
  const boss = new PgBoss({ db: poolExecutor(opts.pool), schema: BOSS_SCHEMA, supervise: false, schedule: true, migrate: true });
  boss.on('error', (err) => rootLog.error({ err }, 'review reminders error'));
  await boss.start();
  await ensureQueue(boss, { name: REMINDER_QUEUE, policy: 'standard', retryLimit: 3, retryDelay: 300, retryBackoff: true, expireInSeconds: 15 * 60 });
  await boss.schedule(REMINDER_QUEUE, REMINDER_CRON, {}, { tz: 'UTC' });
  await boss.work(REMINDER_QUEUE, { pollingIntervalSeconds: queueSettings().pollingIntervalSeconds }, async () => {
    const n = await sendReviewReminders(opts.db, opts.pool, todayUtc());
    if (n) log(`review reminders: ${n} queued`);
  });
  // A server that was down at 07:00 catches up when it starts.
  if (opts.catchUp !== false) await boss.send(REMINDER_QUEUE, {});
  return { stop: () => boss.stop({ graceful: true, timeout: 5000, close: false }) };
}
