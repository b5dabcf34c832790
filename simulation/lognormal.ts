/**
 * Moment matching of a lognormal gross return.
 *
 * A fund's simple annual return R has 1 + R = exp(X), X ~ N(μ, σ²). Choosing
 *   σ² = ln(1 + s² / (1 + m)²),   μ = ln(1 + m) − σ²/2
 * gives E[R] = m and SD[R] = s exactly, because E[exp X] = exp(μ + σ²/2) and
 * Var[exp X] = (exp(σ²) − 1)·exp(2μ + σ²).
 */
export interface LognormalParameters {
  /** Mean of ln(1 + R). */
  mu: number;
  /** Standard deviation of ln(1 + R). */
  sigma: number;
}

/** μ and σ of ln(1 + R) for a simple return with mean `mean` and standard deviation `sd` (fractions). */
export function lognormalFromMoments(mean: number, sd: number): LognormalParameters {
  if (!(mean > -1)) throw new RangeError(`expected return must be above -1 (got ${mean})`);
  if (!(sd >= 0)) throw new RangeError(`volatility must be zero or positive (got ${sd})`);
  const g = 1 + mean;
  const variance = Math.log1p((sd * sd) / (g * g));
  return { mu: Math.log(g) - variance / 2, sigma: Math.sqrt(variance) };
}

/** Mean and standard deviation of the simple return R when ln(1 + R) ~ N(mu, sigma²). */
export function momentsFromLognormal(mu: number, sigma: number): { mean: number; sd: number } {
  const v = sigma * sigma;
  const grossMean = Math.exp(mu + v / 2);
  return { mean: grossMean - 1, sd: Math.sqrt(Math.expm1(v)) * grossMean };
}
