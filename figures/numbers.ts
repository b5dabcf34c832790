/**
 * Percentages, λ, counts and ordinals as people read them, and percentages typed at the edge.
 * Fractions in code (0.025), percent only here. One rule per kind of figure, stated once.
 */

export type PercentContext = keyof typeof PERCENT_RULES;

export const PERCENT_RULES = {
  /** Rates as set or entered (assumptions, charges, contribution rates, targets): up to three decimals, trailing zeros dropped (2.5%, 0.45%, 0.125%). */
  rate: { decimals: 3, trim: true },
  /** Computed annual returns (certainty-equivalent returns): two decimals (3.41%). */
  return: { decimals: 2, trim: false },
  /** Chances (probability of reaching the target): whole percent (62%). */
  chance: { decimals: 0, trim: false },
  /** Standard errors of chances: one decimal (1.1%). */
  chanceError: { decimals: 1, trim: false },
  /** Shares of a pot (glide-path weights): up to one decimal, trailing zero dropped (40%, 12.5%). */
  share: { decimals: 1, trim: true },
} as const;

const MINUS = '−';

function fixed(x: number, decimals: number, trim: boolean): string {
  let s = Math.abs(x).toFixed(decimals);
  if (trim && s.includes('.')) s = s.replace(/\.?0+$/, '');
  const zero = Number(s) === 0;
  return `${x < 0 && !zero ? MINUS : ''}${s}`;
}

/** A fraction as a percentage by its context's rule: 0.0725 → "7.25%". Not a number → "—". */
export function percent(fraction: number | null | undefined, context: PercentContext = 'rate'): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  const r = PERCENT_RULES[context];
  return `${fixed(fraction * 100, r.decimals, r.trim)}%`;
}

/**
 * A difference of two rates or chances, in percentage points with its sign:
 * 0.62 − 0.5 → "+12 percentage points" (decimals as the context of the rates compared).
 */
export function percentagePoints(difference: number | null | undefined, context: PercentContext = 'chance'): string {
  if (difference === null || difference === undefined || !Number.isFinite(difference)) return '—';
  const r = PERCENT_RULES[context];
  const s = fixed(difference * 100, r.decimals, r.trim);
  const unit = Number(s.replace(MINUS, '-')) === 1 || Number(s.replace(MINUS, '-')) === -1 ? 'percentage point' : 'percentage points';
  return `${difference > 0 && Number(s) !== 0 ? '+' : ''}${s} ${unit}`;
}

/** The standard error of a difference of chances, without sign: 0.0112 → "1.1 percentage points" (one decimal, as chanceError). */
export function pointsError(se: number | null | undefined): string {
  if (se === null || se === undefined || !Number.isFinite(se)) return '—';
  return percentagePoints(Math.abs(se), 'chanceError').replace(/^\+/, '');
}

/** Risk aversion λ: at most two decimals, trailing zeros dropped (2, 1.5, 1.56, −0.5). */
export function lambda(value: number): string {
  return fixed(value, 2, true);
}

/** A whole count with thousands separators: 10000 → "10,000". */
export function count(n: number): string {
  if (!Number.isFinite(n)) return '—';
  const s = Math.round(Math.abs(n)).toString().replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return n < 0 ? `${MINUS}${s}` : s;
}

/** A plain decimal to `decimals` places (correlations, factors): 0.8 → "0.80". */
export function decimal(x: number | null | undefined, decimals = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return fixed(x, decimals, false);
}

/** 1 → "1st", 2 → "2nd", 11 → "11th", 23 → "23rd", 2.5 → "2.5th". */
export function ordinal(n: number): string {
  if (!Number.isInteger(n)) return `${n}th`;
  const teen = n % 100 >= 11 && n % 100 <= 13;
  const suffix = teen ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th';
  return `${n}${suffix}`;
}

/** A percentile's name in tables: 50 → "Median", 5 → "5th". */
export function percentileLabel(p: number): string {
  return p === 50 ? 'Median' : ordinal(p);
}

/** "1 year", "12 years" (also "member", "path", …). */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${count(n)} ${n === 1 ? one : many}`;
}

// ---- Typed at the edge ---------------------------------------------------------------

const DECIMAL = /^([-+])?(\d*)(?:\.(\d*))?$/;

/**
 * A plain number typed by a person ("32,500", "7.5"), or null when it is not one. Thousands
 * separators are allowed; nothing else.
 */
export function parseNumberInput(text: string): number | null {
  const t = text.trim().replace(/,(?=\d{3}(\D|$))/g, '');
  const m = DECIMAL.exec(t);
  if (!m || (m[2] === '' && (m[3] ?? '') === '')) return null;
  return Number(t);
}

/**
 * A percentage typed by a person, as the fraction it means, without floating-point noise:
 * "0.45" (or "0.45%") → exactly the double nearest 0.0045, not 0.45 / 100 = 0.0045000000000000005.
 * The decimal point is moved in the text, so the one rounding is JavaScript's own reading of
 * the shifted decimal. Null when the text is not a plain decimal.
 */
export function parsePercentInput(text: string): number | null {
  const t = text.trim().replace(/\s*%$/, '').trim();
  const m = DECIMAL.exec(t);
  if (!m || (m[2] === '' && (m[3] ?? '') === '')) return null;
  const sign = m[1] === '-' ? '-' : '';
  const whole = (m[2] || '0').padStart(3, '0');
  const shifted = `${sign}${whole.slice(0, -2)}.${whole.slice(-2)}${m[3] ?? ''}`;
  return Number(shifted) || 0;
}

/** A fraction as the text of a percentage box: 0.0045 → "0.45" (no noise, no trailing zeros). */
export function percentInputText(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '';
  return String(Number((fraction * 100).toPrecision(12)));
}
