import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { listOutbox, retryMessage } from '../services/mail';

const Uuid = z.string().uuid('is not a valid id');
const ListQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).default(100) });

/**
 * The scheme's outbox (the administrator): what was sent, its status, and a way to send a
 * failed message again. Attachments are listed by name only: their content (board report
 * PDFs) is read where it is kept, by the roles allowed to read it.
 */
export function outboxRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/outbox', access: 'people:manage' }, async (req, res) => {
    const q = ListQuery.parse(req.query);
    res.json({ messages: await listOutbox(ctx, contextOf(req), q.limit) });
  });

  defineRoute(r, M, { method: 'post', path: '/outbox/:messageId/retry', access: 'people:manage' }, async (req, res) => {
    res.status(202).json(await retryMessage(ctx, contextOf(req), Uuid.parse(req.params.messageId)));
  });

  return r;
}
