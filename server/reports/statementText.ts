import { CAUTION_TEXT, DRAFT_TEXT } from './caution';
import { formatMoney, roundTo } from './format';

/**
 * Member statements in plain words. Everything a member reads is built here from exact
 * figures, rounded as documented below; tests use the same constants.
 */

/** Pots are rounded to the nearest 1,000 and yearly incomes to the nearest 100 (currency units). */
export const STATEMENT_ROUNDING = { pot: 1000, income: 100 } as const;

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

export function roundFigures(f: StatementFigures): RoundedFigures {
  const P = STATEMENT_ROUNDING.pot;
  const I = STATEMENT_ROUNDING.income;
  return {
    pots: { weak: roundTo(f.pots.weak, P), typical: roundTo(f.pots.typical, P), strong: roundTo(f.pots.strong, P) },
    incomes: { weak: roundTo(f.incomes.weak, I), typical: roundTo(f.incomes.typical, I), strong: roundTo(f.incomes.strong, I) },
    extraContribution: roundTo(f.whatIf.extraContribution, P),
    laterRetirement: roundTo(f.whatIf.laterRetirement, P),
  };
}

const pct = (x: number) => `${Math.round(x * 100)}%`;

function change(amount: number, money: (v: number) => string): string {
  if (amount > 0) return `could add about ${money(amount)} to your pot`;
  if (amount < 0) return `could take about ${money(-amount)} off your pot`;
  return 'would make little difference to your pot';
}

export function statementText(f: StatementFigures): StatementText {
  const money = (v: number) => formatMoney(v, f.currency);
  const r = roundFigures(f);
  const P = STATEMENT_PERCENTILES;
  const years = f.retirementAge - f.age;
  return {
    title: `What your pension pot could be worth at ${f.retirementAge}`,
    intro: [
      `This is for ${f.memberLabel}, invested in ${f.optionName}.`,
      `It looks ${years} ${years === 1 ? 'year' : 'years'} ahead, to age ${f.retirementAge}.`,
      "All amounts are in today's money. That means what they would buy now.",
      'No one knows how markets will do. So we show three cases.',
    ],
    cases: [
      {
        key: 'weak',
        label: 'If markets do badly',
        pot: money(r.pots.weak),
        income: money(r.incomes.weak),
        sentence: `If markets do badly, your pot could be about ${money(r.pots.weak)}. Only 1 in 10 of our results came out lower.`,
      },
      {
        key: 'typical',
        label: 'In a typical case',
        pot: money(r.pots.typical),
        income: money(r.incomes.typical),
        sentence: `In a typical case, your pot could be about ${money(r.pots.typical)}. Half of our results came out higher and half lower.`,
      },
      {
        key: 'strong',
        label: 'If markets do well',
        pot: money(r.pots.strong),
        income: money(r.incomes.strong),
        sentence: `If markets do well, your pot could be about ${money(r.pots.strong)}. Only 1 in 10 of our results came out higher.`,
      },
    ],
    income: [
      `In a typical case, your pot could pay you about ${money(r.incomes.typical)} a year for ${f.annuityYears} years.`,
      `That would be about ${money(r.incomes.weak)} a year if markets do badly, and ${money(r.incomes.strong)} if they do well.`,
      'This income keeps pace with prices.',
    ],
    changes: [
      `Paying in ${pct(WHAT_IF.extraContribution)} more of your pay each year ${change(r.extraContribution, money)} in a typical case.`,
      `Retiring ${WHAT_IF.laterYears} years later, at ${f.retirementAge + WHAT_IF.laterYears}, ${change(r.laterRetirement, money)} in a typical case.`,
      'We worked these out by running the same projection again with just that one change.',
    ],
    notes: [
      `Pots are rounded to the nearest ${money(STATEMENT_ROUNDING.pot)}. Yearly incomes are rounded to the nearest ${money(STATEMENT_ROUNDING.income)}.`,
      `We ran ${f.paths.toLocaleString('en-GB')} possible paths for markets. The three cases are the ${P.weak}th, ${P.typical}th and ${P.strong}th percentiles of the results.`,
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

export { DRAFT_TEXT };
