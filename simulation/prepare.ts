import { annuityFactor } from './annuity';
import { memberTimeline, type MemberTimeline } from './cashflows';
import { cholesky } from './cholesky';
import { glideReadingPoint } from './conventions';
import { weightsAt } from './glidePath';
import { lognormalFromMoments } from './lognormal';
import type { Scenario } from './schema';

/**
 * A validated scenario compiled into flat typed tables for the path loop.
 *
 * Pairs are (option, member) combinations in option-major order:
 * pairIndex = optionIndex × members + memberIndex.
 */
export interface PreparedPair {
  pairIndex: number;
  optionIndex: number;
  memberIndex: number;
  timeline: MemberTimeline;
  /** Number of annual steps n. */
  years: number;
  /** Weights held through year y at [y × funds + i] (read at the glide-path point of the timing convention). */
  weights: Float64Array;
  /** 1 − Σ wᵢcᵢ for year y. */
  chargeFactor: Float64Array;
  /** Year index shocked by the stress test, or −1. */
  stressYear: number;
}

export interface PreparedScenario {
  scenario: Scenario;
  fundIds: string[];
  fundCount: number;
  /** μ and σ of ln(1 + R) for each fund. */
  mu: Float64Array;
  sigma: Float64Array;
  /** Lower Cholesky factor of the correlations, row-major funds × funds. */
  chol: Float64Array;
  /** diag(σ)·L, row-major: fund i's log return is μᵢ + Σₖ scaledChol[i×F + k]·zₖ (format 2). */
  scaledChol: Float64Array;
  /** Longest horizon over members: every path draws maxYears × funds normals. */
  maxYears: number;
  pairs: PreparedPair[];
  /** Stressed fund index (or −1) and its gross return 1 − fall. */
  stressFund: number;
  stressGross: number;
  /** Annuity factor at the scenario's real rate and term. */
  annuityFactor: number;
}

/** Compile a validated scenario (see {@link PreparedScenario}). */
export function prepareScenario(scenario: Scenario): PreparedScenario {
  const fundIds = scenario.funds.map((f) => f.id);
  const F = fundIds.length;
  const mu = new Float64Array(F);
  const sigma = new Float64Array(F);
  scenario.funds.forEach((fund, i) => {
    const p = lognormalFromMoments(fund.expectedReturn, fund.volatility);
    mu[i] = p.mu;
    sigma[i] = p.sigma;
  });
  const correlations =
    scenario.correlations ?? Array.from({ length: F }, (_, i) => Array.from({ length: F }, (_, j) => (i === j ? 1 : 0)));
  const l = cholesky(correlations);
  const chol = new Float64Array(F * F);
  for (let i = 0; i < F; i++) for (let j = 0; j < F; j++) chol[i * F + j] = l[i][j];
  const charges = scenario.funds.map((f) => f.annualCharge);
  const stress = scenario.stress;
  const stressFund = stress ? fundIds.indexOf(stress.fundId) : -1;

  const pairs: PreparedPair[] = [];
  let maxYears = 0;
  const timelines = scenario.members.map((m) => memberTimeline(m, scenario.inflation, scenario.contributionBasis));
  for (const t of timelines) maxYears = Math.max(maxYears, t.years);
  scenario.options.forEach((option, optionIndex) => {
    timelines.forEach((timeline, memberIndex) => {
      const n = timeline.years;
      const weights = new Float64Array(n * F);
      const chargeFactor = new Float64Array(n);
      const w = new Float64Array(F);
      for (let y = 0; y < n; y++) {
        weightsAt(option.glidePath, fundIds, glideReadingPoint(scenario.timing, n, y), w);
        let c = 0;
        for (let i = 0; i < F; i++) {
          weights[y * F + i] = w[i];
          c += w[i] * charges[i];
        }
        chargeFactor[y] = 1 - c;
      }
      const stressYear = stress && stress.yearsBeforeRetirement <= n ? n - stress.yearsBeforeRetirement : -1;
      pairs.push({
        pairIndex: pairs.length,
        optionIndex,
        memberIndex,
        timeline,
        years: n,
        weights,
        chargeFactor,
        stressYear,
      });
    });
  });
  const scaledChol = new Float64Array(F * F);
  for (let i = 0; i < F; i++) for (let k = 0; k < F; k++) scaledChol[i * F + k] = sigma[i] * chol[i * F + k];
  return {
    scenario,
    fundIds,
    fundCount: F,
    mu,
    sigma,
    chol,
    scaledChol,
    maxYears,
    pairs,
    stressFund,
    stressGross: stress ? 1 - stress.fall : 1,
    annuityFactor: annuityFactor(scenario.annuity.realRate, scenario.annuity.years),
  };
}

/** Default cap on per-age working storage (bytes) for one batch of pairs: 256 MiB. */
export const DEFAULT_BAND_BUDGET_BYTES = 256 * 1024 * 1024;

/** Bytes of per-age storage one pair needs over `paths` paths (Float32 per path per intermediate age). */
export function bandBytes(pair: PreparedPair, paths: number): number {
  return 4 * paths * Math.max(pair.years - 1, 0);
}

/**
 * Split pairs into batches simulated together (sharing one pass of draws) so that each
 * batch's per-age storage stays within `budgetBytes` (a batch always holds at least one pair).
 */
export function planBatches(prepared: PreparedScenario, budgetBytes = DEFAULT_BAND_BUDGET_BYTES): number[][] {
  const paths = prepared.scenario.paths;
  const batches: number[][] = [];
  let current: number[] = [];
  let bytes = 0;
  for (const pair of prepared.pairs) {
    const b = bandBytes(pair, paths);
    if (current.length > 0 && bytes + b > budgetBytes) {
      batches.push(current);
      current = [];
      bytes = 0;
    }
    current.push(pair.pairIndex);
    bytes += b;
  }
  if (current.length > 0) batches.push(current);
  return batches;
}
