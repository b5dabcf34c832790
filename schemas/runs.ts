import { z } from 'zod';
import { BOARD_LAMBDA } from '../constants/riskAversion';

/**
 * Request bodies for projection runs and board reports. Pure zod: the server's routes parse
 * with these, and the start-a-run form validates with the very same schema, so a message on
 * screen reads as the API's would.
 */

/** Seeds are stored as PostgreSQL integers: 0 … 2³¹ − 1. */
export const MAX_SEED = 2 ** 31 - 1;

/** Paths a trustee may ask for in one run (the engine accepts more from a scenario file). */
export const RUN_PATHS = { min: 100, max: 100_000, default: 2000, offered: [1000, 2000, 5000, 10000] } as const;

const Uuid = z.uuid('is not a valid id');

/** The board's risk aversion λ, limited to the board's range (constants/riskAversion.ts). */
export const RiskAversion = z
  .number('must be a number')
  .min(BOARD_LAMBDA.min, `must be at least ${BOARD_LAMBDA.min}`)
  .max(BOARD_LAMBDA.max, `must be at most ${BOARD_LAMBDA.max}`);

const uniqueIds = (what: string) =>
  z.array(Uuid).superRefine((ids, ctx) => {
    if (new Set(ids).size !== ids.length) ctx.addIssue({ code: 'custom', message: `names the same ${what} twice` });
  });

/** A run request. Rates are fractions; λ is the board's risk aversion (γ = 2λ, see simulation/utility.ts). */
export const RunBody = z.strictObject({
  assumptionSetId: Uuid,
  optionIds: uniqueIds('option').min(1, 'choose at least one default option').max(8, 'at most 8 options in one comparison'),
  /** Option id → the version to run instead of its newest approved one (a draft, or an earlier version). */
  optionVersions: z.record(Uuid, Uuid).optional(),
  memberIds: uniqueIds('member').min(1, 'choose at least one illustrative member').max(10, 'at most 10 members in one comparison'),
  paths: z
    .number('must be a number')
    .int('must be a whole number')
    .min(RUN_PATHS.min, `must be at least ${RUN_PATHS.min}`)
    .max(RUN_PATHS.max, 'must be at most 100,000')
    .default(RUN_PATHS.default),
  seed: z.number('must be a number').int('must be a whole number').min(0, 'must not be negative').max(MAX_SEED, `must be at most ${MAX_SEED}`).optional(),
  riskAversion: RiskAversion.default(BOARD_LAMBDA.default),
  targetReplacementRatio: z.number('must be a number').min(0.05, 'must be at least 0.05 (5% of final salary)').max(1.5, 'must be at most 1.5').default(0.5),
  stress: z
    .strictObject({
      fundId: Uuid,
      yearsBeforeRetirement: z.number('must be a number').int('must be a whole number of years').min(1, 'must be at least 1').max(60, 'must be at most 60'),
      fall: z.number('must be a number').gt(0, 'must be above 0').max(0.95, 'must be at most 0.95 (a 95% fall)'),
    })
    .optional(),
});
export type RunRequestBody = z.input<typeof RunBody>;

/** A board report request: the run, an optional title, and λ (the run's own when absent). */
export const ReportBody = z.strictObject({
  runId: Uuid,
  title: z
    .string('must be text')
    .trim()
    .max(200, 'must be at most 200 characters')
    // A title becomes a mail subject and a file name: one line only.
    .refine((t) => !/[\u0000-\u001f\u007f]/.test(t), 'must be one line (no line breaks or control characters)')
    .optional(),
  riskAversion: RiskAversion.optional(),
});
export type ReportRequest = z.input<typeof ReportBody>;

/** λ (and variant) for reading a finished run's comparison: the board's range, as for a run. */
export const ComparisonQuery = z.object({
  lambda: z
    .string({ message: `is required (a number from ${BOARD_LAMBDA.min} to ${BOARD_LAMBDA.max})` })
    .trim()
    .min(1, `is required (a number from ${BOARD_LAMBDA.min} to ${BOARD_LAMBDA.max})`)
    .transform(Number)
    .pipe(z.number('must be a number').min(BOARD_LAMBDA.min, `must be at least ${BOARD_LAMBDA.min}`).max(BOARD_LAMBDA.max, `must be at most ${BOARD_LAMBDA.max}`)),
  variant: z.enum(['base', 'stressed'], { message: 'must be base or stressed' }).default('base'),
});
