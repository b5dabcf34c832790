/**
 * Money as people read it. Every amount on screen, in PDFs and in e-mails is rounded by one of
 * the rules below — stated once, here — so the same pot reads the same everywhere. CSV exports
 * carry exact values in columns labelled `_exact` (and the text as shown, where they give it).
 */

/** A rounding rule: the first band whose `below` exceeds |value| applies; the last band has none. */
type Band = { below?: number; step?: number; significant?: number };
export type MoneyContext = keyof typeof MONEY_RULES;

export const MONEY_RULES = {
  /** Pots and anything measured like a pot (percentiles, means, certainty equivalents, shortfalls, targets, differences). */
  pot: { bands: [{ below: 10_000, step: 100 }, { step: 1_000 }] as Band[], note: 'Pots are rounded to the nearest {100} below {10000} and to the nearest {1000} from {10000}.' },
  /** Yearly incomes. */
  income: { bands: [{ below: 1_000, step: 10 }, { step: 100 }] as Band[], note: 'Yearly incomes are rounded to the nearest {10} below {1000} and to the nearest {100} from {1000}.' },
  /** Monte Carlo standard errors: two significant figures, so a small error never reads as zero. */
  standardError: { bands: [{ significant: 2 }] as Band[], note: 'Standard errors are given to two significant figures.' },
  /** Amounts a person entered (salaries, today's pots): to the whole unit, as entered. */
  entered: { bands: [{ step: 1 }] as Band[], note: 'Amounts entered are shown to the whole unit.' },
} as const;

const SYMBOLS: Record<string, string> = { GBP: '£', EUR: '€', USD: '$' };

/** "£" for GBP; an unknown code is written out with a space ("CHF "). */
export function currencySymbol(currency: string): string {
  return SYMBOLS[currency] ?? `${currency} `;
}

/** Rounds half away from zero to a multiple of `step`, without floating-point residue. */
function roundToStep(value: number, step: number): number {
  const r = Math.sign(value) * Math.round(Math.abs(value) / step) * step;
  return step >= 1 ? r : Number(r.toFixed(Math.ceil(-Math.log10(step))));
}

/** The amount as the rule for `context` rounds it (a number, for exports that give rounded values). */
export function roundMoney(value: number, context: MoneyContext = 'pot'): number {
  if (!Number.isFinite(value)) return value;
  const abs = Math.abs(value);
  const band = MONEY_RULES[context].bands.find((b) => b.below === undefined || abs < b.below)!;
  if (band.significant) {
    if (abs === 0) return 0;
    const step = 10 ** (Math.floor(Math.log10(abs)) - band.significant + 1);
    return roundToStep(value, step) + 0;
  }
  return roundToStep(value, band.step ?? 1) + 0; // + 0 turns −0 into 0
}

/** Thousands separators, no decimals: 182000 → "182,000". */
function grouped(n: number): string {
  const [whole, frac] = Math.abs(n).toString().split('.');
  return whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',') + (frac ? `.${frac}` : '');
}

/** An amount already rounded, with the currency: −1200 → "−£1,200". */
export function moneyText(rounded: number, currency: string): string {
  if (!Number.isFinite(rounded)) return '—';
  const sign = rounded < 0 ? '−' : '';
  return `${sign}${currencySymbol(currency)}${grouped(rounded)}`;
}

/** Money rounded for reading by its context's rule: 181947.23 → "£182,000". Not a number → "—". */
export function money(value: number | null | undefined, currency: string, context: MoneyContext = 'pot'): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const r = roundMoney(value, context);
  return moneyText(Object.is(r, -0) ? 0 : r, currency);
}

/** A signed difference: "+£3,000", "−£1,200", "£0". */
export function moneyChange(value: number | null | undefined, currency: string, context: MoneyContext = 'pot'): string {
  const text = money(value, currency, context);
  return value !== null && value !== undefined && roundMoney(value, context) > 0 ? `+${text}` : text;
}

/** The rounding rule of a context in words, with the scheme's currency: "Pots are rounded to the nearest £100 below £10,000 …". */
export function moneyRoundingNote(context: MoneyContext, currency: string): string {
  return MONEY_RULES[context].note.replace(/\{(\d+)\}/g, (_, n: string) => moneyText(Number(n), currency));
}

/** A compact amount for chart axes: 200000 → "£200k", 1500000 → "£1.5m". */
export function compactMoney(value: number, currency: string): string {
  const symbol = currencySymbol(currency);
  const abs = Math.abs(value);
  const sign = value < 0 ? '−' : '';
  const trim = (x: number) => String(Number(x.toFixed(1)));
  if (abs >= 1e6) return `${sign}${symbol}${trim(abs / 1e6)}m`;
  if (abs >= 1e3) return `${sign}${symbol}${trim(abs / 1e3)}k`;
  return `${sign}${symbol}${Math.round(abs)}`;
}
