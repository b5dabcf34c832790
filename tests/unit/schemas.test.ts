import { describe, expect, expectTypeOf, it } from 'vitest';
import type { z } from 'zod';
import type { assumptionSets, fundAssumptions, optionVersions } from '../../db/schema';
import { AssumptionSetBody } from '../../schemas/assumptions';
import { OptionBody } from '../../schemas/options';

/**
 * The request schemas shared by the API and the forms are plain zod (no database code in the
 * browser). These checks tie them to the tables they fill: the compiler rejects a field whose
 * type drifts from its column.
 */
type SetColumns = Pick<typeof assumptionSets.$inferInsert, 'setAt' | 'rationale' | 'inflation' | 'salaryGrowth' | 'annuityRealRate' | 'annuityYears'> & {
  funds: Omit<typeof fundAssumptions.$inferInsert, 'assumptionSetId'>[];
};
type OptionColumns = Pick<typeof optionVersions.$inferInsert, 'name' | 'description' | 'glidePath'>;

describe('request schemas shared with the forms', () => {
  it('fill the columns of their tables', () => {
    expectTypeOf<z.output<typeof AssumptionSetBody>>().toExtend<SetColumns>();
    expectTypeOf<z.output<typeof OptionBody>>().toExtend<OptionColumns>();
  });

  it('name the field and the reason, as the API answers', () => {
    const r = OptionBody.safeParse({ name: ' ', glidePath: [{ yearsToRetirement: 5, weights: { a: 0.6 } }, { yearsToRetirement: 5, weights: { a: 1 } }] });
    expect(r.success).toBe(false);
    const issues = r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    expect(issues).toEqual(expect.arrayContaining(['name: must not be empty', 'glidePath.0.weights: weights sum to 0.6; they must sum to 1 (±1e-9)']));
  });
});
