/**
 * Two functions on the hot path of format-2 projections, computed with plain arithmetic and
 * small tables (no calls into the runtime's maths library), so they are fast and give the
 * same bits on every machine.
 */

/**
 * Table-driven exponential (Tang's method, ACM TOMS 15(2), 1989): x = (k/64)·ln 2 + r with k
 * the nearest integer to 64x/ln 2 and |r| ≤ ln 2/128, e^x = 2^(k/64) · p(r), p the degree-6
 * Taylor polynomial of e^r (remainder below r⁷/7! ≈ 3e-18). 2^(k/64) comes from a table over
 * |x| ≤ 32; outside it (never reached by yearly fund returns) Math.exp is used. Relative error
 * at most a few units in the last place (a test checks 1e-15 against Math.exp).
 */
const EXP_RANGE = 32;
const EXP_STEPS = 64;
const EXP_KMAX = Math.ceil((EXP_RANGE * EXP_STEPS) / Math.LN2) + 1;
const EXP_TABLE = new Float64Array(2 * EXP_KMAX + 1);
for (let k = -EXP_KMAX; k <= EXP_KMAX; k++) EXP_TABLE[k + EXP_KMAX] = Math.pow(2, k / EXP_STEPS);
const EXP_SCALE = EXP_STEPS / Math.LN2;
/**
 * ln 2 / 64 in two parts (Cody–Waite reduction): the high part is fdlibm's ln2_hi / 64, whose
 * low 21 bits are zero, so k·LN2_HI is exact for every k used here.
 */
const LN2_HI = 0.01083042469326756;
const LN2_LO = 2.9815858269852933e-12;
/** 1.5 · 2^52: adding and subtracting it rounds a double of magnitude below 2^51 to an integer. */
const ROUND = 6755399441055744;

export function fastExp(x: number): number {
  if (!(x > -EXP_RANGE && x < EXP_RANGE)) return Math.exp(x);
  const kf = x * EXP_SCALE + ROUND - ROUND;
  const r = x - kf * LN2_HI - kf * LN2_LO;
  const p =
    1 + r * (1 + r * (0.5 + r * (0.16666666666666666 + r * (0.041666666666666664 + r * (0.008333333333333333 + r * 0.001388888888888889)))));
  return p * EXP_TABLE[(kf | 0) + EXP_KMAX];
}

/**
 * Growth of contributions spread through a year: a year's contribution paid in twelve equal
 * instalments at the end of each month, each growing by the year's net growth factor q raised
 * to the fraction of the year left, (12 − j)/12 for the instalment at the end of month j:
 *
 *   spreadGrowth(q) = (1/12) · Σ_{k=0}^{11} q^(k/12) = (q − 1) / (12 (q^(1/12) − 1))  (q ≠ 1),
 *
 * i.e. the accumulation factor s^(12) = i / i^(12) of a monthly-paid annuity of 1 a year with
 * i = q − 1 (the standard actuarial relation i^(12) = 12((1 + i)^(1/12) − 1)).
 *
 * On 0.5 ≤ q < 4 it is read from a table of cubic Taylor polynomials about the centres of
 * cells 1/256 wide (coefficients from the exact derivatives of each q^(k/12); remainder below
 * 1e-11 relative — a pot's relative error from it is smaller still, as only contributions carry
 * it); elsewhere it is summed exactly. The walk evaluates the same table inline (project.ts).
 */
const SPREAD_LOW = 0.5;
const SPREAD_HIGH = 4;
const SPREAD_CELLS_PER_UNIT = 256;
const SPREAD_CELLS = (SPREAD_HIGH - SPREAD_LOW) * SPREAD_CELLS_PER_UNIT;
/** Per cell, the four coefficients in d = (q − low)·256 − cell − ½ (powers of 1/256 folded in). */
const SPREAD_TABLE = new Float64Array(SPREAD_CELLS * 4);
for (let cell = 0; cell < SPREAD_CELLS; cell++) {
  const centre = SPREAD_LOW + (cell + 0.5) / SPREAD_CELLS_PER_UNIT;
  for (let m = 0; m <= 3; m++) {
    // m-th Taylor coefficient: (1/12) Σ_k C(a_k, m) · centre^(a_k − m), a_k = k/12.
    let s = 0;
    for (let k = 0; k < 12; k++) {
      const a = k / 12;
      let binom = 1;
      for (let t = 0; t < m; t++) binom = (binom * (a - t)) / (t + 1);
      s += binom * Math.pow(centre, a - m);
    }
    SPREAD_TABLE[cell * 4 + m] = (s / 12) * Math.pow(1 / SPREAD_CELLS_PER_UNIT, m);
  }
}

/** The exact sum (1/12) Σ_{k=0}^{11} y^k with y = q^(1/12), by Horner's rule. */
export function spreadGrowthExact(q: number): number {
  if (!(q > 0)) return q === 0 ? 1 / 12 : Number.NaN;
  const y = Math.pow(q, 1 / 12);
  let s = 1;
  for (let k = 0; k < 11; k++) s = s * y + 1;
  return s / 12;
}

/** The table behind spreadGrowth, for loops that evaluate it inline (see project.ts). */
export const SPREAD = { table: SPREAD_TABLE, low: SPREAD_LOW, high: SPREAD_HIGH, cellsPerUnit: SPREAD_CELLS_PER_UNIT } as const;

export function spreadGrowth(q: number): number {
  if (!(q >= SPREAD_LOW && q < SPREAD_HIGH)) return spreadGrowthExact(q);
  const t = SPREAD_TABLE;
  const u = (q - SPREAD_LOW) * SPREAD_CELLS_PER_UNIT;
  const cell = u | 0;
  const d = u - cell - 0.5;
  const o = cell << 2;
  return t[o] + t[o + 1] * d + d * d * (t[o + 2] + t[o + 3] * d);
}
