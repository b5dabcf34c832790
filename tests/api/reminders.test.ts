import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import PgBoss from 'pg-boss';
import { outboxMessages, receivedMail, reviewReminders, schemeSettings } from '../../db/schema';
import { createDb } from '../../db/client';
import { linkSettings } from '../../server/auth/links';
import { startFakeSmtp, type FakeSmtp } from '../../server/email/fakeSmtp';
import { smtpTransport } from '../../server/email/transport';
import { startBackgroundWorkers, type BackgroundWorkers } from '../../server/jobs/backgroundWorkers';
import { BOSS_SCHEMA, poolExecutor } from '../../server/jobs/queue';
import { REMINDER_QUEUE, startReviewReminders, todayUtc } from '../../server/jobs/reminders';
import { reminderStage, sendReviewReminders } from '../../server/services/reminders';
import { startTestServer, type TestServer } from '../helpers/app';
import { eventually } from './reports-helpers';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

let s: TestServer;
let fake: FakeSmtp;
let workers: BackgroundWorkers;
let workerDb: ReturnType<typeof createDb>;
const TRUSTEES = ['trustee2@fernleigh.example', 'trustee@fernleigh.example'];

beforeAll(async () => {
  s = await startTestServer();
  workerDb = createDb(s.url, 6);
  fake = await startFakeSmtp({ db: workerDb.db });
  const transport = smtpTransport({ host: fake.host, port: fake.port, secure: false, from: 'Keelson <no-reply@keelson.test>' });
  workers = await startBackgroundWorkers({ db: workerDb.db, pool: workerDb.pool, transport, links: linkSettings(s.config), log: () => {} });
});
afterAll(async () => {
  await workers?.stop();
  await fake?.close();
  await workerDb?.pool.end();
  await s?.close();
});

const isoPlus = (iso: string, days: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

async function setDue(due: string) {
  await s.db.update(schemeSettings).set({ nextReviewDue: due }).where(eq(schemeSettings.schemeId, s.schemeId));
}

/** Reminder messages the stand-in mail server received, by recipient, for mail about `due`. */
async function received(dueText: string) {
  const rows = await s.db.select().from(receivedMail);
  return rows.filter((r) => r.raw.toString('utf8').includes(dueText)).flatMap((r) => r.envelopeTo).sort();
}

describe('reminders of the next review', () => {
  it('picks the stage that applies: 90 and 30 days before, and on (or after) the day', () => {
    // [due, today, stage]: common practice, no source — the reminder dates the scheme asked for.
    const cases: [string, string, number | null][] = [
      ['2027-06-30', '2027-03-31', null], // 91 days before
      ['2027-06-30', '2027-04-01', 90],
      ['2027-06-30', '2027-05-31', 30],
      ['2027-06-30', '2027-06-29', 30],
      ['2027-06-30', '2027-06-30', 0],
      ['2027-06-30', '2027-08-01', 0],
    ];
    for (const [due, today, stage] of cases) expect(reminderStage(due, today), `${due} on ${today}`).toBe(stage);
  });

  it('sends exactly one message per trustee per reminder date, however often the job runs', { timeout: 60_000 }, async () => {
    const due = '2027-09-30';
    await setDue(due);
    const d90 = isoPlus(due, -90);
    // The job twice at the same moment, and once more later the same day.
    const [a, b] = await Promise.all([sendReviewReminders(workerDb.db, workerDb.pool, d90), sendReviewReminders(workerDb.db, workerDb.pool, d90)]);
    expect(a + b).toBe(2);
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, d90)).toBe(0);
    // A day later the 90-day reminder has gone; nothing new until 30 days before.
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, isoPlus(due, -60))).toBe(0);
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, isoPlus(due, -30))).toBe(2);
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, isoPlus(due, -30))).toBe(0);
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, due)).toBe(2);
    expect(await sendReviewReminders(workerDb.db, workerDb.pool, isoPlus(due, 5))).toBe(0);

    const rows = await s.db.select().from(reviewReminders).where(and(eq(reviewReminders.schemeId, s.schemeId), eq(reviewReminders.dueOn, due)));
    expect(rows.map((r) => r.daysBefore).sort()).toEqual([0, 0, 30, 30, 90, 90]);
    const messages = await s.db.select().from(outboxMessages).where(eq(outboxMessages.kind, 'review-reminder'));
    expect(messages).toHaveLength(6);
    expect(messages.every((m) => m.recipients.length === 1)).toBe(true);
    expect(messages.map((m) => m.subject).sort()).toEqual(
      [...Array(2).fill('Default option review due in 30 days: Fernleigh Mills Staff Pension Plan'), ...Array(2).fill('Default option review due in 90 days: Fernleigh Mills Staff Pension Plan'), ...Array(2).fill('Default option review due today: Fernleigh Mills Staff Pension Plan')].sort(),
    );
    expect(messages.find((m) => m.subject.includes('90 days'))!.body).toContain('is due on 30 September 2027 (in 90 days)');

    // Delivered through the outbox to the stand-in mail server: three messages to each trustee, once each.
    const got = await eventually('six reminders to be delivered', async () => {
      const r = await received('30 September 2027');
      return r.length === 6 ? r : null;
    });
    expect(got).toEqual([...TRUSTEES, ...TRUSTEES, ...TRUSTEES].sort());
  });

  it('runs as a scheduled job on the pg-boss queue, and running it twice sends nothing more', { timeout: 60_000 }, async () => {
    const due = isoPlus(todayUtc(), 30);
    await setDue(due);
    const jobs = await startReviewReminders({ db: workerDb.db, pool: workerDb.pool, log: () => {} });
    try {
      const schedules = (await workerDb.pool.query(`select name, cron, timezone from ${BOSS_SCHEMA}.schedule`)).rows;
      expect(schedules).toEqual([{ name: REMINDER_QUEUE, cron: '0 7 * * *', timezone: 'UTC' }]);
      // The catch-up run at start, and a second run of the same day's job.
      const boss = new PgBoss({ db: poolExecutor(workerDb.pool), schema: BOSS_SCHEMA, supervise: false, schedule: false, migrate: false });
      await boss.start();
      await boss.send(REMINDER_QUEUE, {});
      await eventually('both reminder jobs to complete', async () => {
        const r = await workerDb.pool.query(`select count(*)::int as n from ${BOSS_SCHEMA}.job where name = $1 and state = 'completed'`, [REMINDER_QUEUE]);
        return r.rows[0].n >= 2;
      });
      await boss.stop({ close: false });
      const dueText = new Date(`${due}T00:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
      const got = await eventually('one reminder to each trustee', async () => {
        const r = await received(dueText);
        return r.length >= 2 ? r : null;
      });
      // Let any duplicate arrive before counting.
      await new Promise((r) => setTimeout(r, 1500));
      expect(await received(dueText)).toEqual(TRUSTEES);
      expect(got).toEqual(TRUSTEES);
    } finally {
      await jobs.stop();
    }
  });
});
