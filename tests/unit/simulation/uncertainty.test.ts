import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';

import {
  breakEvenLambda,
  ceCurve,
  certaintyEquivalentPot,
  findCrossings,
  logCeWithSlope,
  lognormalFromMoments,
  logPots,
  percentileOfSorted,
  runScenario,
  SCAN_GRID,
  separation,
  standardNormalQuantile,
  type ProjectionResult,
  type ScenarioInput,
} from './engineImports';
import { baseScenario, describeCheck } from './helpers';

/** A format-2 comparison of two options for one member. */
function twoOptions(overrides: Partial<ScenarioInput> = {}): ScenarioInput {
  const base = baseScenario();
  return { ...base, version: 2, paths: 4000, riskAversion: 3, members: [base.members[0]], ...overrides } as ScenarioInput;
}

/** Paired bootstrap standard deviation of `stat(A, B)` over resampled paths (whole antithetic pairs when `pairs`). */
function bootstrap(a: Float64Array, b: Float64Array, stat: (a: Float64Array, b: Float64Array) => number, resamples: number, pairs = false): number {
  const rng = seedrandom('keelson-bootstrap');
  const n = a.length;
  const ra = new Float64Array(n);
  const rb = new Float64Array(n);
  const values: number[] = [];
  for (let r = 0; r < resamples; r++) {
    if (pairs) {
      for (let k = 0; k < n / 2; k++) {
        const i = 2 * Math.floor(rng() * (n / 2));
        ra[2 * k] = a[i];
        ra[2 * k + 1] = a[i + 1];
        rb[2 * k] = b[i];
        rb[2 * k + 1] = b[i + 1];
      }
    } else {
      for (let k = 0; k < n; k++) {
        const i = Math.floor(rng() * n);
        ra[k] = a[i];
        rb[k] = b[i];
      }
    }
    values.push(stat(ra, rb));
  }
  const m = values.reduce((s, v) => s + v, 0) / resamples;
  return Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (resamples - 1));
}

const median = (x: Float64Array) => percentileOfSorted(x.slice().sort(), 50);
const pots = (r: ProjectionResult, option: number) => r.results[option].terminalRealPots;

describe('standard errors of a comparison between two options', () => {
  it.each([false, true])('CE difference (antithetic paths: %s): the delta method agrees with a paired bootstrap over 2,000 resamples within 10 per cent', (antithetic) => {
    const r = runScenario(twoOptions({ antithetic }));
    const c = r.comparisons[0];
    const lambda = r.riskAversion;
    const boot = bootstrap(pots(r, 0), pots(r, 1), (a, b) => certaintyEquivalentPot(a, lambda) - certaintyEquivalentPot(b, lambda), 2000, antithetic);
    const se = c.certaintyEquivalent.standardError!;
    expect(Math.abs(se / boot - 1), describeCheck('SE of CE difference', se, boot, 0.1 * boot)).toBeLessThan(0.1);
    expect(c.certaintyEquivalent.value).toBeCloseTo(r.results[0].atRetirement.certaintyEquivalent.realPot - r.results[1].atRetirement.certaintyEquivalent.realPot, 6);
  });

  it('median and chance-of-target differences agree with a paired bootstrap within 10%', () => {
    const r = runScenario(twoOptions());
    const c = r.comparisons[0];
    const a = pots(r, 0);
    const b = pots(r, 1);
    const bootMedian = bootstrap(a, b, (x, y) => median(x) - median(y), 1000);
    expect(Math.abs(c.medianPot.standardError! / bootMedian - 1), describeCheck('SE of median difference', c.medianPot.standardError!, bootMedian, 0.1 * bootMedian)).toBeLessThan(0.1);
    const t = r.results[0].atRetirement.targetRealPot;
    const share = (x: Float64Array) => x.filter((v) => v >= t).length / x.length;
    const bootShare = bootstrap(a, b, (x, y) => share(x) - share(y), 2000);
    const se = c.probabilityReachingTarget!.standardError!;
    expect(Math.abs(se / bootShare - 1), describeCheck('SE of difference in chance of target', se, bootShare, 0.1 * bootShare)).toBeLessThan(0.1);
    expect(c.medianPot.value).toBeCloseTo(median(a) - median(b), 6);
  });

  it('antithetic pairs: the SE of the mean of a lump sum in one lognormal fund matches Var and Cov(W, W′) within 3% (Glasserman §4.2)', () => {
    const n = 10;
    const paths = 100000;
    const r = runScenario({
      ...baseScenario(),
      version: 2,
      paths,
      antithetic: true,
      inflation: 0,
      funds: [{ id: 'f', name: 'Only Fund', expectedReturn: 0.06, volatility: 0.18, annualCharge: 0 }],
      correlations: undefined,
      options: [{ id: 'o', name: 'O', glidePath: [{ yearsToRetirement: 0, weights: { f: 1 } }] }],
      members: [{ id: 'm', age: 55, retirementAge: 55 + n, salary: 0, salaryGrowth: 0, contributionRate: 0, pot: 100000 }],
    } as ScenarioInput);
    // W = W₀ exp(nμ + σ√n Z), W′ = W₀ exp(nμ − σ√n Z): Var W = W₀² e^(2nμ + nσ²)(e^(nσ²) − 1),
    // Cov(W, W′) = E[WW′] − E[W]² = W₀² e^(2nμ)(1 − e^(nσ²)); the mean of n/2 independent pairs has
    // variance (Var W + Cov)/2 / (n/2) (Glasserman, Monte Carlo Methods in Financial Engineering, §4.2).
    const { mu, sigma } = lognormalFromMoments(0.06, 0.18);
    const m = n * mu;
    const v = n * sigma * sigma;
    const varW = 1e10 * Math.exp(2 * m + v) * Math.expm1(v);
    const cov = 1e10 * Math.exp(2 * m) * -Math.expm1(v);
    const analytic = Math.sqrt((varW + cov) / 2 / (paths / 2));
    const se = r.results[0].atRetirement.standardError.nominal;
    expect(Math.abs(se / analytic - 1), describeCheck('antithetic SE', se, analytic, 0.03 * analytic)).toBeLessThan(0.03);
    // Treating the paths as independent would overstate it by more than half.
    const naive = Math.sqrt(varW / paths);
    expect(se / naive).toBeLessThan(0.6);
  });

  it('the break-even interval (delta method) agrees with a paired bootstrap of the crossing within 10%', () => {
    // The base scenario's glide path and fixed mix cross once in range, near λ ≈ 2.8, for the older member.
    const r = runScenario(twoOptions({ paths: 6000, riskAversion: 1, members: [baseScenario().members[1]] }));
    const be = r.breakEven[0];
    expect(be.status).toBe('found');
    expect(be.crossings).toHaveLength(1);
    const crossing = be.crossings[0];
    expect(crossing.interval![0]).toBeLessThan(crossing.lambda);
    expect(crossing.interval![1]).toBeGreaterThan(crossing.lambda);
    const boot = bootstrap(pots(r, 0), pots(r, 1), (a, b) => breakEvenLambda(a, b, [crossing.lambda - 1.5, crossing.lambda + 1.5]).lambda ?? Number.NaN, 300);
    // The bootstrap SD from 300 resamples is itself uncertain by about 4 %.
    expect(Math.abs(crossing.standardError! / boot - 1), describeCheck('SE of break-even λ', crossing.standardError!, boot, 0.1 * boot)).toBeLessThan(0.1);
  });
});

describe('break-even λ', () => {
  /** Two pot samples whose certainty equivalents cross twice inside one scan cell (set up by shifting B). */
  function twoCrossings() {
    const n = 4000;
    const a = new Float64Array(n);
    const b = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const z = standardNormalQuantile((i + 0.5) / n);
      a[i] = Math.exp(0.08 + 0.35 * z);
      // Less volatile, but the worst 4 % of outcomes lose more than half: A leads at low and high λ, B in between.
      b[i] = Math.exp(0.03 + 0.15 * z) * (i < 0.04 * n ? 0.45 : 1) * Math.exp(0.0645019569635);
    }
    return { a, b };
  }

  it('finds two crossings placed between grid points, where a grid scan finds none', () => {
    const { a, b } = twoCrossings();
    const la = logPots(a);
    const lb = logPots(b);
    const found = findCrossings(la, lb, ceCurve(la), ceCurve(lb), false);
    expect(found.status).toBe('found');
    expect(found.crossings.map((c) => c.favouredAbove)).toEqual(['B', 'A']);
    const [first, second] = found.crossings.map((c) => c.lambda);
    // Both inside one cell of the scan grid and of engine 1's grid (1 to 1.5), 0.08 apart.
    expect(SCAN_GRID).toContain(1);
    expect(SCAN_GRID[SCAN_GRID.indexOf(1) + 1]).toBe(1.5);
    expect(first).toBeGreaterThan(1);
    expect(second).toBeLessThan(1.25);
    expect(second - first).toBeGreaterThan(0.05);
    for (const l of [first, second]) {
      const gap = certaintyEquivalentPot(a, l) / certaintyEquivalentPot(b, l) - 1;
      expect(Math.abs(gap), `CE ratio − 1 at λ = ${l}`).toBeLessThan(1e-9);
    }
    // Engine 1's search (first sign change on a 21-point grid) misses both.
    expect(breakEvenLambda(a, b)).toEqual({ lambda: null, status: 'none-in-range' });
  });

  it('scans ln CE and its slope on the grid as computed directly from every pot (1e-12), zero pots included', () => {
    const n = 3000;
    const pots = new Float64Array(n);
    for (let i = 0; i < n; i++) pots[i] = 50000 * Math.exp(0.4 * standardNormalQuantile(((i * 7919) % n + 0.5) / n));
    const withZero = pots.slice();
    withZero[17] = 0;
    for (const sample of [pots, withZero]) {
      const logs = logPots(sample);
      const curve = ceCurve(logs);
      SCAN_GRID.forEach((lambda, k) => {
        const direct = logCeWithSlope(logs, lambda);
        if (direct.value === -Infinity) expect(curve.logCe[k]).toBe(-Infinity);
        else {
          expect(Math.abs(curve.logCe[k] - direct.value), `ln CE at λ = ${lambda}`).toBeLessThan(1e-12 * Math.abs(direct.value));
          expect(Math.abs(curve.slope[k] - direct.slope), `slope at λ = ${lambda}`).toBeLessThan(1e-10 * Math.max(1, Math.abs(direct.slope)));
        }
      });
    }
    // ln CE at λ = ½ is the mean log pot (geometric mean).
    expect(logCeWithSlope(logPots(pots), 0.5).value).toBeCloseTo(logPots(pots).reduce((a, b) => a + b, 0) / n, 12);
  });

  it('says none, identical, or one crossing', () => {
    const n = 2000;
    const a = new Float64Array(n);
    for (let i = 0; i < n; i++) a[i] = Math.exp(0.05 + 0.2 * standardNormalQuantile((i + 0.5) / n));
    const la = logPots(a);
    const scaled = logPots(a.map((x) => 1.01 * x));
    expect(findCrossings(la, scaled, ceCurve(la), ceCurve(scaled), false)).toEqual({ status: 'none-in-range', crossings: [] });
    expect(findCrossings(la, la, ceCurve(la), ceCurve(la), false)).toEqual({ status: 'identical', crossings: [] });
    // Lognormals cross once: ln CE = μ + (1 − 2λ)σ²/2, equal at λ = ½ + (μ_A − μ_B)/(σ_A² − σ_B²).
    const c = new Float64Array(n);
    for (let i = 0; i < n; i++) c[i] = Math.exp(0.02 + 0.1 * standardNormalQuantile((i + 0.5) / n));
    const lc = logPots(c);
    const found = findCrossings(la, lc, ceCurve(la), ceCurve(lc), false);
    expect(found.crossings).toHaveLength(1);
    // The grid sample's own variances, not the nominal ones, set the exact crossing; the closed form is within 1e-3.
    expect(Math.abs(found.crossings[0].lambda - (0.5 + 0.03 / (0.04 - 0.01)))).toBeLessThan(1e-2);
  });
});

describe('figures without a target, and separation', () => {
  it('gives no chance of reaching the target (null) when the target is 0, in format 2', () => {
    const r = runScenario(twoOptions({ targetReplacementRatio: 0, paths: 200 }));
    expect(r.results[0].atRetirement.probabilityReachingTarget).toBeNull();
    expect(r.results[0].atRetirement.uncertainty.probabilityReachingTarget).toBeNull();
    expect(r.comparisons[0].probabilityReachingTarget).toBeNull();
    // Format 1 keeps engine 1's figure (every path reaches a target of 0).
    const one = runScenario({ ...twoOptions({ targetReplacementRatio: 0, paths: 200 }), version: 1 } as ScenarioInput);
    expect(one.results[0].atRetirement.probabilityReachingTarget).toBe(1);
  });

  it.each([
    [100, 40, 1000, { tooCloseToCall: false, pathsToSeparate: null }],
    [-100, 80, 1000, { tooCloseToCall: true, pathsToSeparate: 2600 }],
    [10, 60, 2000, { tooCloseToCall: true, pathsToSeparate: 290000 }],
    [0, 5, 1000, { tooCloseToCall: true, pathsToSeparate: null }],
    [3, null, 1000, { tooCloseToCall: true, pathsToSeparate: null }],
  ])('difference %d with standard error %s at %d paths → %o', (d, se, paths, expected) => {
    // Paths to separate: n·(2·SE/|d|)², rounded up to two significant figures (SE ∝ 1/√n).
    expect(separation(d, se, paths)).toEqual(expected);
  });

  it('reports a standard error for every figure at retirement, antithetic-aware', () => {
    const plain = runScenario(twoOptions({ paths: 4000 }));
    const anti = runScenario(twoOptions({ paths: 4000, antithetic: true }));
    for (const r of [plain, anti]) {
      const u = r.results[0].atRetirement.uncertainty;
      for (const key of ['p5', 'p10', 'p25', 'p50', 'p75', 'p90', 'p95']) expect(u.percentiles.real[key]).toBeGreaterThan(0);
      expect(u.expectedShortfall.real).toBeGreaterThan(0);
      expect(u.certaintyEquivalent.realPot).toBeGreaterThan(0);
      expect(u.probabilityReachingTarget).toBeGreaterThan(0);
    }
    // Antithetic pairs make the mean more precise for the same number of paths.
    expect(anti.results[0].atRetirement.standardError.real).toBeLessThan(plain.results[0].atRetirement.standardError.real);
    // The median's standard error: √(p(1 − p)/n)/f(q) for independent paths (asymptotic normality of
    // sample quantiles); with f of a lognormal fitted to the sample, within 20 %.
    const x = plain.results[0].terminalRealPots;
    const logs = Array.from(x, Math.log);
    const m = logs.reduce((s, v) => s + v, 0) / logs.length;
    const s = Math.sqrt(logs.reduce((t, v) => t + (v - m) ** 2, 0) / (logs.length - 1));
    const density = 1 / (Math.exp(m) * s * Math.sqrt(2 * Math.PI));
    const expected = Math.sqrt(0.25 / x.length) / density;
    const se = plain.results[0].atRetirement.uncertainty.percentiles.real.p50;
    expect(Math.abs(se / expected - 1), describeCheck('SE of the median', se, expected, 0.2 * expected)).toBeLessThan(0.2);
  });
});
