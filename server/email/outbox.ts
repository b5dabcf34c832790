import type { Pool } from 'pg';
import { and, eq, gt, inArray, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { accessTokens, outboxAttachments, outboxMessages } from '../../db/schema';
import { audit } from '../services/audit';
import type { ServiceContext } from '../services/context';
import { backgroundProducer, enqueue, MAIL_QUEUE } from '../jobs/background';
import { LINK_PLACEHOLDER, linkUrl, type LinkSettings } from '../auth/links';
import { log, messageOf } from '../log';
import type { MailTransport } from './transport';

export type OutgoingMail = {
  to: string | string[];
  subject: string;
  /** Plain text; a one-use link is written as LINK_PLACEHOLDER and `linkTokenId` names it. */
  text: string;
  schemeId?: string | null;
  /** What the mail is for: invitation, password-reset, sign-in-confirmation, board-report, … */
  kind?: string;
  /** The access_tokens row whose link replaces LINK_PLACEHOLDER when the message is sent. */
  linkTokenId?: string | null;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
};

/** Subjects are one line: a CR or LF would start a new mail header. */
const oneLine = (s: string) => s.replace(/[\r\n\t]+/g, ' ').trim().slice(0, 300);

/**
 * Records a message in the outbox, with its attachments and an audit event, and queues its
 * delivery — all in the caller's transaction. Call `backgroundProducer(pool)` before opening
 * the transaction (the queue client needs a connection of its own to start).
 */
export async function queueMail(pool: Pool, tx: DbOrTx, sc: ServiceContext | null, m: OutgoingMail) {
  const recipients = (Array.isArray(m.to) ? m.to : [m.to]).map((a) => a.trim()).filter(Boolean);
  if (!recipients.length) throw new Error('a message needs at least one recipient');
  if (m.text.includes('token=')) throw new Error('a mail body must not carry a token: write LINK_PLACEHOLDER and pass linkTokenId');
  const [row] = await tx
    .insert(outboxMessages)
    .values({ schemeId: m.schemeId ?? null, kind: m.kind ?? 'account', recipients, subject: oneLine(m.subject), body: m.text, linkTokenId: m.linkTokenId ?? null, createdBy: sc?.actor?.id ?? null })
    .returning();
  if (m.attachments?.length) {
    await tx.insert(outboxAttachments).values(m.attachments.map((a) => ({ messageId: row.id, filename: a.filename, contentType: a.contentType, content: a.content })));
  }
  await enqueue(pool, tx, MAIL_QUEUE, { id: row.id });
  await audit(tx, sc, {
    action: 'mail.queued',
    schemeId: m.schemeId ?? null,
    entity: 'outbox_message',
    entityId: row.id,
    after: { kind: row.kind, recipients, subject: row.subject, attachments: (m.attachments ?? []).map((a) => a.filename) },
  });
  return row;
}

/**
 * Queues one message in a transaction of its own (account mail: invitations, resets,
 * confirmations). If queueing itself fails, the message is still recorded, as failed with
 * the reason, so it shows in the outbox rather than vanishing.
 */
export async function sendMail(deps: { db: Db; pool: Pool }, sc: ServiceContext | null, m: OutgoingMail): Promise<void> {
  try {
    await backgroundProducer(deps.pool);
    await deps.db.transaction((tx) => queueMail(deps.pool, tx, sc, m));
  } catch (err) {
    const reason = `could not be queued: ${messageOf(err)}`;
    log.error({ err, subject: m.subject }, 'mail could not be queued');
    await deps.db
      .transaction(async (tx) => {
        const [row] = await tx
          .insert(outboxMessages)
          .values({ schemeId: m.schemeId ?? null, kind: m.kind ?? 'account', recipients: Array.isArray(m.to) ? m.to : [m.to], subject: oneLine(m.subject), body: m.text, linkTokenId: m.linkTokenId ?? null, status: 'failed', lastError: reason })
          .returning();
        await audit(tx, sc, { action: 'mail.failed', schemeId: m.schemeId ?? null, entity: 'outbox_message', entityId: row.id, after: { reason } });
      })
      .catch((e: Error) => log.error({ err: e }, 'could not record the failed mail either'));
  }
}

export type MailOutcome = 'sent' | 'retrying' | 'failed' | 'skipped';

/** The Message-ID of an outbox row: the same for every attempt, so a receiving server can drop a repeat. */
export function messageIdOf(rowId: string, links: LinkSettings): string {
  let host = 'keelson.local';
  try {
    host = new URL(links.publicUrl).hostname || host;
  } catch {
    // keep the default
  }
  return `<${rowId}@${host}>`;
}

/** The body as sent: the placeholder replaced by the live link, or null when that link is no longer live. */
async function bodyToSend(db: Db, msg: typeof outboxMessages.$inferSelect, links: LinkSettings): Promise<string | null> {
  if (!msg.linkTokenId) return msg.body;
  const [t] = await db
    .select({ id: accessTokens.id })
    .from(accessTokens)
    .where(and(eq(accessTokens.id, msg.linkTokenId), isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt), gt(accessTokens.expiresAt, new Date())));
  return t ? msg.body.split(LINK_PLACEHOLDER).join(linkUrl(links, t.id)) : null;
}

/**
 * Delivers one outbox message. The attempt is recorded (committed) before the message goes to
 * the mail server, and every attempt carries the row's own Message-ID, so a message re-sent
 * after a crash between "server accepted" and "recorded as sent" is recognisable as a repeat
 * (and dropped by servers that de-duplicate, as the local stand-in does). A message already
 * sent is skipped. On failure the reason is recorded and the error re-thrown for the queue to
 * retry; after the last attempt the message is marked failed.
 */
export async function processMail(db: Db, transport: MailTransport, messageId: string, opts: { lastAttempt: boolean; links: LinkSettings }): Promise<MailOutcome> {
  const [msg] = await db
    .update(outboxMessages)
    .set({ attempts: sql`${outboxMessages.attempts} + 1`, lastAttemptAt: new Date() })
    .where(and(eq(outboxMessages.id, messageId), inArray(outboxMessages.status, ['queued', 'retrying'])))
    .returning();
  if (!msg) return 'skipped';
  const attempts = msg.attempts;
  const body = await bodyToSend(db, msg, opts.links);
  if (body === null) {
    const reason = 'not sent: its link was withdrawn, used or expired before the message went out';
    await db.transaction(async (tx) => {
      await tx.update(outboxMessages).set({ status: 'failed', lastError: reason }).where(eq(outboxMessages.id, messageId));
      await audit(tx, null, { action: 'mail.failed', schemeId: msg.schemeId, entity: 'outbox_message', entityId: messageId, after: { attempts, reason }, userId: null, actorEmail: null });
    });
    return 'failed';
  }
  const files = await db.select().from(outboxAttachments).where(eq(outboxAttachments.messageId, messageId));
  try {
    const { providerId } = await transport.send({
      to: msg.recipients,
      subject: msg.subject,
      text: body,
      messageId: messageIdOf(msg.id, opts.links),
      attempt: attempts,
      attachments: files.map((f) => ({ filename: f.filename, contentType: f.contentType, content: f.content })),
    });
    await db.transaction(async (tx) => {
      await tx.update(outboxMessages).set({ status: 'sent', sentAt: new Date(), lastError: null, providerId: providerId.slice(0, 300) }).where(eq(outboxMessages.id, messageId));
      await audit(tx, null, { action: 'mail.sent', schemeId: msg.schemeId, entity: 'outbox_message', entityId: messageId, after: { attempts, recipients: msg.recipients }, userId: null, actorEmail: null });
    });
    return 'sent';
  } catch (err) {
    const reason = messageOf(err).slice(0, 1000);
    const status = opts.lastAttempt ? 'failed' : 'retrying';
    await db.transaction(async (tx) => {
      await tx.update(outboxMessages).set({ status, lastError: reason }).where(eq(outboxMessages.id, messageId));
      await audit(tx, null, { action: opts.lastAttempt ? 'mail.failed' : 'mail.retrying', schemeId: msg.schemeId, entity: 'outbox_message', entityId: messageId, after: { attempts, reason }, userId: null, actorEmail: null });
    });
    if (opts.lastAttempt) return 'failed';
    throw err;
  }
}
