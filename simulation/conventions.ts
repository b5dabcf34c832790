import { z } from 'zod';

/**
 * Timing conventions and the contribution basis (scenario format 2; format 1 has fixed ones).
 *
 * - glideWeights: the glide-path mix held through a year is read at
 *   'mid-year' — years to retirement at the middle of the year, (n − y) − ½ for year y of n, so
 *   the final year holds the mix halfway between the last two points — or at 'start-of-year',
 *   n − y (format 1: the mix at 0 years to retirement is then never held).
 * - contributions: paid 'spread' through the year (twelve equal instalments at the end of each
 *   month, each growing by the year's net growth factor raised to the fraction of the year
 *   left) or all at the 'start-of-year' (format 1).
 * - contributionBasis: 'full-salary', or 'qualifying-earnings' — the part of salary between a
 *   lower and an upper limit, both given in today's money and, by default, raised with price
 *   inflation each year.
 */

/**
 * UK automatic-enrolment qualifying earnings band, £ a year: lower limit £6,240, upper limit
 * £50,270 (tax years 2024/25 and 2025/26; set under the Pensions Act 2008, s. 13, in the
 * Department for Work and Pensions' annual review of the earnings trigger and qualifying
 * earnings band). From memory: check the current review before relying on them.
 */
export const UK_QUALIFYING_EARNINGS = { lowerLimit: 6240, upperLimit: 50270 } as const;

export const GLIDE_WEIGHT_TIMINGS = ['mid-year', 'start-of-year'] as const;
export const CONTRIBUTION_TIMINGS = ['spread', 'start-of-year'] as const;

export const TimingSchema = z.object({
  glideWeights: z.enum(GLIDE_WEIGHT_TIMINGS, { message: `must be one of ${GLIDE_WEIGHT_TIMINGS.join(', ')}` }).default('mid-year'),
  contributions: z.enum(CONTRIBUTION_TIMINGS, { message: `must be one of ${CONTRIBUTION_TIMINGS.join(', ')}` }).default('spread'),
});

const limit = z.number().min(0, 'must not be negative').max(10_000_000, 'must be at most 10,000,000');

export const ContributionBasisSchema = z.discriminatedUnion(
  'basis',
  [
    z.object({ basis: z.literal('full-salary') }),
    z
      .object({
        basis: z.literal('qualifying-earnings'),
        /** Lower limit in today's money. */
        lowerLimit: limit.default(UK_QUALIFYING_EARNINGS.lowerLimit),
        /** Upper limit in today's money. */
        upperLimit: limit.default(UK_QUALIFYING_EARNINGS.upperLimit),
        /** 'inflation': both limits grow with the scenario's inflation each year; 'none': fixed. */
        indexation: z.enum(['inflation', 'none'], { message: 'must be inflation or none' }).default('inflation'),
      })
      .superRefine((b, ctx) => {
        if (b.upperLimit < b.lowerLimit) {
          ctx.addIssue({ code: 'custom', path: ['upperLimit'], message: `must not be below the lower limit (${b.lowerLimit})` });
        }
      }),
  ],
  { message: 'basis must be full-salary or qualifying-earnings' },
);

export type Timing = z.output<typeof TimingSchema>;
export type ContributionBasis = z.output<typeof ContributionBasisSchema>;
export type Conventions = { timing: Timing; contributionBasis: ContributionBasis };

/** The conventions every format-1 scenario runs with. */
export const FORMAT_ONE_CONVENTIONS: Conventions = {
  timing: { glideWeights: 'start-of-year', contributions: 'start-of-year' },
  contributionBasis: { basis: 'full-salary' },
};

/** What a format-2 scenario runs with when it names no conventions. */
export const FORMAT_TWO_DEFAULTS: Conventions = {
  timing: { glideWeights: 'mid-year', contributions: 'spread' },
  contributionBasis: { basis: 'full-salary' },
};

/** Years to retirement at which year y of n reads the glide path. */
export function glideReadingPoint(timing: Timing, years: number, y: number): number {
  return timing.glideWeights === 'mid-year' ? years - y - 0.5 : years - y;
}
