import { money } from './money';
import { ordinal, percent } from './numbers';

/**
 * The words beside charts: titles' units, legends and each chart's key figures as text (its
 * text alternative), shared by the screen and the PDFs.
 */

/** The unit of a money axis: "Pot (GBP, today's money)". */
export function potAxisLabel(currency: string, realTerms = true): string {
  return `Pot (${currency}, ${realTerms ? "today's money" : 'money of the day'})`;
}

/** Percentile bands a fan chart draws: the outer (lightest) and inner bands, and their legend labels. */
export const FAN_BANDS = { outer: [5, 95], inner: [25, 75] } as const;
export const FAN_LEGEND = {
  outer: `${ordinal(FAN_BANDS.outer[0])}–${ordinal(FAN_BANDS.outer[1])} percentile`,
  inner: `${ordinal(FAN_BANDS.inner[0])}–${ordinal(FAN_BANDS.inner[1])} percentile`,
  median: 'Median',
  target: 'Pot for the income target',
} as const;

/** A fan chart's key figures in one sentence: at retirement, the median and the bands, and the target. */
export function fanChartSummary(f: { title: string; ages: number[]; bands: Record<string, number[]>; target?: number | null; currency: string; realTerms: boolean }): string {
  const last = f.ages.length - 1;
  const at = (p: number) => money(f.bands[`p${p}`]?.[last], f.currency);
  const [o1, o2] = FAN_BANDS.outer;
  const [i1, i2] = FAN_BANDS.inner;
  const unit = f.realTerms ? "today's money" : 'money of the day';
  return (
    `${f.title}. At age ${f.ages[last]}: median ${at(50)}, ` +
    `half of outcomes between ${at(i1)} and ${at(i2)}, ` +
    `nine in ten between ${at(o1)} and ${at(o2)} (${unit})` +
    (f.target ? `; the income target needs ${money(f.target, f.currency)}.` : '.')
  );
}

/** A glide path's mix at some years to retirement: "15 years to retirement: Global Equity 100%". */
export function glideMixText(yearsToRetirement: number, parts: { name: string; weight: number }[]): string {
  const shown = parts.filter((p) => p.weight > 1e-9);
  return `${yearsToRetirement} ${yearsToRetirement === 1 ? 'year' : 'years'} to retirement: ${shown.map((p) => `${p.name} ${percent(p.weight, 'share')}`).join(', ')}`;
}
