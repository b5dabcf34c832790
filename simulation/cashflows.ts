import type { ContributionBasis, Timing } from './conventions';
import { spreadGrowth } from './fastMath';

/**
 * A member's contributions, salaries and deflators, year by year.
 *
 * Conventions:
 * - Annual steps from the member's current age to retirement age: n = retirementAge − age
 *   years, year y = 0 … n−1 running from time y to time y+1 (time in years from now).
 * - Year y's contribution is contributionRate × (salary_y, or with a qualifying-earnings basis
 *   min(max(salary_y − L_y, 0), U_y − L_y) with limits L_y = L·(1 + inflation)^y and likewise
 *   U_y, or L and U when not indexed), where salary_0 = salary and salary grows by
 *   salaryGrowth each year after the first: salary_y = salary × (1 + salaryGrowth)^y. It is
 *   paid at the start of year y, or spread through it (see conventions.ts).
 * - Real values at time t divide by the deflator (1 + inflation)^t.
 * - The final salary is the salary of the last working year, salary_{n−1}; its real value
 *   is taken at retirement, finalSalary / (1 + inflation)^n, so a replacement ratio
 *   (income at retirement ÷ final salary) is the same in nominal and real terms.
 */
export interface MemberCashflowInput {
  age: number;
  retirementAge: number;
  salary: number;
  salaryGrowth: number;
  contributionRate: number;
  pot: number;
}

export interface MemberTimeline {
  /** Number of annual steps n. */
  years: number;
  /** Ages at times 0 … n (n + 1 entries). */
  ages: number[];
  /** Pot at time 0. */
  initialPot: number;
  /** Nominal contribution paid at the start of year y (n entries). */
  contributions: Float64Array;
  /** The same contributions in today's money: contributions[y] / (1 + inflation)^y. */
  realContributions: Float64Array;
  /** (1 + inflation)^t for t = 0 … n. */
  deflators: Float64Array;
  /** Nominal salary of the last working year. */
  finalSalary: number;
  /** finalSalary / (1 + inflation)^n. */
  realFinalSalary: number;
}

/** Build the member's year-by-year cash flows (see the module comment for conventions). */
export function memberTimeline(
  member: MemberCashflowInput,
  inflation: number,
  basis: ContributionBasis = { basis: 'full-salary' },
): MemberTimeline {
  const band = basis.basis === 'qualifying-earnings' ? basis : null;
  const years = member.retirementAge - member.age;
  if (!(years >= 1) || !Number.isInteger(years)) {
    throw new RangeError(`retirement age must be a whole number of years above age (got ${years})`);
  }
  const contributions = new Float64Array(years);
  const realContributions = new Float64Array(years);
  const deflators = new Float64Array(years + 1);
  const ages: number[] = [];
  let salary = member.salary;
  let deflator = 1;
  for (let t = 0; t <= years; t++) {
    deflators[t] = deflator;
    ages.push(member.age + t);
    if (t < years) {
      if (t > 0) salary *= 1 + member.salaryGrowth;
      if (band) {
        const index = band.indexation === 'inflation' ? deflator : 1;
        const lower = band.lowerLimit * index;
        const upper = band.upperLimit * index;
        contributions[t] = member.contributionRate * Math.min(Math.max(salary - lower, 0), upper - lower);
      } else contributions[t] = member.contributionRate * salary;
      realContributions[t] = contributions[t] / deflator;
    }
    deflator *= 1 + inflation;
  }
  return {
    years,
    ages,
    initialPot: member.pot,
    contributions,
    realContributions,
    deflators,
    finalSalary: salary,
    realFinalSalary: salary / deflators[years],
  };
}

/**
 * Future value after `years` years of a payment stream that starts at `payment` and grows
 * by `growth` a year, invested at `rate` a year:
 *   end-of-year payments:   P × ((1 + i)^n − (1 + g)^n) / (i − g)   (n P (1 + i)^(n−1) when i = g)
 *   start-of-year payments: the same × (1 + i).
 */
export function growingAnnuityFutureValue(
  payment: number,
  growth: number,
  rate: number,
  years: number,
  timing: 'end' | 'start',
): number {
  const a = Math.pow(1 + rate, years);
  const b = Math.pow(1 + growth, years);
  const endValue =
    Math.abs(rate - growth) < 1e-14 ? years * payment * Math.pow(1 + rate, years - 1) : (payment * (a - b)) / (rate - growth);
  return timing === 'end' ? endValue : endValue * (1 + rate);
}

/**
 * Pot at time n from constant annual return r on the pot `initialPot` and the contributions:
 *   paid at the start of each year:  initialPot (1 + r)^n + Σ_y c_y (1 + r)^(n − y);
 *   spread through each year:        initialPot (1 + r)^n + Σ_y c_y s(1 + r) (1 + r)^(n − 1 − y),
 * with s(q) = spreadGrowth(q), the growth of twelve end-of-month instalments (fastMath.ts).
 */
export function accumulate(
  initialPot: number,
  contributions: ArrayLike<number>,
  annualReturn: number,
  timing: Timing['contributions'] = 'start-of-year',
): number {
  let pot = initialPot;
  const g = 1 + annualReturn;
  if (timing === 'spread') {
    const s = spreadGrowth(g);
    for (let y = 0; y < contributions.length; y++) pot = pot * g + contributions[y] * s;
  } else {
    for (let y = 0; y < contributions.length; y++) pot = (pot + contributions[y]) * g;
  }
  return pot;
}
