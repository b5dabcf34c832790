import { describe, expect, it } from 'vitest';

import { accumulate, annuityFactor, growingAnnuityFutureValue, realRate } from '@/simulation';

describe('annuity and growth formulas', () => {
  it('annuity factor at 5% for 20 years is 12.4622103', () => {
    // Standard annuity-certain formula a = (1 − (1+i)^−n)/i.
    expect(Math.abs(annuityFactor(0.05, 20) - 12.4622103)).toBeLessThan(5e-8);
    expect(annuityFactor(0, 20)).toBe(20);
  });

  it('Fisher relation: 7% nominal with 2.5% inflation is 4.3902% real', () => {
    // Fisher relation (1 + n) = (1 + r)(1 + π).
    expect(Math.abs(realRate(0.07, 0.025) - 0.043902)).toBeLessThan(5e-7);
  });

  it('future value of 5,000 growing 3% for 35 years at 7% paid at year end is 982,839.88', () => {
    // Future value of a growing annuity, P((1+i)^n − (1+g)^n)/(i − g) (standard handbook formula).
    const fv = growingAnnuityFutureValue(5000, 0.03, 0.07, 35, 'end');
    expect(Math.abs(fv - 982839.88), `computed ${fv}`).toBeLessThan(0.01);
    // Start-of-year payments earn one more year: the same times 1.07; and i = g uses n P (1+i)^(n−1).
    expect(growingAnnuityFutureValue(5000, 0.03, 0.07, 35, 'start')).toBeCloseTo(fv * 1.07, 6);
    expect(growingAnnuityFutureValue(100, 0.05, 0.05, 10, 'end')).toBeCloseTo(10 * 100 * 1.05 ** 9, 9);
  });

  it('accumulating start-of-year contributions matches the start-of-year formula', () => {
    const contributions = Array.from({ length: 35 }, (_, y) => 5000 * 1.03 ** y);
    expect(accumulate(0, contributions, 0.07)).toBeCloseTo(growingAnnuityFutureValue(5000, 0.03, 0.07, 35, 'start'), 5);
  });
});
