import { SHORTFALL_LEVEL } from '../simulation';
import { money, moneyChange } from './money';
import { count, lambda as lambdaText, percent, percentagePoints } from './numbers';
import type { OptionDifference, RankedOption } from './ranking';

/**
 * The comparison of options, cell by cell: the column names and every figure as shown, with its
 * standard error where it has one, and the exact value behind it. The comparison screen, the
 * board report (PDF and the copy shown in the app) and its CSV all read these, so a figure and
 * its heading are worded and rounded the same everywhere. Money is real (today's money).
 */
export const COMPARISON_KEYS = [
  'certaintyEquivalentPot',
  'certaintyEquivalentReturn',
  'medianReal',
  'p5Real',
  'probabilityReachingTarget',
  'expectedShortfallReal',
  'meanReal',
  'medianRealIncome',
] as const;
export type ComparisonKey = (typeof COMPARISON_KEYS)[number];

export type ComparisonColumn = { key: ComparisonKey; label: string; /** CSV column stem; exports add _exact / _as_shown. */ csv: string };

/** One cell: the text as shown, "± …" (one standard error) or null, and the exact value. */
export type ComparisonCell = { text: string; standardError: string | null; exact: number | null; exactStandardError: number | null };

export function comparisonColumns(lambda: number): ComparisonColumn[] {
  const worst = percent(SHORTFALL_LEVEL, 'chance');
  const labels: Record<ComparisonKey, [string, string]> = {
    certaintyEquivalentPot: [`Certainty-equivalent pot (λ = ${lambdaText(lambda)})`, 'certainty_equivalent_real_pot'],
    certaintyEquivalentReturn: ['Certainty-equivalent real return a year', 'certainty_equivalent_real_return'],
    medianReal: ['Median pot', 'real_pot_median'],
    p5Real: ['5th percentile pot', 'real_pot_p5'],
    probabilityReachingTarget: ['Chance of reaching the income target', 'probability_reaching_target'],
    expectedShortfallReal: [`Average of the worst ${worst} of pots`, 'expected_shortfall_real'],
    meanReal: ['Mean pot', 'real_pot_mean'],
    medianRealIncome: ['Median income a year', 'real_income_median'],
  };
  return COMPARISON_KEYS.map((key) => ({ key, label: labels[key][0], csv: labels[key][1] }));
}

const pm = (s: string | null) => (s === null || s === '—' ? null : `± ${s}`);
const finite = (x: number | null | undefined) => (x !== null && x !== undefined && Number.isFinite(x) ? x : null);

/** Every figure of one ranked option. */
export function comparisonCells(r: RankedOption, currency: string): Record<ComparisonKey, ComparisonCell> {
  const a = r.pair.atRetirement;
  const se = r.pair.extraStandardErrors;
  const pot = (exact: number, exactSe: number | null = null): ComparisonCell => ({
    text: money(exact, currency, 'pot'),
    standardError: exactSe === null ? null : pm(money(exactSe, currency, 'standardError')),
    exact,
    exactStandardError: finite(exactSe),
  });
  return {
    certaintyEquivalentPot: pot(r.ce.pot, finite(r.ce.standardError)),
    certaintyEquivalentReturn: { text: percent(r.ce.annualReturn, 'return'), standardError: null, exact: r.ce.annualReturn, exactStandardError: null },
    medianReal: pot(a.percentiles.real.p50, se.p50Real),
    p5Real: pot(a.percentiles.real.p5, se.p5Real),
    probabilityReachingTarget: {
      text: percent(a.probabilityReachingTarget, 'chance'),
      standardError: pm(percent(se.probabilityReachingTarget, 'chanceError')),
      exact: a.probabilityReachingTarget,
      exactStandardError: finite(se.probabilityReachingTarget),
    },
    expectedShortfallReal: pot(a.expectedShortfall.real),
    meanReal: pot(a.mean.real, a.standardError.real),
    medianRealIncome: { text: money(a.realIncome.p50, currency, 'income'), standardError: null, exact: a.realIncome.p50, exactStandardError: null },
  };
}

/**
 * An option against the baseline in one sentence, e.g. "Cautious glide against Long-horizon
 * growth: certainty-equivalent pot −£3,000, median pot −£5,000, 5th percentile pot +£2,000,
 * chance of reaching the income target −4 percentage points." A difference within sampling
 * error (when the run provides its standard error) is said to be so.
 */
export function differenceSentence(d: OptionDifference, baselineName: string, currency: string): string {
  const note = (x: OptionDifference['ce']) =>
    x.tooCloseToCall ? ` (within sampling error${x.pathsToSeparate ? `; about ${count(x.pathsToSeparate)} paths would separate it` : ''})` : '';
  const parts = [
    `certainty-equivalent pot ${moneyChange(d.ce.value, currency)}${note(d.ce)}`,
    `median pot ${moneyChange(d.median.value, currency)}${note(d.median)}`,
    `5th percentile pot ${moneyChange(d.p5.value, currency)}${note(d.p5)}`,
    ...(d.chance ? [`chance of reaching the income target ${percentagePoints(d.chance.value, 'chance')}${note(d.chance)}`] : []),
  ];
  return `${d.name} against ${baselineName}: ${parts.join(', ')}.`;
}

/**
 * Whether the top two options are separated by more than sampling error, in words; null when
 * the run gives no standard error for their difference.
 */
export function separationSentence(top: RankedOption, d: OptionDifference | undefined): string | null {
  if (!d || d.ce.tooCloseToCall === null) return null;
  return d.ce.tooCloseToCall
    ? `${top.name} and ${d.name} are not separated by more than the Monte Carlo sampling error: neither should be called the better on this run.`
    : `${top.name} leads ${d.name} by more than the Monte Carlo sampling error.`;
}

/** What a comparison says about its baseline, on screen and in the board report. */
export function baselineSentence(o: { name: string } | undefined, currentDefaultId: string | null | undefined): string {
  if (o) return `${o.name} was the scheme's current default when this run was made: it is shown first, as the baseline, with its rank; differences are measured from it.`;
  return currentDefaultId
    ? "The scheme's current default when this run was made is not among its options: differences are measured from the top-ranked option."
    : 'No option was marked as the current default when this run was made: differences are measured from the top-ranked option.';
}
