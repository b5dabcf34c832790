import type { Request } from 'express';
import { contextOf } from './context';
import { and, desc, eq, or, sql } from 'drizzle-orm';
import type { AppContext } from '../context';
import { outboxAttachments, outboxMessages } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { audit } from './audit';
import { backgroundProducer, enqueue, MAIL_QUEUE } from '../jobs/background';

/**
 * Mail the scheme's administrator may see: the scheme's own messages, and account mail
 * (invitations, password resets) addressed to someone with a role or a pending invitation here.
 */
function visibleTo(schemeId: string) {
  return or(
    eq(outboxMessages.schemeId, schemeId),
    and(
      sql`${outboxMessages.schemeId} is null`,
      sql`exists (
        select 1 from jsonb_array_elements_text(${outboxMessages.recipients}) as r(addr)
        where exists (select 1 from users u join scheme_roles sr on sr.user_id = u.id where sr.scheme_id = ${schemeId} and lower(u.email) = lower(r.addr))
           or exists (select 1 from access_tokens t where t.scheme_id = ${schemeId} and lower(t.email) = lower(r.addr)))`,
    ),
  );
}

export async function listOutbox(ctx: AppContext, schemeId: string, limit: number) {
  const rows = await ctx.db
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
    .where(visibleTo(schemeId))
    .orderBy(desc(outboxMessages.createdAt))
    .limit(limit);
  const ids = rows.map((r) => r.id);
  const files = ids.length
    ? await ctx.db
        .select({ id: outboxAttachments.id, messageId: outboxAttachments.messageId, filename: outboxAttachments.filename, contentType: outboxAttachments.contentType, size: sql<number>`octet_length(${outboxAttachments.content})::int` })
        .from(outboxAttachments)
        .where(sql`${outboxAttachments.messageId} in ${ids}`)
    : [];
  return rows.map((r) => ({ ...r, attachments: files.filter((f) => f.messageId === r.id).map(({ messageId: _m, ...f }) => f) }));
}

async function visibleMessage(ctx: AppContext, schemeId: string, id: string) {
  const [m] = await ctx.db.select().from(outboxMessages).where(and(eq(outboxMessages.id, id), visibleTo(schemeId)));
  if (!m) throw notFound('No such message in this scheme’s outbox.');
  return m;
}

export async function outboxAttachment(ctx: AppContext, schemeId: string, messageId: string, attachmentId: string) {
  await visibleMessage(ctx, schemeId, messageId);
  const [a] = await ctx.db.select().from(outboxAttachments).where(and(eq(outboxAttachments.id, attachmentId), eq(outboxAttachments.messageId, messageId)));
  if (!a) throw notFound('No such attachment.');
  return a;
}

/** Sends a failed message again: back to queued with a new job, in one transaction with its audit event. */
export async function retryMessage(ctx: AppContext, req: Request, id: string) {
  const m = await visibleMessage(ctx, req.scheme!.id, id);
  if (m.status !== 'failed') throw conflict(`Only a failed message can be sent again; this one is ${m.status}.`);
  await backgroundProducer(ctx.pool);
  return ctx.db.transaction(async (tx) => {
    const [row] = await tx
      .update(outboxMessages)
      .set({ status: 'queued' })
      .where(and(eq(outboxMessages.id, id), eq(outboxMessages.status, 'failed')))
      .returning({ id: outboxMessages.id, status: outboxMessages.status, attempts: outboxMessages.attempts });
    if (!row) throw conflict('The message changed meanwhile; reload the outbox.');
    await enqueue(ctx.pool, tx, MAIL_QUEUE, { id });
    await audit(tx, contextOf(req), { action: 'mail.retry-requested', schemeId: req.scheme!.id, entity: 'outbox_message', entityId: id, before: { status: 'failed', lastError: m.lastError }, after: { status: 'queued' } });
    return row;
  });
}
