import { CAUTION_TEXT } from './caution';
import { money, moneyRoundingNote, roundMoney } from './money';
import { count, percent } from './numbers';

/**
 * Member statements in plain words. Everything a member reads is built here from exact figures,
 * rounded by the pot and income rules of figures/money.ts (the same rules as every screen and
 * PDF); the PDF, the CSV, the preview on screen and the tests all read this.
 */

/** Which percentiles of the projected pot are called weak, typical and strong. */
export const STATEMENT_PERCENTILES = { weak: 10, typical: 50, strong: 90 } as const;

/** The changes a statement shows the effect of. */
export const WHAT_IF = { extraContribution: 0.02, laterYears: 2 } as const;

/** Largest number of paths used for a statement's what-if figures and for membership statements. */
export const STATEMENT_MAX_PATHS = 2000;

export type Case = 'weak' | 'typical' | 'strong';

export type StatementFigures = {
  memberLabel: string;
  age: number;
  retirementAge: number;
  currency: string;
  optionName: string;
  /** Exact pots at retirement in today's money, and the yearly incomes they buy. */
  pots: Record<Case, number>;
  incomes: Record<Case, number>;
  annuityYears: number;
  /** How many market paths the figures come from. */
  paths: number;
  /** Extra typical pot (exact, today's money) from each change, worked out by projecting again with that change. */
  whatIf: { extraContribution: number; laterRetirement: number; paths: number };
  draft: boolean;
};

export type StatementText = {
  title: string;
  intro: string[];
  cases: { key: Case; label: string; pot: string; income: string; sentence: string }[];
  income: string[];
  changes: string[];
  notes: string[];
  caution: string[];
};

export type RoundedFigures = { pots: Record<Case, number>; incomes: Record<Case, number>; extraContribution: number; laterRetirement: number };

const CASES: Case[] = ['weak', 'typical', 'strong'];

/** The figures as the member reads them, as numbers (for the CSV's rounded columns). */
export function roundFigures(f: StatementFigures): RoundedFigures {
  const each = (r: Record<Case, number>, context: 'pot' | 'income') => Object.fromEntries(CASES.map((k) => [k, roundMoney(r[k], context)])) as Record<Case, number>;
  return {
    pots: each(f.pots, 'pot'),
    incomes: each(f.incomes, 'income'),
    extraContribution: roundMoney(f.whatIf.extraContribution, 'pot'),
    laterRetirement: roundMoney(f.whatIf.laterRetirement, 'pot'),
  };
}

function change(amount: number, currency: string): string {
  const rounded = roundMoney(amount, 'pot');
  if (rounded > 0) return `could add about ${money(amount, currency)} to your pot`;
  if (rounded < 0) return `could take about ${money(-amount, currency)} off your pot`;
  return 'would make little difference to your pot';
}

export function statementText(f: StatementFigures): StatementText {
  const pot = (v: number) => money(v, f.currency, 'pot');
  const income = (v: number) => money(v, f.currency, 'income');
  const P = STATEMENT_PERCENTILES;
  const years = f.retirementAge - f.age;
  const sentences: Record<Case, [string, string]> = {
    weak: ['If markets do badly', 'Only 1 in 10 of our results came out lower.'],
    typical: ['In a typical case', 'Half of our results came out higher and half lower.'],
    strong: ['If markets do well', 'Only 1 in 10 of our results came out higher.'],
  };
  return {
    title: `What your pension pot could be worth at ${f.retirementAge}`,
    intro: [
      `This is for ${f.memberLabel}, invested in ${f.optionName}.`,
      `It looks ${years} ${years === 1 ? 'year' : 'years'} ahead, to age ${f.retirementAge}.`,
      "All amounts are in today's money. That means what they would buy now.",
      'No one knows how markets will do. So we show three cases.',
    ],
    cases: CASES.map((key) => ({
      key,
      label: sentences[key][0],
      pot: pot(f.pots[key]),
      income: income(f.incomes[key]),
      sentence: `${sentences[key][0]}, your pot could be about ${pot(f.pots[key])}. ${sentences[key][1]}`,
    })),
    income: [
      `In a typical case, your pot could pay you about ${income(f.incomes.typical)} a year for ${f.annuityYears} years.`,
      `That would be about ${income(f.incomes.weak)} a year if markets do badly, and ${income(f.incomes.strong)} if they do well.`,
      'This income keeps pace with prices.',
    ],
    changes: [
      `Paying in ${percent(WHAT_IF.extraContribution, 'rate')} more of your pay each year ${change(f.whatIf.extraContribution, f.currency)} in a typical case.`,
      `Retiring ${WHAT_IF.laterYears} years later, at ${f.retirementAge + WHAT_IF.laterYears}, ${change(f.whatIf.laterRetirement, f.currency)} in a typical case.`,
      'We worked these out by running the same projection again with just that one change.',
    ],
    notes: [
      moneyRoundingNote('pot', f.currency),
      moneyRoundingNote('income', f.currency),
      `We ran ${count(f.paths)} possible paths for markets. The three cases are the ${P.weak}th, ${P.typical}th and ${P.strong}th percentiles of the results.`,
      'The figures take off the fund charges.',
    ],
    caution: [
      'This is not a promise. Your pot could be worth less than these figures.',
      ...(f.draft ? ['These figures use draft assumptions. They may change.'] : []),
      CAUTION_TEXT,
    ],
  };
}

/** The statement as plain paragraphs, in reading order (for e-mail, CSV and checks). */
export function statementParagraphs(t: StatementText): string[] {
  return [t.title, ...t.intro, ...t.cases.map((c) => c.sentence), ...t.income, 'What would change it', ...t.changes, ...t.notes, ...t.caution];
}
