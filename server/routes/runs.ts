import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { getRun, listRuns, MAX_SEED, requestRun, rerun, runChoices, runComparison } from '../services/runs';

const Uuid = z.string().uuid('is not a valid id');
const uniqueIds = (what: string) => (ids: string[]) => new Set(ids).size === ids.length || `names the same ${what} twice`;

/** A run request. Rates are fractions; λ is the board's risk aversion (γ = 2λ, see simulation/utility.ts). */
export const RunBody = z.strictObject({
  assumptionSetId: Uuid,
  optionIds: z
    .array(Uuid)
    .min(1, 'choose at least one default option')
    .max(8, 'at most 8 options in one comparison')
    .superRefine((ids, ctx) => {
      const r = uniqueIds('option')(ids);
      if (r !== true) ctx.addIssue({ code: 'custom', message: r });
    }),
  memberIds: z
    .array(Uuid)
    .min(1, 'choose at least one illustrative member')
    .max(10, 'at most 10 members in one comparison')
    .superRefine((ids, ctx) => {
      const r = uniqueIds('member')(ids);
      if (r !== true) ctx.addIssue({ code: 'custom', message: r });
    }),
  paths: z.number('must be a number').int('must be a whole number').min(100, 'must be at least 100').max(100_000, 'must be at most 100,000').default(2000),
  seed: z.number('must be a number').int('must be a whole number').min(0, 'must not be negative').max(MAX_SEED, `must be at most ${MAX_SEED}`).optional(),
  riskAversion: z.number('must be a number').min(-5, 'must be at least -5').max(50, 'must be at most 50').default(2),
  targetReplacementRatio: z.number('must be a number').min(0.05, 'must be at least 0.05 (5% of final salary)').max(1.5, 'must be at most 1.5').default(0.5),
  stress: z
    .strictObject({
      fundId: Uuid,
      yearsBeforeRetirement: z.number('must be a number').int('must be a whole number of years').min(1, 'must be at least 1').max(60, 'must be at most 60'),
      fall: z.number('must be a number').gt(0, 'must be above 0').max(0.95, 'must be at most 0.95 (a 95% fall)'),
    })
    .optional(),
});

const ListQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50) });

/** λ for a comparison: the same range as a run's (γ = 2λ, see simulation/utility.ts). */
export const ComparisonQuery = z.object({
  lambda: z
    .string({ message: 'is required (a number from -5 to 50)' })
    .trim()
    .min(1, 'is required (a number from -5 to 50)')
    .transform(Number)
    .pipe(z.number('must be a number').min(-5, 'must be at least -5').max(50, 'must be at most 50')),
  variant: z.enum(['base', 'stressed'], { message: 'must be base or stressed' }).default('base'),
});

export function runsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/run-choices', access: 'runs:create' }, async (req, res) => {
    res.json(await runChoices(ctx, req.scheme!.id));
  });

  defineRoute(r, M, { method: 'get', path: '/runs', access: 'runs:read' }, async (req, res) => {
    const q = ListQuery.parse(req.query);
    res.json({ runs: await listRuns(ctx, req.scheme!.id, q.limit) });
  });

  defineRoute(r, M, { method: 'post', path: '/runs', access: 'runs:create' }, async (req, res) => {
    const body = RunBody.parse(req.body ?? {});
    res.status(201).json(await requestRun(ctx, req, body));
  });

  defineRoute(r, M, { method: 'get', path: '/runs/:runId', access: 'runs:read' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    res.json(await getRun(ctx, req.scheme!.id, runId));
  });

  defineRoute(r, M, { method: 'get', path: '/runs/:runId/comparison', access: 'runs:read' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    const query = ComparisonQuery.parse(req.query);
    res.json(await runComparison(ctx, req.scheme!.id, runId, query));
  });

  defineRoute(r, M, { method: 'post', path: '/runs/:runId/rerun', access: 'runs:create' }, async (req, res) => {
    const runId = Uuid.parse(req.params.runId);
    res.status(201).json(await rerun(ctx, req, runId));
  });

  return r;
}
