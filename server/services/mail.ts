import { and, desc, eq, or, sql } from 'drizzle-orm';
import type { AppContext } from '../context';
import { outboxAttachments, outboxMessages } from '../../db/schema';
import { LINK_PLACEHOLDER, LINK_REDACTED } from '../auth/links';
import { conflict, notFound } from '../errors';
import { audit } from './audit';
import type { ServiceContext } from './context';
import { backgroundProducer, enqueue, MAIL_QUEUE } from '../jobs/background';

/**
 * Mail the scheme's administrator may see: the scheme's own messages (reports, invitations
 * to it), and account mail (password resets, sign-in confirmations — no scheme) addressed to
 * someone who has a role on this scheme now. Links in stored mail are placeholders: the
 * outbox never shows a live token.
 */
function visibleTo(schemeId: string) {
  return or(
    eq(outboxMessages.schemeId, schemeId),
    and(
      sql`${outboxMessages.schemeId} is null`,
      sql`exists (
        select 1 from jsonb_array_elements_text(${outboxMessages.recipients}) as r(addr)
        join users u on lower(u.email) = lower(r.addr)
        join scheme_roles sr on sr.user_id = u.id and sr.scheme_id = ${schemeId})`,
    ),
  );
}

/** A stored body as the outbox shows it. */
export const redactBody = (body: string) => body.split(LINK_PLACEHOLDER).join(LINK_REDACTED);

export async function listOutbox(app: AppContext, sc: ServiceContext, limit: number) {
  const rows = await app.db
    .select({
      id: outboxMessages.id,
      kind: outboxMessages.kind,
      recipients: outboxMessages.recipients,
      subject: outboxMessages.subject,
      body: outboxMessages.body,
      status: outboxMessages.status,
      attempts: outboxMessages.attempts,
      lastError: outboxMessages.lastError,
      createdAt: outboxMessages.createdAt,
      lastAttemptAt: outboxMessages.lastAttemptAt,
      sentAt: outboxMessages.sentAt,
    })
    .from(outboxMessages)
    .where(visibleTo(sc.schemeId!))
    .orderBy(desc(outboxMessages.createdAt))
    .limit(limit);
  const ids = rows.map((r) => r.id);
  const files = ids.length
    ? await app.db
        .select({ id: outboxAttachments.id, messageId: outboxAttachments.messageId, filename: outboxAttachments.filename, contentType: outboxAttachments.contentType, size: sql<number>`octet_length(${outboxAttachments.content})::int` })
        .from(outboxAttachments)
        .where(sql`${outboxAttachments.messageId} in ${ids}`)
    : [];
  return rows.map((r) => ({
    ...r,
    body: redactBody(r.body),
    attachments: files.filter((f) => f.messageId === r.id).map(({ messageId: _m, ...f }) => f),
  }));
}

async function visibleMessage(app: AppContext, schemeId: string, id: string) {
  const [m] = await app.db.select().from(outboxMessages).where(and(eq(outboxMessages.id, id), visibleTo(schemeId)));
  if (!m) throw notFound('No such message in this scheme’s outbox.');
  return m;
}

/** Sends a failed message again: back to queued with a new job, in one transaction with its audit event. */
export async function retryMessage(app: AppContext, sc: ServiceContext, id: string) {
  const m = await visibleMessage(app, sc.schemeId!, id);
  if (m.status !== 'failed') throw conflict(`Only a failed message can be sent again; this one is ${m.status}.`);
  await backgroundProducer(app.pool);
  return app.db.transaction(async (tx) => {
    const [row] = await tx
      .update(outboxMessages)
      .set({ status: 'queued' })
      .where(and(eq(outboxMessages.id, id), eq(outboxMessages.status, 'failed')))
      .returning({ id: outboxMessages.id, status: outboxMessages.status, attempts: outboxMessages.attempts });
    if (!row) throw conflict('The message changed meanwhile; reload the outbox.');
    await enqueue(app.pool, tx, MAIL_QUEUE, { id });
    await audit(tx, sc, { action: 'mail.retry-requested', entity: 'outbox_message', entityId: id, before: { status: 'failed', lastError: m.lastError }, after: { status: 'queued' } });
    return row;
  });
}
