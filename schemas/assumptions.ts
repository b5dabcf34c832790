import { z } from 'zod';
import { AnnuitySchema, FundSchema, ScenarioSchema, checkCorrelationMatrix } from '../simulation';

/**
 * The content of an assumption set as the API takes it and the assumption-set form checks it:
 * rates are fractions, `funds` order is the correlation matrix's order. Pure zod (no database
 * code reaches the browser); the limits are the engine's own, and server/routes/assumptions.ts
 * checks at compile time that the fields match the assumption_sets and fund_assumptions columns.
 */
export const FundAssumptionBody = z.object({
  fundId: z.uuid('is not a valid fund id'),
  expectedReturn: FundSchema.shape.expectedReturn,
  volatility: FundSchema.shape.volatility,
  annualCharge: FundSchema.shape.annualCharge,
});

export const AssumptionSetBody = z
  .strictObject({
    setAt: z.iso.date('must be a date written YYYY-MM-DD'),
    rationale: z.string().trim().max(4000, 'must be at most 4,000 characters').default(''),
    inflation: ScenarioSchema.shape.inflation,
    salaryGrowth: z.number().gt(-0.5, 'must be above -0.5 (a fraction: 0.03 = 3%)').lt(0.5, 'must be below 0.5 (a fraction: 0.03 = 3%)'),
    annuityRealRate: AnnuitySchema.shape.realRate,
    annuityYears: AnnuitySchema.shape.years,
    funds: z.array(FundAssumptionBody).min(1, 'needs at least one fund').max(50, 'at most 50 funds'),
    correlations: z.array(z.array(z.number('must be a number'))),
  })
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
export type AssumptionSetInput = z.input<typeof AssumptionSetBody>;
