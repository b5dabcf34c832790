import { Router } from 'express';
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { assumptionSets, fundAssumptions } from '../../db/schema';
import { AnnuitySchema, FundSchema, ScenarioSchema, checkCorrelationMatrix } from '../../simulation';
import { csvUpload } from '../uploads';
import { suggestionForScheme } from '../services/history';
import { approve, compareVersions, copyToDraft, createDraft, deleteDraft, getSet, listSets, updateDraft } from '../services/assumptions';

const FundAssumptionBody = createInsertSchema(fundAssumptions)
  .pick({ fundId: true, expectedReturn: true, volatility: true, annualCharge: true })
  .extend({
    fundId: z.uuid('is not a valid fund id'),
    expectedReturn: FundSchema.shape.expectedReturn,
    volatility: FundSchema.shape.volatility,
    annualCharge: FundSchema.shape.annualCharge,
  });

/** The content of an assumption set; rates are fractions, `funds` order is the matrix order. */
export const AssumptionSetBody = createInsertSchema(assumptionSets)
  .pick({ setAt: true, rationale: true, inflation: true, salaryGrowth: true, annuityRealRate: true, annuityYears: true })
  .extend({
    setAt: z.iso.date('must be a date written YYYY-MM-DD'),
    rationale: z.string().trim().max(4000, 'must be at most 4,000 characters').default(''),
    inflation: ScenarioSchema.shape.inflation,
    salaryGrowth: z.number().gt(-0.5, 'must be above -0.5 (a fraction: 0.03 = 3%)').lt(0.5, 'must be below 0.5 (a fraction: 0.03 = 3%)'),
    annuityRealRate: AnnuitySchema.shape.realRate,
    annuityYears: AnnuitySchema.shape.years,
    funds: z.array(FundAssumptionBody).min(1, 'needs at least one fund').max(50, 'at most 50 funds'),
    correlations: z.array(z.array(z.number('must be a number'))),
  })
  .strict()
  .superRefine((b, ctx) => {
    const seen = new Map<string, number>();
    b.funds.forEach((f, i) => {
      const earlier = seen.get(f.fundId);
      if (earlier !== undefined) ctx.addIssue({ code: 'custom', path: ['funds', i, 'fundId'], message: `repeats the fund of funds.${earlier}` });
      else seen.set(f.fundId, i);
    });
    if (b.correlations.length !== b.funds.length) {
      ctx.addIssue({ code: 'custom', path: ['correlations'], message: `must have ${b.funds.length} rows, one per fund (got ${b.correlations.length})` });
      return;
    }
    // The engine's own check: square, finite, within [−1, 1], symmetric, unit diagonal, positive semidefinite.
    for (const p of checkCorrelationMatrix(b.correlations)) ctx.addIssue({ code: 'custom', path: ['correlations', ...p.path], message: p.message });
  });

const SetId = z.object({ setId: z.uuid('is not a valid id') });
const Pair = z.object({ setId: z.uuid('is not a valid id'), otherId: z.uuid('is not a valid id') });

/** Versioned capital-market assumptions: drafts kept by the actuary, approved by a trustee. */
export function assumptionsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId/assumption-sets';

  defineRoute(r, M, { method: 'get', path: '', access: 'assumptions:read' }, async (req, res) => {
    res.json({ sets: await listSets(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '', access: 'assumptions:edit' }, async (req, res) => {
    const body = AssumptionSetBody.parse(req.body);
    res.status(201).json(await createDraft(ctx.db, contextOf(req), body));
  });

  // Suggestions from a price history: computed and returned, never stored.
  defineRoute(r, M, { method: 'post', path: '/history', access: 'assumptions:edit' }, csvUpload('file'), async (req, res) => {
    res.json(await suggestionForScheme(ctx.db, req.scheme!.id, { buffer: req.file!.buffer, name: req.file!.originalname }));
  });

  defineRoute(r, M, { method: 'get', path: '/:setId', access: 'assumptions:read' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.json(await getSet(ctx.db, req.scheme!.id, setId));
  });

  defineRoute(r, M, { method: 'put', path: '/:setId', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    const body = AssumptionSetBody.parse(req.body);
    res.json(await updateDraft(ctx.db, contextOf(req), setId, body));
  });

  defineRoute(r, M, { method: 'delete', path: '/:setId', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    await deleteDraft(ctx.db, contextOf(req), setId);
    res.json({ ok: true });
  });

  defineRoute(r, M, { method: 'post', path: '/:setId/drafts', access: 'assumptions:edit' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.status(201).json(await copyToDraft(ctx.db, contextOf(req), setId));
  });

  defineRoute(r, M, { method: 'post', path: '/:setId/approve', access: 'assumptions:approve' }, async (req, res) => {
    const { setId } = SetId.parse(req.params);
    res.json(await approve(ctx.db, contextOf(req), setId));
  });

  defineRoute(r, M, { method: 'get', path: '/:setId/compare/:otherId', access: 'assumptions:read' }, async (req, res) => {
    const { setId, otherId } = Pair.parse(req.params);
    res.json(await compareVersions(ctx.db, req.scheme!.id, setId, otherId));
  });

  return r;
}
