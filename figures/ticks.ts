import { scaleLinear } from 'd3-scale';
import { compactMoney } from './money';
import { percent } from './numbers';

/**
 * Axis ticks for every chart, on screen and in PDFs, from d3-scale's `nice` and `ticks`
 * (round steps of 1, 2 or 5 × 10ᵏ), so the two draw the same axes for the same figures.
 */
export type Axis = { min: number; max: number; ticks: number[]; label: (v: number) => string };

/** A money axis from 0 to at least `max`, extended to a round top: ticks £0, £200k, … */
export function moneyAxis(max: number, currency: string, count = 5): Axis {
  const top = max > 0 && Number.isFinite(max) ? max : 1;
  const scale = scaleLinear().domain([0, top]).nice(count);
  const [min, niceMax] = scale.domain();
  return { min, max: niceMax, ticks: scale.ticks(count), label: (v) => compactMoney(v, currency) };
}

/** A plain axis over [lo, hi] extended to round ends, labelled with just enough decimals (0.8, 1.0, 1.2). */
export function valueAxis(lo: number, hi: number, count = 4): Axis {
  const scale = scaleLinear()
    .domain(lo === hi ? [lo - 1, hi + 1] : [lo, hi])
    .nice(count);
  const [min, max] = scale.domain();
  const format = scale.tickFormat(count);
  return { min, max, ticks: scale.ticks(count), label: (v) => format(v).replace('-', '−') };
}

/** A share axis from 0% to 100% in quarters. */
export function shareAxis(): Axis {
  const scale = scaleLinear().domain([0, 1]);
  return { min: 0, max: 1, ticks: scale.ticks(4), label: (v) => percent(v, 'share') };
}

/**
 * Whole-number ticks over [lo, hi] (ages, years to retirement): round values from d3's ticks,
 * never fractions; the ends are not added.
 */
export function wholeTicks(lo: number, hi: number, count = 6): number[] {
  if (!(hi > lo)) return [lo];
  return scaleLinear()
    .domain([lo, hi])
    .ticks(count)
    .filter((t) => Number.isInteger(t));
}
