/**
 * How figures are written in reports, on screen and in PDFs. The PDF and the API use these
 * same functions, so a figure reads identically everywhere; CSV exports carry exact values.
 */

const SYMBOLS: Record<string, string> = { GBP: '£', EUR: '€', USD: '$' };

export function currencySymbol(currency: string): string {
  return SYMBOLS[currency] ?? `${currency} `;
}

/** Money to whole units with thousands separators: 181947.23 → "£181,947". Negative as "−£…". */
export function formatMoney(value: number, currency = 'GBP'): string {
  if (!Number.isFinite(value)) return 'n/a';
  const whole = Math.round(value);
  const sign = whole < 0 ? '−' : '';
  return `${sign}${currencySymbol(currency)}${Math.abs(whole).toLocaleString('en-GB')}`;
}

/** A fraction as a percentage with `dp` decimals: 0.4123 → "41.2%". */
export function formatPercent(fraction: number | null | undefined, dp = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return 'n/a';
  return `${(fraction * 100).toFixed(dp)}%`;
}

/** Risk aversion λ as entered, trimmed: 2 → "2", 1.5625 → "1.56". */
export function formatLambda(lambda: number): string {
  return String(Math.round(lambda * 100) / 100);
}

/** A date as "11 June 2026" (UTC, so the same on every server). */
export function formatDate(d: Date | string): string {
  const date = typeof d === 'string' ? new Date(d) : d;
  return date.toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
}

/** Rounds to the nearest multiple of `step` (half away from zero). */
export function roundTo(value: number, step: number): number {
  return Math.sign(value) * Math.round(Math.abs(value) / step) * step;
}
