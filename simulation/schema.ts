import { z } from 'zod';

import { checkCorrelationMatrix } from './cholesky';
import { ContributionBasisSchema, TimingSchema, FORMAT_ONE_CONVENTIONS, type Conventions } from './conventions';

/**
 * Scenario input, JSON format versions 1 and 2 (documented in simulation/README.md).
 *
 * Format 1 (no `version`, or `version: 1`) runs on engine 1's random numbers and conventions
 * (glide weights and contributions at the start of each year, contributions on full salary)
 * and gives engine 1's results byte for byte. Format 2 adds the timing conventions and the
 * contribution basis and runs on the format-2 random numbers.
 *
 * All rates are fractions (0.025 = 2.5 %). Percentile ranks are on the 0–100 scale
 * (5 = 5th percentile). Ages are whole years.
 */

/** Tolerance on glide-path weights summing to 1. */
export const WEIGHT_SUM_TOLERANCE = 1e-9;

/** Percentile ranks reported when the scenario gives none. */
export const DEFAULT_PERCENTILES = [5, 10, 25, 50, 75, 90, 95];

const id = z.string().min(1, 'must not be empty').max(100, 'must be at most 100 characters');
const label = z.string().min(1, 'must not be empty').max(200, 'must be at most 200 characters');

export const FundSchema = z.object({
  id,
  name: label,
  /** Arithmetic mean of the annual simple nominal return. */
  expectedReturn: z.number().gt(-1, 'must be above -1 (a fraction: 0.07 = 7%)').lt(10, 'must be below 10 (a fraction: 0.07 = 7%)'),
  /** Standard deviation of the annual simple nominal return. */
  volatility: z.number().min(0, 'must not be negative').max(5, 'must be at most 5 (a fraction: 0.15 = 15%)'),
  /** Annual charge, a fraction of the pot taken after the year's return. */
  annualCharge: z.number().min(0, 'must not be negative').lt(1, 'must be below 1 (a fraction: 0.005 = 0.5%)'),
});

export const WeightsSchema = z
  .record(z.string(), z.number().min(0, 'weight must not be negative').max(1, 'weight must not exceed 1'))
  .superRefine((weights, ctx) => {
    const values = Object.values(weights);
    if (values.length === 0) {
      ctx.addIssue({ code: 'custom', message: 'at least one fund weight is needed' });
      return;
    }
    const sum = values.reduce((a, b) => a + b, 0);
    if (Math.abs(sum - 1) > WEIGHT_SUM_TOLERANCE) {
      ctx.addIssue({ code: 'custom', message: `weights sum to ${Number(sum.toPrecision(12))}; they must sum to 1 (±1e-9)` });
    }
  });

export const GlidePointSchema = z.object({
  yearsToRetirement: z.number().min(0, 'must not be negative').max(100, 'must be at most 100'),
  weights: WeightsSchema,
});

export const OptionSchema = z
  .object({
    id,
    name: label,
    glidePath: z.array(GlidePointSchema).min(1, 'needs at least one point'),
  })
  .superRefine((option, ctx) => {
    const seen = new Map<number, number>();
    option.glidePath.forEach((point, i) => {
      const earlier = seen.get(point.yearsToRetirement);
      if (earlier !== undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['glidePath', i, 'yearsToRetirement'],
          message: `repeats ${point.yearsToRetirement} years to retirement (also point ${earlier})`,
        });
      } else seen.set(point.yearsToRetirement, i);
    });
  });

export const MemberSchema = z
  .object({
    id,
    age: z.number().int('must be a whole number of years').min(0, 'must not be negative').max(120, 'must be at most 120'),
    retirementAge: z.number().int('must be a whole number of years').min(1, 'must be at least 1').max(130, 'must be at most 130'),
    salary: z.number().min(0, 'must not be negative'),
    salaryGrowth: z.number().gt(-1, 'must be above -1 (a fraction: 0.03 = 3%)').lt(1, 'must be below 1 (a fraction)'),
    contributionRate: z.number().min(0, 'must not be negative').max(1, 'must be at most 1 (a fraction of salary)'),
    pot: z.number().min(0, 'must not be negative'),
  })
  .superRefine((member, ctx) => {
    if (member.retirementAge <= member.age) {
      ctx.addIssue({
        code: 'custom',
        path: ['retirementAge'],
        message: `must be above age (${member.age}); got ${member.retirementAge}`,
      });
    }
  });

export const CorrelationsSchema = z.array(z.array(z.number())).superRefine((matrix, ctx) => {
  for (const problem of checkCorrelationMatrix(matrix)) {
    ctx.addIssue({ code: 'custom', path: problem.path, message: problem.message });
  }
});

/**
 * Deterministic shock: in the year that starts `yearsBeforeRetirement` years before the
 * member's retirement (1 = the final year), fund `fundId` returns −fall on every path instead
 * of its random return. Members with fewer years to go are not shocked.
 */
export const StressSchema = z.object({
  fundId: id,
  yearsBeforeRetirement: z.number().int('must be a whole number of years').min(1, 'must be at least 1').max(100, 'must be at most 100'),
  fall: z.number().min(0, 'must not be negative').max(1, 'must be at most 1 (a fraction: 0.3 = a 30% fall)'),
});

export const AnnuitySchema = z.object({
  /** Real interest rate used to turn a pot into a level real income. */
  realRate: z.number().gt(-1, 'must be above -1').lt(1, 'must be below 1 (a fraction)'),
  /** Years of income. */
  years: z.number().int('must be a whole number of years').min(1, 'must be at least 1').max(100, 'must be at most 100'),
});

/** Scenario format 1: the fields every format shares. */
export const ScenarioV1Schema = z.object({
  /** Format version: 1 when absent. */
  version: z.literal(1).optional(),
  seed: z.number().int('must be a whole number').min(-(2 ** 53) + 1).max(2 ** 53 - 1),
  paths: z.number().int('must be a whole number').min(1, 'must be at least 1').max(1_000_000, 'must be at most 1,000,000'),
  antithetic: z.boolean().default(false),
  inflation: z.number().gt(-1, 'must be above -1 (a fraction: 0.025 = 2.5%)').lt(1, 'must be below 1 (a fraction)'),
  funds: z.array(FundSchema).min(1, 'needs at least one fund').max(50, 'at most 50 funds'),
  correlations: CorrelationsSchema.optional(),
  options: z.array(OptionSchema).min(1, 'needs at least one option').max(50, 'at most 50 options'),
  members: z.array(MemberSchema).min(1, 'needs at least one member').max(200, 'at most 200 members'),
  riskAversion: z.number().min(-50, 'must be at least -50').max(500, 'must be at most 500'),
  targetReplacementRatio: z.number().min(0, 'must not be negative').max(10, 'must be at most 10 (a fraction of final salary)'),
  annuity: AnnuitySchema,
  percentiles: z
    .array(z.number().gt(0, 'must be above 0').lt(100, 'must be below 100'))
    .min(1, 'needs at least one percentile')
    .max(50, 'at most 50 percentiles')
    .default(DEFAULT_PERCENTILES),
  stress: StressSchema.optional(),
});

/** Scenario format 2: format 1 plus the timing conventions and the contribution basis. */
export const ScenarioV2Schema = ScenarioV1Schema.extend({
  version: z.literal(2),
  timing: TimingSchema.prefault({}),
  contributionBasis: ContributionBasisSchema.prefault({ basis: 'full-salary' }),
});

/** The current scenario format (2); its `.shape` holds the field schemas forms reuse. */
export const ScenarioSchema = ScenarioV2Schema;

/** Newest scenario format version. */
export const SCENARIO_VERSION = 2;

/** Scenario as written (optional fields may be missing), in either format. */
export type ScenarioInput = z.input<typeof ScenarioV1Schema> | z.input<typeof ScenarioV2Schema>;
/**
 * Validated scenario with defaults filled in. A format-1 scenario carries format 1's
 * conventions (start of year, full salary) and `version: 1`.
 */
export type Scenario = Omit<z.output<typeof ScenarioV2Schema>, 'version' | 'timing' | 'contributionBasis'> & { version: 1 | 2 } & Conventions;
export type Fund = z.output<typeof FundSchema>;
export type InvestmentOption = z.output<typeof OptionSchema>;
export type Member = z.output<typeof MemberSchema>;
export type Stress = z.output<typeof StressSchema>;

/** One invalid field: dotted path (e.g. "funds.1.volatility", "correlations.0.2") and reason. */
export interface ValidationIssue {
  path: string;
  message: string;
}

export type ValidationResult = { ok: true; scenario: Scenario } | { ok: false; issues: ValidationIssue[] };

/** Thrown by runScenario for invalid input; carries every issue. */
export class ScenarioValidationError extends Error {
  readonly issues: ValidationIssue[];
  constructor(issues: ValidationIssue[]) {
    super(`invalid scenario: ${issues.map((i) => `${i.path || '(scenario)'}: ${i.message}`).join('; ')}`);
    this.name = 'ScenarioValidationError';
    this.issues = issues;
  }
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Checks that need more than one field: ids, fund references, matrix size, antithetic pairs. */
function crossFieldIssues(raw: Record<string, unknown>): ValidationIssue[] {
  const issues: ValidationIssue[] = [];
  const duplicates = (list: unknown, field: string) => {
    if (!Array.isArray(list)) return [] as string[];
    const ids: string[] = [];
    list.forEach((item, i) => {
      if (isRecord(item) && typeof item.id === 'string') {
        if (ids.includes(item.id)) issues.push({ path: `${field}.${i}.id`, message: `duplicate id "${item.id}"` });
        ids.push(item.id);
      }
    });
    return ids;
  };
  const fundIds = duplicates(raw.funds, 'funds');
  duplicates(raw.options, 'options');
  duplicates(raw.members, 'members');
  const fundsKnown = Array.isArray(raw.funds) && fundIds.length === raw.funds.length;
  if (fundsKnown && Array.isArray(raw.options)) {
    raw.options.forEach((option, o) => {
      if (!isRecord(option) || !Array.isArray(option.glidePath)) return;
      option.glidePath.forEach((point, p) => {
        if (!isRecord(point) || !isRecord(point.weights)) return;
        for (const key of Object.keys(point.weights)) {
          if (!fundIds.includes(key)) {
            issues.push({ path: `options.${o}.glidePath.${p}.weights.${key}`, message: `unknown fund id "${key}"` });
          }
        }
      });
    });
  }
  if (fundsKnown && Array.isArray(raw.correlations) && raw.correlations.length !== fundIds.length) {
    issues.push({
      path: 'correlations',
      message: `must be ${fundIds.length}×${fundIds.length} (one row and column per fund, in the order of funds); got ${raw.correlations.length} rows`,
    });
  }
  if (fundsKnown && isRecord(raw.stress) && typeof raw.stress.fundId === 'string' && !fundIds.includes(raw.stress.fundId)) {
    issues.push({ path: 'stress.fundId', message: `unknown fund id "${raw.stress.fundId}"` });
  }
  if (raw.version !== 2) {
    for (const field of ['timing', 'contributionBasis']) {
      if (field in raw) issues.push({ path: field, message: 'is a scenario format 2 field: add "version": 2' });
    }
  }
  if (raw.antithetic === true && typeof raw.paths === 'number' && raw.paths % 2 !== 0) {
    issues.push({ path: 'paths', message: 'must be even when antithetic is true (paths come in pairs)' });
  }
  return issues;
}

/**
 * Validate a scenario. Returns the scenario with defaults filled in, or every problem found
 * with a dotted field path and a reason.
 */
export function validateScenario(input: unknown): ValidationResult {
  if (!isRecord(input)) return { ok: false, issues: [{ path: '', message: 'scenario must be a JSON object' }] };
  if (input.version !== undefined && input.version !== 1 && input.version !== 2) {
    return { ok: false, issues: [{ path: 'version', message: `must be 1 or 2 (got ${JSON.stringify(input.version)})` }] };
  }
  const formatTwo = input.version === 2;
  const parsed = formatTwo ? ScenarioV2Schema.safeParse(input) : ScenarioV1Schema.safeParse(input);
  const issues: ValidationIssue[] = parsed.success
    ? []
    : parsed.error.issues.map((issue) => ({ path: issue.path.map(String).join('.'), message: issue.message }));
  issues.push(...crossFieldIssues(input));
  const seen = new Set<string>();
  const unique = issues.filter((issue) => {
    const key = `${issue.path}\u0000${issue.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  if (unique.length > 0 || !parsed.success) return { ok: false, issues: unique };
  const data = parsed.data;
  const scenario: Scenario =
    'timing' in data && data.version === 2
      ? { ...data, version: 2 }
      : { ...data, version: 1, timing: { ...FORMAT_ONE_CONVENTIONS.timing }, contributionBasis: { ...FORMAT_ONE_CONVENTIONS.contributionBasis } };
  return { ok: true, scenario };
}

/** Validate or throw {@link ScenarioValidationError}. */
export function parseScenario(input: unknown): Scenario {
  const result = validateScenario(input);
  if (!result.ok) throw new ScenarioValidationError(result.issues);
  return result.scenario;
}
