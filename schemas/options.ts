import { z } from 'zod';
import { GlidePointSchema } from '../simulation';

/**
 * A default option as the API takes it and the glide-path form checks it: the glide path uses
 * the engine's point schema (weights are fractions summing to 1). Pure zod; the route checks at
 * compile time that the fields match the default_option_versions columns (a version holds the content).
 */
export const OptionBody = z
  .strictObject({
    name: z.string().trim().min(1, 'must not be empty').max(120, 'must be at most 120 characters'),
    description: z.string().trim().max(2000, 'must be at most 2,000 characters').default(''),
    glidePath: z.array(GlidePointSchema).min(1, 'needs at least one point').max(30, 'at most 30 points'),
  })
  .superRefine((o, ctx) => {
    const seen = new Map<number, number>();
    o.glidePath.forEach((p, i) => {
      const earlier = seen.get(p.yearsToRetirement);
      if (earlier !== undefined) ctx.addIssue({ code: 'custom', path: ['glidePath', i, 'yearsToRetirement'], message: `repeats ${p.yearsToRetirement} years to retirement (also point ${earlier})` });
      else seen.set(p.yearsToRetirement, i);
    });
  });
export type OptionBodyInput = z.input<typeof OptionBody>;
