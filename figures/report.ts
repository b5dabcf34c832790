import { money } from './money';
import { count, lambda as lambdaText, percent, plural } from './numbers';
import { NOT_SEPARATED_TEXT } from './comparison';
import type { RankedOption } from './ranking';

/**
 * The board report's own words: its first-page summary (the question, the key figures with
 * their uncertainty, the stress results, the main cautions) and the stressed figures beside
 * the base ones. The PDF and the stored report shown in the app both print these.
 */

/** The question the report answers. */
export function reportQuestion(p: { schemeName: string; options: number; members: number; lambda: number }): string {
  return `Which default option should ${p.schemeName} use? This report compares ${plural(p.options, 'option')} for ${plural(p.members, 'illustrative member')} by the pot each may reach at retirement in today's money, ranking them by certainty-equivalent pot at the board's risk aversion λ = ${lambdaText(p.lambda)}.`;
}

/** A CE pot with its standard error: "£182,000 ± £1,400". */
export function cePotText(r: Pick<RankedOption, 'ce'>, currency: string): string {
  return `${money(r.ce.pot, currency)}${r.ce.standardError === null ? '' : ` ± ${money(r.ce.standardError, currency, 'standardError')}`}`;
}

/** One key figure of the summary: a member's baseline with its rank, certainty equivalent, median and chance of target. */
export function baselineFigureSentence(member: string, base: RankedOption, of: number, currency: string): string {
  const a = base.pair.atRetirement;
  const se = base.pair.extraStandardErrors.probabilityReachingTarget;
  const chance = a.probabilityReachingTarget === null ? 'no income target is set' : `a chance of reaching the income target of ${percent(a.probabilityReachingTarget, 'chance')}${se === null ? '' : ` ± ${percent(se, 'chanceError')}`}`;
  return `${member}: ${base.name}, the baseline, ranks ${base.rank} of ${of}, with a certainty-equivalent pot of ${cePotText(base, currency)}, a median pot of ${money(a.percentiles.real.p50, currency)} and ${chance}.`;
}

/** The stress in words: "a 30% fall in Global equity in the year starting 5 years before retirement". */
export function stressDescription(fundName: string, fall: number, yearsBeforeRetirement: number): string {
  return `a ${percent(fall, 'share')} fall in ${fundName} in the year starting ${plural(yearsBeforeRetirement, 'year')} before retirement`;
}

/** Headings of the table of base and stressed figures side by side. */
export const STRESS_COLUMNS = [
  { key: 'option', label: 'Option' },
  { key: 'ceBase', label: 'Certainty-equivalent pot' },
  { key: 'ceStressed', label: 'with the stress' },
  { key: 'medianBase', label: 'Median pot' },
  { key: 'medianStressed', label: 'with the stress' },
  { key: 'chanceBase', label: 'Chance of target' },
  { key: 'chanceStressed', label: 'with the stress' },
] as const;
export type StressKey = (typeof STRESS_COLUMNS)[number]['key'];

/** One option's base and stressed figures as shown (each ± its standard error where it has one). */
export function stressCells(base: RankedOption, stressed: RankedOption, currency: string): Record<StressKey, string> {
  const median = (r: RankedOption) => `${money(r.pair.atRetirement.percentiles.real.p50, currency)} ± ${money(r.pair.extraStandardErrors.p50Real, currency, 'standardError')}`;
  const chance = (r: RankedOption) => {
    const p = r.pair.atRetirement.probabilityReachingTarget;
    const se = r.pair.extraStandardErrors.probabilityReachingTarget;
    return p === null ? 'no target set' : `${percent(p, 'chance')}${se === null ? '' : ` ± ${percent(se, 'chanceError')}`}`;
  };
  return {
    option: base.name,
    ceBase: cePotText(base, currency),
    ceStressed: cePotText(stressed, currency),
    medianBase: median(base),
    medianStressed: median(stressed),
    chanceBase: chance(base),
    chanceStressed: chance(stressed),
  };
}

/** The stress result of one member in a sentence, for the summary. */
export function stressSentence(member: string, rows: { base: RankedOption; stressed: RankedOption }[], currency: string): string {
  const parts = rows.map(({ base, stressed }) => `${base.name} ${money(base.ce.pot, currency)} → ${money(stressed.ce.pot, currency)}`);
  return `${member}, certainty-equivalent pot without and with the stress: ${parts.join('; ')}.`;
}

/** The main cautions of the summary page. */
export function summaryCautions(p: { paths: number; antithetic: boolean; draft: boolean; inflation: string }): string[] {
  return [
    ...(p.draft ? ['The assumptions are a DRAFT that no trustee has approved: these figures may change.'] : []),
    `Every figure comes from ${count(p.paths)} simulated market paths${p.antithetic ? ' (in antithetic pairs)' : ''} and carries Monte Carlo error, shown as ± one standard error. Where two options differ by less than two standard errors they are ${NOT_SEPARATED_TEXT}, and this report does not call either the better.`,
    `Money is in today's money (deflated by assumed inflation of ${p.inflation} a year), net of charges. The model's percentiles are not the limits of what can happen.`,
  ];
}

/** The decision, where a signed-off review that used this run has one; otherwise what the report is for. */
export function decisionSummary(d: { reviewTitle: string; signedOffOn: string; sentence: string } | null): string {
  if (!d) return 'No signed-off review has recorded a decision on this run yet: this report informs the board’s decision, it does not make it.';
  return `Decision of “${d.reviewTitle}”, signed off on ${d.signedOffOn}: ${d.sentence}`;
}

/** How the report's certainty equivalents were computed (Monte Carlo details). */
export function ceBasisText(lambda: number, runLambda: number, paths: number): string {
  return lambda === runLambda
    ? `Certainty equivalents at λ = ${lambdaText(lambda)}, the run's own, are computed from all ${count(paths)} paths.`
    : `The run used λ = ${lambdaText(runLambda)}; certainty equivalents at λ = ${lambdaText(lambda)} are computed again from every one of the ${count(paths)} paths' stored pots, exactly.`;
}

/** How the standard errors are computed (Monte Carlo details). */
export const STANDARD_ERRORS_TEXT =
  'Standard errors are antithetic-aware and computed path by path from influence functions: of the mean, the percentiles, the chance of reaching the target and the certainty-equivalent pot; differences between options are paired (every option saw the same market paths), so what the options share cancels and the standard error of the difference is what decides whether they are separated.';
