/**
 * Annuity factors and the Fisher relation.
 */

/**
 * Present value of 1 a year for `years` years paid at each year end at rate `rate`:
 * a = (1 − (1 + i)^−n) / i, and a = n at i = 0. A pot P buys the level income P / a.
 */
export function annuityFactor(rate: number, years: number): number {
  if (!(years >= 0)) throw new RangeError(`annuity years must be zero or positive (got ${years})`);
  if (!(rate > -1)) throw new RangeError(`annuity rate must be above -1 (got ${rate})`);
  if (Math.abs(rate) < 1e-12) return years;
  return -Math.expm1(-years * Math.log1p(rate)) / rate;
}

/** Real rate from a nominal rate and inflation (Fisher relation): (1 + n) / (1 + π) − 1. */
export function realRate(nominal: number, inflation: number): number {
  return (1 + nominal) / (1 + inflation) - 1;
}
