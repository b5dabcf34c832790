import { findRoot } from './roots';
import { influenceStandardError, logCeInfluence } from './uncertainty';
import { BREAK_EVEN_RANGE } from './utility';

/**
 * Every λ in [−5, 50] at which two options' certainty-equivalent pots are equal.
 *
 * 1. Scan. For each option the curve ln CE(λ) and its slope are computed on a grid (step 0.5
 *    up to λ = 10, then 2) from all the paths. With e = 1 − 2λ and dᵢ = ln Wᵢ − ref,
 *      ln CE = ref + K(e)/e,  K(e) = ln mean exp(e dᵢ),  d ln CE/dλ = −2 (K′(e)/e − K(e)/e²),
 *    K′ = Σ dᵢ exp(e dᵢ) / Σ exp(e dᵢ). On a run of equal e-steps exp(e dᵢ) is carried forward
 *    by one multiplication per path (exp((e + Δ)dᵢ) = exp(e dᵢ)·exp(Δ dᵢ)), walking away from
 *    e = 0 so the terms only shrink (ref = the largest log pot for e > 0, the smallest for e < 0).
 * 2. Bracket. With f = ln CE_A − ln CE_B: a sign change of f between grid points brackets one
 *    crossing; where f keeps its sign but its slope changes sign, the extremum is found (root
 *    of f′) and, if f changes sign there, the cell holds two crossings.
 * 3. Refine each bracket by Newton steps on f and f′ computed exactly from every path (not from
 *    the grid), from the cubic through the scan's values and slopes, kept inside the bracket (a
 *    bisection when a step would leave it), until a step is below 1e-6 (error of order 1e-12).
 * 4. Standard error of each crossing by the delta method: λ* solves f(λ) = 0, so
 *    SE(λ*) ≈ SE(f̂(λ*)) / |f′(λ*)|, SE(f̂) from the paired influence values of ln CE_A − ln CE_B
 *    (uncertainty.ts), antithetic-aware; the interval is λ* ± 1.96 SE.
 */

/** The scan grid: −5 … 10 by 0.5, then 12 … 50 by 2 (51 points). */
export const SCAN_GRID: readonly number[] = (() => {
  const grid: number[] = [];
  for (let k = 0; k <= 30; k++) grid.push(-5 + k * 0.5);
  for (let l = 12; l <= 50; l += 2) grid.push(l);
  return grid;
})();

/** ln CE and its slope in λ on {@link SCAN_GRID}. */
export interface CeCurve {
  logCe: Float64Array;
  slope: Float64Array;
}

/** The smallest and largest finite log pot, and whether any pot is zero (log −∞): one pass. */
function logRange(logs: Float64Array): { hasZero: boolean; lo: number; hi: number } {
  let hasZero = false;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < logs.length; i++) {
    const l = logs[i];
    if (l === -Infinity) hasZero = true;
    else {
      if (l < lo) lo = l;
      if (l > hi) hi = l;
    }
  }
  return { hasZero, lo, hi };
}

/** ln CE(λ) and d ln CE/dλ computed directly from log pots (2 passes, one exp per path). */
export function logCeWithSlope(logs: Float64Array, lambda: number): { value: number; slope: number } {
  const n = logs.length;
  const e = 1 - 2 * lambda;
  const { hasZero, lo, hi } = logRange(logs);
  if (lo === Infinity) return { value: -Infinity, slope: 0 };
  if (Math.abs(e) < 1e-9) {
    if (hasZero) return { value: -Infinity, slope: 0 };
    let s = 0;
    for (let i = 0; i < n; i++) s += logs[i];
    const m = s / n;
    let v = 0;
    for (let i = 0; i < n; i++) v += (logs[i] - m) ** 2;
    return { value: m, slope: -v / n }; // d/dλ = −2·d/de and K″(0)/2 = variance/2
  }
  if (e < 0 && hasZero) return { value: -Infinity, slope: 0 };
  const ref = e > 0 ? hi : lo;
  let s0 = 0;
  let s1 = 0;
  for (let i = 0; i < n; i++) {
    const d = logs[i] - ref;
    if (d === -Infinity) continue;
    const v = Math.exp(e * d);
    s0 += v;
    s1 += d * v;
  }
  const k = Math.log(s0 / n);
  return { value: ref + k / e, slope: -2 * (s1 / s0 / e - k / (e * e)) };
}

/** ln CE and slope on {@link SCAN_GRID}, by the multiplicative scan described above. */
export function ceCurve(logs: Float64Array): CeCurve {
  const G = SCAN_GRID.length;
  const logCe = new Float64Array(G);
  const slope = new Float64Array(G);
  const n = logs.length;
  const { hasZero, lo, hi } = logRange(logs);
  const half = SCAN_GRID.indexOf(0.5);
  const at = logCeWithSlope(logs, 0.5);
  logCe[half] = at.value;
  slope[half] = at.slope;
  const d = new Float64Array(n);
  const v = new Float64Array(n);
  const r = new Float64Array(n);
  const s0 = new Float64Array(4);
  const s1 = new Float64Array(4);
  // Runs of equal steps, each walked away from λ = ½: [from, to] as grid indices.
  const runs: [number, number][] = [
    [half - 1, 0],
    [half + 1, SCAN_GRID.indexOf(10)],
    [SCAN_GRID.indexOf(12), G - 1],
  ];
  // After a run, v holds exp(e·d) at eNext (one step past its last point), r = exp(Δe·d).
  let previous: { ref: number; eNext: number; de: number } | null = null;
  for (const [from, to] of runs) {
    const step = from <= to ? 1 : -1;
    const e0 = 1 - 2 * SCAN_GRID[from];
    if (lo === Infinity || (e0 < 0 && hasZero)) {
      for (let k = from; k !== to + step; k += step) {
        logCe[k] = -Infinity;
        slope[k] = 0;
      }
      previous = null;
      continue;
    }
    const de = from === to ? 0 : 1 - 2 * SCAN_GRID[from + step] - e0;
    const ref = e0 > 0 ? hi : lo;
    const gap = previous && previous.ref === ref ? (e0 - previous.eNext) / previous.de : -1;
    const ratio = previous ? de / previous.de : 0;
    if (previous && Number.isInteger(gap) && gap >= 0 && Number.isInteger(ratio) && ratio >= 1) {
      // Continue from the previous run (same reference): v·r^gap, then r^ratio — no exp.
      for (let i = 0; i < n; i++) {
        const ri = r[i];
        let vi = v[i];
        for (let t = 0; t < gap; t++) vi *= ri;
        let rn = ri;
        for (let t = 1; t < ratio; t++) rn *= ri;
        v[i] = vi;
        r[i] = rn;
      }
    } else {
      for (let i = 0; i < n; i++) {
        const di = logs[i] - ref;
        // A zero pot (ln = −∞) adds nothing for e > 0: weight 0, and d = 0 keeps d·weight at 0.
        d[i] = di === -Infinity ? 0 : di;
        r[i] = di === -Infinity ? 0 : Math.exp(de * di);
        // A run that starts one step from e = 0 starts at r itself.
        v[i] = di === -Infinity ? 0 : e0 === de ? r[i] : Math.exp(e0 * di);
      }
    }
    // Up to four grid points per pass over the paths (fewer passes, independent sums).
    for (let k = from; k !== to + step; ) {
      let m = 0;
      while (m < 4 && k + m * step !== to + step) m++;
      sums4(d, v, r, m, s0, s1);
      for (let t = 0; t < m; t++, k += step) {
        const e = 1 - 2 * SCAN_GRID[k];
        const kk = Math.log(s0[t] / n);
        logCe[k] = ref + kk / e;
        slope[k] = -2 * (s1[t] / s0[t] / e - kk / (e * e));
      }
    }
    previous = { ref, eNext: 1 - 2 * SCAN_GRID[to] + de, de };
  }
  return { logCe, slope };
}

/**
 * For t < m: s0[t] = Σᵢ vᵢ rᵢ^t and s1[t] = Σᵢ dᵢ vᵢ rᵢ^t; then vᵢ ← vᵢ rᵢ^m (the next pass starts
 * m grid points further on).
 */
function sums4(d: Float64Array, v: Float64Array, r: Float64Array, m: number, s0: Float64Array, s1: Float64Array): void {
  const n = v.length;
  let a0 = 0;
  let a1 = 0;
  let a2 = 0;
  let a3 = 0;
  let b0 = 0;
  let b1 = 0;
  let b2 = 0;
  let b3 = 0;
  for (let i = 0; i < n; i++) {
    const ri = r[i];
    const di = d[i];
    const v0 = v[i];
    const v1 = v0 * ri;
    const v2 = v1 * ri;
    const v3 = v2 * ri;
    a0 += v0;
    b0 += di * v0;
    a1 += v1;
    b1 += di * v1;
    a2 += v2;
    b2 += di * v2;
    a3 += v3;
    b3 += di * v3;
    v[i] = m === 4 ? v3 * ri : m === 3 ? v3 : m === 2 ? v2 : v1;
  }
  s0[0] = a0;
  s0[1] = a1;
  s0[2] = a2;
  s0[3] = a3;
  s1[0] = b0;
  s1[1] = b1;
  s1[2] = b2;
  s1[3] = b3;
}

/** One crossing of two options' certainty-equivalent pots. */
export interface Crossing {
  lambda: number;
  /** Delta-method standard error of λ (null when it cannot be estimated, e.g. a touching point). */
  standardError: number | null;
  /** λ ± 1.96 standard errors (null with the standard error). */
  interval: [number, number] | null;
  /** Which option has the higher certainty equivalent just above this λ. */
  favouredAbove: 'A' | 'B';
}

export interface Crossings {
  status: 'found' | 'none-in-range' | 'identical';
  crossings: Crossing[];
}

/**
 * A first guess at the root in [a, b] from the cubic Hermite interpolant of f and f′ at both
 * ends (scan values): a few bisections of the cubic, then the secant if that fails.
 */
function hermiteRoot(a: number, b: number, fa: number, fb: number, sa: number, sb: number): number {
  const h = b - a;
  const cubic = (x: number) => {
    const t = (x - a) / h;
    const t2 = t * t;
    const t3 = t2 * t;
    return (2 * t3 - 3 * t2 + 1) * fa + (t3 - 2 * t2 + t) * h * sa + (-2 * t3 + 3 * t2) * fb + (t3 - t2) * h * sb;
  };
  let lo = a;
  let hi = b;
  for (let k = 0; k < 40; k++) {
    const mid = (lo + hi) / 2;
    if (cubic(mid) * fa > 0) lo = mid;
    else hi = mid;
  }
  const x = (lo + hi) / 2;
  return x > a && x < b ? x : a - (fa * (b - a)) / (fb - fa);
}

/**
 * The root of f in [a, b] (f(a), f(b) of opposite signs) by Newton steps with the exact slope,
 * bisecting whenever a step would leave the bracket; to 1e-10 in λ. Usually 3–4 evaluations.
 */
function newtonInBracket(
  exact: (l: number) => { f: number; slope: number },
  a: number,
  b: number,
  fa: number,
  fb: number,
  sa?: number,
  sb?: number,
): { lambda: number; slope: number } {
  let lo = a;
  let hi = b;
  const rising = fb > fa;
  let x = sa !== undefined && sb !== undefined ? hermiteRoot(a, b, fa, fb, sa, sb) : a - (fa * (b - a)) / (fb - fa);
  let last = { f: Number.NaN, slope: Number.NaN };
  for (let k = 0; k < 100; k++) {
    last = exact(x);
    const { f, slope } = last;
    if (f === 0) return { lambda: x, slope };
    if (f > 0 === rising) hi = x;
    else lo = x;
    const newton = x - f / slope;
    const inside = newton > lo && newton < hi;
    const next = inside ? newton : (lo + hi) / 2;
    // Newton converges quadratically: after a step below 1e-6 the error is of order 1e-12.
    if ((inside && Math.abs(next - x) < 1e-6) || hi - lo < 1e-10) return { lambda: next, slope };
    x = next;
  }
  return { lambda: x, slope: last.slope };
}

/** Every crossing of options A and B in [−5, 50] (see the module comment). */
export function findCrossings(
  logsA: Float64Array,
  logsB: Float64Array,
  curveA: CeCurve,
  curveB: CeCurve,
  antithetic: boolean,
): Crossings {
  const G = SCAN_GRID.length;
  const f = new Float64Array(G);
  const fp = new Float64Array(G);
  let identical = true;
  for (let k = 0; k < G; k++) {
    const a = curveA.logCe[k];
    const b = curveB.logCe[k];
    f[k] = a === b ? 0 : a - b; // both −∞ counts as equal
    fp[k] = curveA.slope[k] - curveB.slope[k];
    if (Math.abs(f[k]) > 1e-13 * Math.max(Math.abs(a), 1) || !Number.isFinite(f[k])) identical = false;
  }
  if (identical) return { status: 'identical', crossings: [] };
  const exact = (lambda: number) => {
    const a = logCeWithSlope(logsA, lambda);
    const b = logCeWithSlope(logsB, lambda);
    return { f: a.value === b.value ? 0 : a.value - b.value, slope: a.slope - b.slope };
  };
  const F = (lambda: number) => exact(lambda).f;
  const found: { lambda: number; slope: number }[] = [];
  const [low, high] = BREAK_EVEN_RANGE;
  for (let k = 0; k + 1 < G; k++) {
    const a = SCAN_GRID[k];
    const b = SCAN_GRID[k + 1];
    if (a < low || b > high || !Number.isFinite(f[k]) || !Number.isFinite(f[k + 1])) continue;
    if (f[k] === 0) found.push({ lambda: a, slope: fp[k] });
    else if (f[k + 1] === 0) found.push({ lambda: b, slope: fp[k + 1] });
    else if (f[k] * f[k + 1] < 0) found.push(newtonInBracket(exact, a, b, f[k], f[k + 1], fp[k], fp[k + 1]));
    else if (fp[k] * fp[k + 1] < 0 && f[k] * fp[k] < 0) {
      // f moves towards zero and turns back inside the cell: look at the turning point.
      const slope = (l: number) => exact(l).slope;
      if (slope(a) * slope(b) >= 0) continue;
      const turn = findRoot(slope, a, b, 1e-10);
      const atTurn = F(turn);
      if (atTurn === 0) found.push({ lambda: turn, slope: 0 });
      else if (atTurn * f[k] < 0) found.push(newtonInBracket(exact, a, turn, f[k], atTurn), newtonInBracket(exact, turn, b, atTurn, f[k + 1]));
    }
  }
  const roots = found.sort((x, y) => x.lambda - y.lambda).filter((x, i, all) => i === 0 || x.lambda - all[i - 1].lambda > 1e-8);
  if (roots.length === 0) return { status: 'none-in-range', crossings: [] };
  const psiA = new Float64Array(logsA.length);
  const psiB = new Float64Array(logsB.length);
  const crossings = roots.map(({ lambda, slope }): Crossing => {
    logCeInfluence(logsA, lambda, psiA);
    logCeInfluence(logsB, lambda, psiB);
    for (let i = 0; i < psiA.length; i++) psiA[i] -= psiB[i];
    const seF = influenceStandardError(psiA, antithetic);
    const se = seF !== null && slope !== 0 && Number.isFinite(slope) ? seF / Math.abs(slope) : null;
    let favouredAbove: 'A' | 'B' = slope > 0 ? 'A' : 'B';
    if (slope === 0) favouredAbove = F(lambda + 1e-6) > 0 ? 'A' : 'B';
    return { lambda, standardError: se, interval: se === null ? null : [lambda - 1.96 * se, lambda + 1.96 * se], favouredAbove };
  });
  return { status: 'found', crossings };
}
