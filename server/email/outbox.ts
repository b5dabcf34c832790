import type { Request } from 'express';
import { contextOf, type ServiceContext } from '../services/context';
import type { Pool } from 'pg';
import { and, eq, inArray } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { outboxAttachments, outboxMessages } from '../../db/schema';
import { audit } from '../services/audit';
import { backgroundProducer, enqueue, MAIL_QUEUE } from '../jobs/background';
import type { MailTransport } from './transport';

export type OutgoingMail = {
  to: string | string[];
  subject: string;
  text: string;
  schemeId?: string | null;
  /** What the mail is for: invitation, password-reset, board-report, … */
  kind?: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
};

/**
 * Records a message in the outbox, with its attachments and an audit event, and queues its
 * delivery — all in the caller's transaction. Call `backgroundProducer(pool)` before opening
 * the transaction (the queue client needs a connection of its own to start).
 */
export async function queueMail(pool: Pool, tx: DbOrTx, ctx: ServiceContext | null, m: OutgoingMail) {
  const recipients = (Array.isArray(m.to) ? m.to : [m.to]).map((a) => a.trim()).filter(Boolean);
  if (!recipients.length) throw new Error('a message needs at least one recipient');
  const [row] = await tx
    .insert(outboxMessages)
    .values({ schemeId: m.schemeId ?? null, kind: m.kind ?? 'account', recipients, subject: m.subject, body: m.text, createdBy: ctx?.actor?.id ?? null })
    .returning();
  if (m.attachments?.length) {
    await tx.insert(outboxAttachments).values(m.attachments.map((a) => ({ messageId: row.id, filename: a.filename, contentType: a.contentType, content: a.content })));
  }
  await enqueue(pool, tx, MAIL_QUEUE, { id: row.id });
  await audit(tx, ctx, {
    action: 'mail.queued',
    schemeId: m.schemeId ?? null,
    entity: 'outbox_message',
    entityId: row.id,
    after: { kind: row.kind, recipients, subject: m.subject, attachments: (m.attachments ?? []).map((a) => a.filename) },
  });
  return row;
}

/**
 * The function behind `app.locals.sendMail` (invitations, password resets): queues the message
 * in a transaction of its own. If queueing itself fails, the message is still recorded, as
 * failed with the reason, so it shows in the outbox rather than vanishing.
 */
export function mailSender(db: Db, pool: Pool) {
  return async (m: OutgoingMail, req: Request | null = null): Promise<void> => {
    try {
      await backgroundProducer(pool);
      await db.transaction((tx) => queueMail(pool, tx, req ? contextOf(req) : null, m));
    } catch (err) {
      const reason = `could not be queued: ${err instanceof Error ? err.message : String(err)}`;
      console.error(`keelson: mail "${m.subject}" ${reason}`);
      await db
        .transaction(async (tx) => {
          const [row] = await tx
            .insert(outboxMessages)
            .values({ schemeId: m.schemeId ?? null, kind: m.kind ?? 'account', recipients: Array.isArray(m.to) ? m.to : [m.to], subject: m.subject, body: m.text, status: 'failed', lastError: reason })
            .returning();
          await audit(tx, req ? contextOf(req) : null, { action: 'mail.failed', schemeId: m.schemeId ?? null, entity: 'outbox_message', entityId: row.id, after: { reason } });
        })
        .catch((e: Error) => console.error(`keelson: could not record the failed mail either: ${e.message}`));
    }
  };
}

export type MailOutcome = 'sent' | 'retrying' | 'failed' | 'skipped';

/**
 * Delivers one outbox message. A message already sent is skipped (a job delivered twice sends
 * once). On failure the attempt and reason are recorded; the error is re-thrown for the queue
 * to retry, and after the last attempt the message is marked failed with the reason.
 */
export async function processMail(db: Db, transport: MailTransport, messageId: string, opts: { lastAttempt: boolean }): Promise<MailOutcome> {
  const [msg] = await db
    .update(outboxMessages)
    .set({ lastAttemptAt: new Date() })
    .where(and(eq(outboxMessages.id, messageId), inArray(outboxMessages.status, ['queued', 'retrying'])))
    .returning();
  if (!msg) return 'skipped';
  const files = await db.select().from(outboxAttachments).where(eq(outboxAttachments.messageId, messageId));
  const attempts = msg.attempts + 1;
  try {
    const { providerId } = await transport.send({
      to: msg.recipients,
      subject: msg.subject,
      text: msg.body,
      attachments: files.map((f) => ({ filename: f.filename, contentType: f.contentType, content: f.content })),
    });
    await db.transaction(async (tx) => {
      await tx.update(outboxMessages).set({ status: 'sent', attempts, sentAt: new Date(), lastError: null, providerId: providerId.slice(0, 300) }).where(eq(outboxMessages.id, messageId));
      await audit(tx, null, { action: 'mail.sent', schemeId: msg.schemeId, entity: 'outbox_message', entityId: messageId, after: { attempts, recipients: msg.recipients }, userId: null, actorEmail: null });
    });
    return 'sent';
  } catch (err) {
    const reason = (err instanceof Error ? err.message : String(err)).slice(0, 1000);
    const status = opts.lastAttempt ? 'failed' : 'retrying';
    await db.transaction(async (tx) => {
      await tx.update(outboxMessages).set({ status, attempts, lastError: reason }).where(eq(outboxMessages.id, messageId));
      await audit(tx, null, { action: opts.lastAttempt ? 'mail.failed' : 'mail.retrying', schemeId: msg.schemeId, entity: 'outbox_message', entityId: messageId, after: { attempts, reason }, userId: null, actorEmail: null });
    });
    if (opts.lastAttempt) return 'failed';
    throw err;
  }
}
