import type { Pool } from 'pg';
import type { Db } from '../../db/client';
import { linkSettings } from '../auth/links';
import type { Config } from '../config';
import { startBackgroundWorkers } from '../jobs/backgroundWorkers';
import { startReviewReminders } from '../jobs/reminders';
import { log as rootLog } from '../log';
import { startFakeSmtp, type FakeSmtp } from './fakeSmtp';
import { smtpTransport } from './transport';

/**
 * Starts mail delivery and statement-export workers. Without SMTP_HOST, mail goes to a local
 * stand-in server on loopback that keeps it in the database.
 */
export async function startMailAndExports(opts: { db: Db; pool: Pool; config: Config; log?: (m: string) => void }) {
  const c = opts.config;
  const log = opts.log ?? ((m: string) => rootLog.info(m));
  let fake: FakeSmtp | null = null;
  let settings;
  if (c.SMTP_HOST) {
    settings = { host: c.SMTP_HOST, port: c.SMTP_PORT, secure: c.SMTP_SECURE, user: c.SMTP_USER, pass: c.SMTP_PASS, from: c.SMTP_FROM };
  } else {
    fake = await startFakeSmtp({ db: opts.db, port: c.LOCAL_SMTP_PORT, log });
    log(`no SMTP_HOST set: mail goes to the local stand-in mail server on ${fake.host}:${fake.port} and is kept in the database (Outbox shows it)`);
    settings = { host: fake.host, port: fake.port, secure: false, from: c.SMTP_FROM };
  }
  const workers = await startBackgroundWorkers({ db: opts.db, pool: opts.pool, transport: smtpTransport(settings), links: linkSettings(c), log });
  const reminders = await startReviewReminders({ db: opts.db, pool: opts.pool, log });
  return {
    fake,
    stop: async () => {
      await reminders.stop();
      await workers.stop();
      await fake?.close();
    },
  };
}
