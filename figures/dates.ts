/**
 * Dates, times and ages, one format everywhere: "2 December 2026" and "2 December 2026, 14:05".
 * Times are shown in UK time (the schemes Keelson serves are UK schemes); a calendar date such
 * as an assumption set's "2026-12-02" is that day wherever it is read.
 */

/** The time zone every date-time is shown in. */
export const TIME_ZONE = 'Europe/London';

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const DAY_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/;

type Parts = { year: number; month: number; day: number; hour: number; minute: number };

const partsFormat = new Intl.DateTimeFormat('en-GB', { timeZone: TIME_ZONE, year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', hourCycle: 'h23' });

function partsOf(value: Date | string): Parts | null {
  if (typeof value === 'string') {
    const m = DAY_ONLY.exec(value);
    if (m) return { year: Number(m[1]), month: Number(m[2]), day: Number(m[3]), hour: 0, minute: 0 };
  }
  const d = typeof value === 'string' ? new Date(value) : value;
  if (Number.isNaN(d.getTime())) return null;
  const get = (type: string) => Number(partsFormat.formatToParts(d).find((p) => p.type === type)?.value);
  return { year: get('year'), month: get('month'), day: get('day'), hour: get('hour') % 24, minute: get('minute') };
}

/** "2 December 2026". Empty or not a date → "—". */
export function date(value: Date | string | null | undefined): string {
  const p = value ? partsOf(value) : null;
  return p ? `${p.day} ${MONTHS[p.month - 1]} ${p.year}` : '—';
}

/** "2 December 2026, 14:05" (UK time). Empty or not a date → "—". */
export function dateTime(value: Date | string | null | undefined): string {
  const p = value ? partsOf(value) : null;
  return p ? `${p.day} ${MONTHS[p.month - 1]} ${p.year}, ${String(p.hour).padStart(2, '0')}:${String(p.minute).padStart(2, '0')}` : '—';
}

/** A calendar date as stored and typed: "2026-12-02" (the day in UK time for a moment). */
export function isoDay(value: Date | string): string {
  const p = partsOf(value);
  if (!p) return '';
  return `${p.year}-${String(p.month).padStart(2, '0')}-${String(p.day).padStart(2, '0')}`;
}

/** An age in whole years: 67.9 → "67". */
export function age(years: number): string {
  return String(Math.floor(years));
}

/** A span of years in words: 1 → "1 year", 12 → "12 years". */
export function years(n: number): string {
  return `${n} ${n === 1 ? 'year' : 'years'}`;
}

/**
 * Whole days from one calendar date to another, both written "2026-12-02": positive when `to`
 * is later. Calendar arithmetic (midnight to midnight), so a change of clocks never shifts it.
 */
export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
}
