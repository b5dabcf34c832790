import { Router } from 'express';
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { funds } from '../../db/schema';
import { createFund, deleteFund, listFunds, updateFund } from '../services/funds';

export const FundBody = createInsertSchema(funds)
  .pick({ name: true, assetClass: true })
  .extend({
    name: z.string().trim().min(1, 'must not be empty').max(120, 'must be at most 120 characters'),
    assetClass: z.string().trim().max(240, 'must be at most 240 characters').default(''),
  })
  .strict();
const FundPatch = FundBody.partial().refine((b) => b.name !== undefined || b.assetClass !== undefined, { message: 'give a name or an asset-class description to change' });
const FundId = z.object({ fundId: z.uuid('is not a valid id') });

/** The scheme's funds: read by every role, kept by the actuary. */
export function fundsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId/funds';

  defineRoute(r, M, { method: 'get', path: '', access: 'funds:read' }, async (req, res) => {
    res.json({ currency: req.scheme!.currency, funds: await listFunds(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '', access: 'funds:edit' }, async (req, res) => {
    const body = FundBody.parse(req.body);
    res.status(201).json(await createFund(ctx.db, contextOf(req), body));
  });

  defineRoute(r, M, { method: 'patch', path: '/:fundId', access: 'funds:edit' }, async (req, res) => {
    const { fundId } = FundId.parse(req.params);
    res.json(await updateFund(ctx.db, contextOf(req), fundId, FundPatch.parse(req.body)));
  });

  defineRoute(r, M, { method: 'delete', path: '/:fundId', access: 'funds:edit' }, async (req, res) => {
    const { fundId } = FundId.parse(req.params);
    await deleteFund(ctx.db, contextOf(req), fundId);
    res.json({ ok: true });
  });

  return r;
}
