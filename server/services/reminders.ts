import { and, desc, eq, isNotNull } from 'drizzle-orm';
import type { Pool } from 'pg';
import type { Db } from '../../db/client';
import { reviewReminders, reviews, schemeSettings, schemes } from '../../db/schema';
import { queueMail } from '../email/outbox';
import { backgroundProducer } from '../jobs/background';
import { date, daysBetween, plural } from '../../figures';
import { trusteesOf } from './governance';

/**
 * Reminders of the next default-option review: every trustee gets one e-mail 90 days before
 * the due date, one 30 days before, and one on the day (late, once, if the review is overdue).
 * A job that missed a day sends the stage that applies now, not the ones it missed. Each
 * reminder is a row keyed by (scheme, trustee, due date, stage) written in the same
 * transaction as its outbox message, so running the job twice — even at the same time —
 * sends each reminder once.
 */
export const REMINDER_STAGES = [90, 30, 0] as const;
export type ReminderStage = (typeof REMINDER_STAGES)[number];

/** The reminder that applies on `today` for a review due on `due`, or null when none does yet. */
export function reminderStage(due: string, today: string): ReminderStage | null {
  const days = daysBetween(today, due);
  if (days > 90) return null;
  if (days > 30) return 90;
  if (days > 0) return 30;
  return 0;
}

export function reminderText(m: { schemeName: string; trusteeName: string; due: string; today: string; lastReview: { title: string; signedOffAt: Date | null } | null }) {
  const days = daysBetween(m.today, m.due);
  const when = days > 0 ? `in ${plural(days, 'day')}` : days === 0 ? 'today' : `${plural(-days, 'day')} ago`;
  const subject = days >= 0 ? `Default option review due ${days === 0 ? 'today' : `in ${plural(days, 'day')}`}: ${m.schemeName}` : `Default option review overdue: ${m.schemeName}`;
  const text = [
    `Dear ${m.trusteeName},`,
    '',
    `The trustees' review of the default investment option of ${m.schemeName} is ${days >= 0 ? 'due' : 'was due'} on ${date(m.due)} (${when}).`,
    m.lastReview ? `The last review, "${m.lastReview.title}", was signed off${m.lastReview.signedOffAt ? ` on ${date(m.lastReview.signedOffAt)}` : ''}; its decision record is under Reviews in Keelson.` : '',
    'To start the review, open Keelson, go to Reviews and open a new one. A review is complete when the scheme’s quorum of trustees has signed its decision.',
    '',
    'Every trustee of the scheme receives this reminder, 90 and 30 days before the date and on the day.',
  ]
    .filter((l, i, a) => l !== '' || a[i - 1] !== '')
    .join('\n');
  return { subject, text };
}

/** Queues the reminders due on `today` (an ISO date) for every scheme; returns how many were queued. */
export async function sendReviewReminders(db: Db, pool: Pool, today: string): Promise<number> {
  const due = await db
    .select({ schemeId: schemeSettings.schemeId, due: schemeSettings.nextReviewDue, schemeName: schemes.name })
    .from(schemeSettings)
    .innerJoin(schemes, eq(schemes.id, schemeSettings.schemeId))
    .where(isNotNull(schemeSettings.nextReviewDue));
  let queued = 0;
  for (const s of due) {
    const stage = reminderStage(s.due!, today);
    if (stage === null) continue;
    const [last] = await db
      .select({ title: reviews.title, signedOffAt: reviews.signedOffAt })
      .from(reviews)
      .where(and(eq(reviews.schemeId, s.schemeId), eq(reviews.status, 'signed_off')))
      .orderBy(desc(reviews.signedOffAt))
      .limit(1);
    await backgroundProducer(pool);
    for (const t of await trusteesOf(db, s.schemeId)) {
      await db.transaction(async (tx) => {
        const [claimed] = await tx
          .insert(reviewReminders)
          .values({ schemeId: s.schemeId, userId: t.id, dueOn: s.due!, daysBefore: stage })
          .onConflictDoNothing()
          .returning();
        if (!claimed) return;
        const { subject, text } = reminderText({ schemeName: s.schemeName, trusteeName: t.displayName, due: s.due!, today, lastReview: last ?? null });
        const msg = await queueMail(pool, tx, null, { to: t.email, subject, text, schemeId: s.schemeId, kind: 'review-reminder' });
        await tx
          .update(reviewReminders)
          .set({ messageId: msg.id })
          .where(and(eq(reviewReminders.schemeId, s.schemeId), eq(reviewReminders.userId, t.id), eq(reviewReminders.dueOn, s.due!), eq(reviewReminders.daysBefore, stage)));
        queued++;
      });
    }
  }
  return queued;
}
