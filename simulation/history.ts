/**
 * Statistics of a fund's past: suggested assumptions from month-end total-return index levels.
 *
 * Method (stated so the suggestions can be checked by hand):
 * - monthly simple return        rₜ = (Pₜ − Pₜ₋₁) / Pₜ₋₁
 * - mean monthly return          m̄ = Σ rₜ / n
 * - sample variance (n − 1)      s² = Σ (rₜ − m̄)² / (n − 1)
 * - sample standard deviation    s = √s²
 * - annual expected return       (1 + m̄)¹² − 1          (the mean monthly return compounded over a year)
 * - annual volatility            √12 · s                 (monthly returns taken as independent)
 * - correlation                  ρᵢⱼ = Σ (rᵢₜ − m̄ᵢ)(rⱼₜ − m̄ⱼ) / ((n − 1) sᵢ sⱼ)   (Pearson, sample)
 * - growth of one unit           Gₜ = Pₜ / P₀
 *
 * Pure: numbers in, numbers out.
 */

/** Simple returns between consecutive levels; one fewer than the levels. */
export function simpleReturns(levels: readonly number[]): number[] {
  const out: number[] = [];
  for (let t = 1; t < levels.length; t++) out.push((levels[t] - levels[t - 1]) / levels[t - 1]);
  return out;
}

/** Arithmetic mean Σx / n. NaN for an empty list. */
export function mean(xs: readonly number[]): number {
  if (xs.length === 0) return NaN;
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/** Sample variance with n − 1 in the denominator: Σ(x − x̄)² / (n − 1). NaN below two values. */
export function sampleVariance(xs: readonly number[]): number {
  const n = xs.length;
  if (n < 2) return NaN;
  const m = mean(xs);
  let s = 0;
  for (const x of xs) s += (x - m) * (x - m);
  return s / (n - 1);
}

/** Sample standard deviation √(sample variance). */
export function sampleStdDev(xs: readonly number[]): number {
  return Math.sqrt(sampleVariance(xs));
}

/**
 * Pearson correlation of two equally long series. Returns null when either series does not
 * vary (its standard deviation is zero), where the correlation is undefined.
 */
export function correlation(xs: readonly number[], ys: readonly number[]): number | null {
  if (xs.length !== ys.length) throw new RangeError(`series lengths differ (${xs.length} and ${ys.length})`);
  const n = xs.length;
  if (n < 2) return null;
  const mx = mean(xs);
  const my = mean(ys);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let t = 0; t < n; t++) {
    const dx = xs[t] - mx;
    const dy = ys[t] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  // Rounding can push |ρ| a hair past 1 for near-identical series.
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}

/** (1 + m)¹² − 1: a mean monthly return compounded over twelve months. */
export function annualiseMonthlyReturn(monthlyMean: number): number {
  return Math.pow(1 + monthlyMean, 12) - 1;
}

/** √12 · s: monthly standard deviation scaled to a year, assuming independent months. */
export function annualiseMonthlyVolatility(monthlySd: number): number {
  return Math.sqrt(12) * monthlySd;
}

export interface HistorySeries {
  /** Caller's identifier (a fund id). */
  id: string;
  /** Month-end total-return index levels, oldest first, all positive. */
  levels: readonly number[];
}

export interface FundHistoryStatistics {
  id: string;
  monthlyMean: number;
  monthlyVariance: number;
  monthlySd: number;
  /** (1 + m̄)¹² − 1, a fraction. */
  annualReturn: number;
  /** √12 · s, a fraction. */
  annualVolatility: number;
  /** Pₜ / P₀ for every level (the first is 1). */
  growth: number[];
}

export interface HistoryStatistics {
  /** Number of monthly returns used (levels − 1). */
  months: number;
  funds: FundHistoryStatistics[];
  /**
   * Correlations in the order of `funds`. An entry whose correlation is undefined (a fund that
   * never moved) is 0 off the diagonal and listed in `undefinedCorrelations`.
   */
  correlations: number[][];
  /** Ids of funds whose returns never vary, so their correlations are undefined. */
  undefinedCorrelations: string[];
}

/**
 * Suggested assumptions from index levels that share the same month-ends. Needs at least
 * three levels (two returns) per series, all series equally long and every level positive.
 */
export function historyStatistics(series: readonly HistorySeries[]): HistoryStatistics {
  if (series.length === 0) throw new RangeError('at least one series is needed');
  const length = series[0].levels.length;
  for (const s of series) {
    if (s.levels.length !== length) throw new RangeError(`series ${s.id} has ${s.levels.length} levels; expected ${length}`);
    if (s.levels.some((p) => !(p > 0) || !Number.isFinite(p))) throw new RangeError(`series ${s.id} has a level that is not a positive number`);
  }
  if (length < 3) throw new RangeError(`at least 3 month-end levels are needed (2 monthly returns); got ${length}`);
  const returns = series.map((s) => simpleReturns(s.levels));
  const funds = series.map<FundHistoryStatistics>((s, i) => {
    const r = returns[i];
    const monthlyMean = mean(r);
    const monthlyVariance = sampleVariance(r);
    const monthlySd = Math.sqrt(monthlyVariance);
    return {
      id: s.id,
      monthlyMean,
      monthlyVariance,
      monthlySd,
      annualReturn: annualiseMonthlyReturn(monthlyMean),
      annualVolatility: annualiseMonthlyVolatility(monthlySd),
      growth: s.levels.map((p) => p / s.levels[0]),
    };
  });
  const undefinedCorrelations = funds.filter((f) => f.monthlySd === 0).map((f) => f.id);
  const n = series.length;
  const correlations = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n; i++) {
    correlations[i][i] = 1;
    for (let j = i + 1; j < n; j++) {
      const rho = correlation(returns[i], returns[j]) ?? 0;
      correlations[i][j] = rho;
      correlations[j][i] = rho;
    }
  }
  return { months: length - 1, funds, correlations, undefinedCorrelations };
}
