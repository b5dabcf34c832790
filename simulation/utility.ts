import { accumulate, type MemberTimeline } from './cashflows';
import type { Timing } from './conventions';
import { findRoot } from './roots';

/**
 * Risk preferences: certainty equivalents, their annual returns and break-even λ.
 *
 * Convention: constant relative risk aversion with γ = 2λ. For a one-period return r the
 * CRRA certainty-equivalent return is, to first order, E[r] − (γ/2)·Var[r] = E[r] − λ·Var[r],
 * i.e. mean–variance utility with risk-aversion coefficient A = 2λ.
 *
 *   CE pot = ( (1/n) Σ Wᵢ^(1−γ) )^(1/(1−γ))      γ ≠ 1
 *   CE pot = exp( (1/n) Σ ln Wᵢ )                γ = 1 (|1 − γ| < 1e-9)
 *
 * λ = 0 gives the mean; λ < 0 (risk seeking) gives more than the mean. It is computed in log
 * space with log-sum-exp, so large γ never overflows. A pot of zero gives CE = 0 when γ ≥ 1
 * and counts as zero in the mean when γ < 1.
 */

/** Range searched for break-even λ. */
export const BREAK_EVEN_RANGE: readonly [number, number] = [-5, 50];

/** Natural logs of pots (−Infinity for pots ≤ 0), computed once and reused for many λ. */
export function logPots(pots: ArrayLike<number>): Float64Array {
  const out = new Float64Array(pots.length);
  for (let i = 0; i < pots.length; i++) out[i] = pots[i] > 0 ? Math.log(pots[i]) : -Infinity;
  return out;
}

/** ln(CE pot) from log pots at risk aversion λ (see the module comment). */
export function logCertaintyEquivalent(logs: Float64Array, lambda: number): number {
  const n = logs.length;
  if (n === 0) return Number.NaN;
  const e = 1 - 2 * lambda;
  if (Math.abs(e) < 1e-9) {
    let s = 0;
    for (let i = 0; i < n; i++) s += logs[i];
    return s / n;
  }
  let m = -Infinity;
  for (let i = 0; i < n; i++) {
    const a = e * logs[i];
    if (a > m) m = a;
  }
  if (m === Infinity) return -Infinity; // a zero pot with γ > 1
  if (m === -Infinity) return -Infinity; // every pot zero
  let s = 0;
  for (let i = 0; i < n; i++) s += Math.exp(e * logs[i] - m);
  return (m + Math.log(s / n)) / e;
}

/** Certainty-equivalent pot of `pots` at risk aversion λ (γ = 2λ, CRRA). */
export function certaintyEquivalentPot(pots: ArrayLike<number>, lambda: number): number {
  return Math.exp(logCertaintyEquivalent(logPots(pots), lambda));
}

/** Cash flows that a certainty-equivalent pot is measured against. */
export interface ContributionSchedule {
  /** Pot at time 0. */
  initialPot: number;
  /** Contribution paid at the start of each year, in the same money as the pot (e.g. real). */
  contributions: ArrayLike<number>;
}

/**
 * The constant annual return r that turns the same contributions into `pot`:
 * initialPot (1 + r)^n + Σ_y c_y (1 + r)^(n − y) = pot, found by bracketing search on
 * r ∈ (−1, ∞). Real pots with real contributions give a real return. Returns −1 for a pot of
 * zero and null when there is nothing invested.
 */
export function ceAnnualReturn(pot: number, schedule: ContributionSchedule, timing: Timing['contributions'] = 'start-of-year'): number | null {
  let invested = schedule.initialPot;
  for (let y = 0; y < schedule.contributions.length; y++) invested += schedule.contributions[y];
  if (!(invested > 0) || !Number.isFinite(pot)) return null;
  if (pot <= 0) return -1;
  const target = Math.log(pot);
  const f = (r: number) => Math.log(accumulate(schedule.initialPot, schedule.contributions, r, timing)) - target;
  const lo = -1 + 1e-12;
  if (f(lo) >= 0) return lo;
  let hi = 1;
  while (f(hi) < 0 && hi < 1e6) hi *= 2;
  return findRoot(f, lo, hi, 1e-13);
}

/**
 * The constant real annual return (net of charges) that turns the member's contributions,
 * paid with the scenario's timing convention, into the real pot `realPot` at retirement.
 * Solved in money of the day — the nominal return R with
 *   accumulate(pot₀, nominal contributions, R, timing) = realPot × (1 + inflation)^n —
 * and converted by the Fisher relation r = (1 + R)/(1 + inflation) − 1, so instalments paid
 * part-way through a year are deflated exactly. Null when nothing is invested.
 */
export function ceRealReturn(realPot: number, timeline: MemberTimeline, timing: Timing['contributions']): number | null {
  const nominal = ceAnnualReturn(realPot * timeline.deflators[timeline.years], { initialPot: timeline.initialPot, contributions: timeline.contributions }, timing);
  if (nominal === null) return null;
  if (nominal <= -1 + 1e-12) return -1;
  return (1 + nominal) / timeline.deflators[1] - 1;
}

/** Outcome of a break-even search. */
export interface BreakEven {
  /** λ at which the two certainty-equivalent pots are equal, or null. */
  lambda: number | null;
  /** 'found'; 'none-in-range' when they never cross in the range; 'identical' when equal throughout. */
  status: 'found' | 'none-in-range' | 'identical';
}

// Grid for locating sign changes before the root search; denser near 0 where most crossings lie.
const GRID = [-5, -3, -2, -1, -0.5, 0, 0.25, 0.5, 0.75, 1, 1.5, 2, 3, 4, 6, 8, 12, 16, 24, 35, 50];

/**
 * The λ at which the certainty-equivalent pots of `potsA` and `potsB` are equal, searched in
 * [low, high] (default [−5, 50]): the difference of log CE pots is evaluated on a fixed grid
 * and the first sign change refined by bracketing search to 1e-9. If the curves cross more
 * than once the lowest crossing is returned.
 */
export function breakEvenLambda(
  potsA: ArrayLike<number>,
  potsB: ArrayLike<number>,
  range: readonly [number, number] = BREAK_EVEN_RANGE,
): BreakEven {
  const la = logPots(potsA);
  const lb = logPots(potsB);
  const f = (lambda: number) => logCertaintyEquivalent(la, lambda) - logCertaintyEquivalent(lb, lambda);
  const [low, high] = range;
  const grid = [low, ...GRID.filter((x) => x > low && x < high), high];
  const values = grid.map(f);
  const scale = (l: number) => Math.max(Math.abs(logCertaintyEquivalent(la, l)), 1);
  if (values.every((v, i) => Math.abs(v) <= 1e-13 * scale(grid[i]))) return { lambda: null, status: 'identical' };
  for (let k = 0; k < grid.length; k++) {
    if (values[k] === 0) return { lambda: grid[k], status: 'found' };
    if (k + 1 < grid.length && Number.isFinite(values[k]) && Number.isFinite(values[k + 1]) && values[k] * values[k + 1] < 0) {
      return { lambda: findRoot(f, grid[k], grid[k + 1], 1e-9), status: 'found' };
    }
  }
  return { lambda: null, status: 'none-in-range' };
}

/**
 * Board calibration: the λ (= γ/2, CRRA) at which an even-odds gamble of losing `loss` or
 * gaining `gain` on wealth `pot` is worth exactly `pot` (certainty equivalent of
 * {pot − loss, pot + gain} with probability ½ each equals pot).
 *
 * gain > loss gives λ > 0 (the board would just refuse a better gamble); gain = loss gives 0;
 * gain < loss gives λ < 0 (a board indifferent to a losing gamble is risk seeking). Searched
 * in [−50, 50]; throws a RangeError naming the problem for invalid amounts or when the answer
 * lies outside that range.
 */
export function lambdaFromGamble({ pot, loss, gain }: { pot: number; loss: number; gain: number }): number {
  if (!(pot > 0) || !Number.isFinite(pot)) throw new RangeError(`pot must be a positive number (got ${pot})`);
  if (!(loss > 0) || !(loss < pot)) throw new RangeError(`loss must be above 0 and below the pot (got ${loss})`);
  if (!(gain > 0) || !Number.isFinite(gain)) throw new RangeError(`gain must be a positive number (got ${gain})`);
  if (gain === loss) return 0;
  const logs = Float64Array.of(Math.log(pot - loss), Math.log(pot + gain));
  const target = Math.log(pot);
  const f = (lambda: number) => logCertaintyEquivalent(logs, lambda) - target;
  const [lo, hi] = gain > loss ? [0, 50] : [-50, 0];
  const flo = f(lo);
  const fhi = f(hi);
  if (!(flo * fhi <= 0)) {
    throw new RangeError(
      `no λ in [${lo}, ${hi}] makes the gamble (lose ${loss} or gain ${gain} on ${pot}) worth the pot; ` +
        (gain > loss ? 'the gain is too large relative to the loss' : 'the loss is too large relative to the gain'),
    );
  }
  return findRoot(f, lo, hi, 1e-10);
}
