import { SHORTFALL_LEVEL } from '../simulation';
import { money, moneyChange } from './money';
import { count, lambda as lambdaText, ordinal, percent, percentagePoints, pointsError } from './numbers';
import type { Difference, OptionDifference, RankedOption } from './ranking';

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
      text: a.probabilityReachingTarget === null ? NO_TARGET_TEXT : percent(a.probabilityReachingTarget, 'chance'),
      standardError: pm(percent(se.probabilityReachingTarget, 'chanceError')),
      exact: a.probabilityReachingTarget,
      exactStandardError: finite(se.probabilityReachingTarget),
    },
    expectedShortfallReal: pot(a.expectedShortfall.real),
    meanReal: pot(a.mean.real, a.standardError.real),
    medianRealIncome: { text: money(a.realIncome.p50, currency, 'income'), standardError: null, exact: a.realIncome.p50, exactStandardError: null },
  };
}

// ---- Separation: whether the simulation noise can tell two options apart -----------------

/** The mark of a ranked option whose certainty-equivalent lead over the next is within 2 standard errors. */
export const TOO_CLOSE_TEXT = 'too close to call at this number of paths';
/** How a difference inside the noise is described wherever a winner would otherwise be named. */
export const NOT_SEPARATED_TEXT = 'not separated by the simulation noise';
/** A chance-of-target figure when the run has no income target (a target of 0). */
export const NO_TARGET_TEXT = 'no target set';

type Separable = { tooCloseToCall: boolean | null; pathsToSeparate?: number | null };

/** "about 26,000 paths would separate them", or null when the estimate is not known. */
export function pathsToSeparateText(d: Separable): string | null {
  return d.pathsToSeparate ? `about ${count(d.pathsToSeparate)} paths would separate them` : null;
}

/**
 * The mark beside a ranked option whose lead over the next option down is within 2 standard
 * errors: "Too close to call at this number of paths: about 26,000 paths would separate them."
 * Null when the lead is separated (or has no standard error).
 */
export function tooCloseNote(d: Separable | null | undefined): string | null {
  if (!d?.tooCloseToCall) return null;
  const paths = pathsToSeparateText(d);
  return `${TOO_CLOSE_TEXT[0].toUpperCase()}${TOO_CLOSE_TEXT.slice(1)}${paths ? `: ${paths}` : ''}.`;
}

/** Heading of the column that gives each ranked option's certainty-equivalent lead over the next one down. */
export const LEAD_COLUMN_LABEL = 'Ahead of the next-ranked option';

/** The lead cell of a ranked option: "+£1,000", "± £900" and the too-close mark; null for the last. */
export function leadCell(
  r: Pick<RankedOption, 'toNext'>,
  currency: string,
): { text: string; standardError: string | null; mark: string | null; exact: number; exactStandardError: number | null } | null {
  const d = r.toNext;
  if (!d) return null;
  return {
    text: moneyChange(d.value, currency),
    standardError: d.standardError === null ? null : `± ${money(d.standardError, currency, 'standardError')}`,
    mark: d.tooCloseToCall ? TOO_CLOSE_TEXT : null,
    exact: d.value,
    exactStandardError: d.standardError,
  };
}

/**
 * One line per ranked option too close to the next one down to call, e.g. "Balanced lifecycle
 * (1st) and Steady growth (2nd): too close to call at this number of paths; about 26,000 paths
 * would separate them." Empty when every lead is separated.
 */
export function tooCloseLines(ranked: RankedOption[]): string[] {
  return ranked.flatMap((r, i) => {
    const next = ranked[i + 1];
    if (!next || !r.toNext?.tooCloseToCall) return [];
    const paths = pathsToSeparateText(r.toNext);
    return [`${r.name} (${ordinal(r.rank)}) and ${next.name} (${ordinal(next.rank)}): ${TOO_CLOSE_TEXT}${paths ? `; ${paths}` : ''}.`];
  });
}

/** One difference to the baseline as shown: the signed figure, "± …" and whether it is inside the noise. */
export type DifferenceCell = { text: string; standardError: string | null; tooCloseToCall: boolean | null; exact: number | null; exactStandardError: number | null };

function moneyDifferenceCell(d: Difference, currency: string): DifferenceCell {
  return {
    text: moneyChange(d.value, currency),
    standardError: d.standardError === null ? null : `± ${money(d.standardError, currency, 'standardError')}`,
    tooCloseToCall: d.tooCloseToCall,
    exact: d.value,
    exactStandardError: d.standardError,
  };
}

/** The three differences to the baseline the comparison shows: CE, median pot and chance of target, each ± its standard error. */
export function differenceCells(d: OptionDifference, currency: string): { ce: DifferenceCell; median: DifferenceCell; chance: DifferenceCell } {
  const chance: DifferenceCell = d.chance
    ? {
        text: percentagePoints(d.chance.value, 'chance'),
        standardError: d.chance.standardError === null ? null : `± ${pointsError(d.chance.standardError)}`,
        tooCloseToCall: d.chance.tooCloseToCall,
        exact: d.chance.value,
        exactStandardError: d.chance.standardError,
      }
    : { text: NO_TARGET_TEXT, standardError: null, tooCloseToCall: null, exact: null, exactStandardError: null };
  return { ce: moneyDifferenceCell(d.ce, currency), median: moneyDifferenceCell(d.median, currency), chance };
}

/** The rows of the differences-to-baseline table, as the screen and the board report show them. */
export function differenceRows(ds: OptionDifference[], currency: string): { optionId: string; option: string; ce: DifferenceCell; median: DifferenceCell; chance: DifferenceCell }[] {
  return ds.map((d) => ({ optionId: d.optionId, option: d.name, ...differenceCells(d, currency) }));
}

/** Said where a run stored before every path's pot was kept is shown: its figures exist at its own λ only. */
export function onlyOwnLambdaText(runLambda: number): string {
  return `This run was stored before every path's pot was kept, so its exact figures exist only at its own λ = ${lambdaText(runLambda)}. Run it again to compare the options at another λ.`;
}

/** Headings of the differences-to-baseline table, as the screen and the PDF print them. */
export function differenceColumns(baselineName: string): { key: 'option' | 'ce' | 'median' | 'chance'; label: string }[] {
  return [
    { key: 'option', label: `Option, against ${baselineName}` },
    { key: 'ce', label: 'Certainty-equivalent pot' },
    { key: 'median', label: 'Median pot' },
    { key: 'chance', label: 'Chance of reaching the income target' },
  ];
}

/**
 * An option against the baseline in one sentence, e.g. "Cautious glide against Long-horizon
 * growth: certainty-equivalent pot −£3,000 ± £1,200, median pot −£5,000 ± £2,100, chance of
 * reaching the income target −4 percentage points ± 1.1." A difference within 2 standard errors
 * is said to be not separated by the simulation noise.
 */
export function differenceSentence(d: OptionDifference, baselineName: string, currency: string): string {
  const cells = differenceCells(d, currency);
  const note = (x: DifferenceCell) => {
    if (!x.tooCloseToCall) return '';
    return ` (${NOT_SEPARATED_TEXT})`;
  };
  const shown = (x: DifferenceCell) => `${x.text}${x.standardError ? ` ${x.standardError}` : ''}${note(x)}`;
  const parts = [
    `certainty-equivalent pot ${shown(cells.ce)}`,
    `median pot ${shown(cells.median)}`,
    d.chance ? `chance of reaching the income target ${shown(cells.chance)}` : `chance of reaching the income target: ${NO_TARGET_TEXT}`,
  ];
  return `${d.name} against ${baselineName}: ${parts.join(', ')}.`;
}

/**
 * What the ranking says about the top option, never naming a winner inside the noise: when its
 * certainty-equivalent lead over the next is within 2 standard errors (or has none), the two
 * are "not separated by the simulation noise"; otherwise it leads, by how much ± SE. Null with one option.
 */
export function leadSentence(ranked: RankedOption[], currency: string, paths: number): string | null {
  const [top, next] = ranked;
  if (!top?.toNext || !next) return null;
  const d = top.toNext;
  const by = `${money(d.value, currency)}${d.standardError === null ? '' : ` ± ${money(d.standardError, currency, 'standardError')}`}`;
  if (d.tooCloseToCall === false) return `${top.name} has the highest certainty-equivalent pot, ahead of ${next.name} by ${by}: more than twice the Monte Carlo standard error.`;
  if (d.tooCloseToCall === null) return `${top.name} and ${next.name} differ by ${by} in certainty-equivalent pot; this run gives no standard error for the difference, so neither is called the better.`;
  const more = pathsToSeparateText(d);
  return `${top.name} and ${next.name} are ${NOT_SEPARATED_TEXT}: their certainty-equivalent pots differ by ${by} at ${count(paths)} paths${more ? ` (${more})` : ''}, so neither should be called the better on this run.`;
}

/** What a comparison says about its baseline, on screen and in the board report. */
export function baselineSentence(o: { name: string } | undefined, currentDefaultId: string | null | undefined): string {
  if (o) return `${o.name} was the scheme's current default when this run was made: it is shown first, as the baseline, with its rank; differences are measured from it.`;
  return currentDefaultId
    ? "The scheme's current default when this run was made is not among its options: differences are measured from the top-ranked option."
    : 'No option was marked as the current default when this run was made: differences are measured from the top-ranked option.';
}
