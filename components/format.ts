/** Formatting at the UI edge: fractions in, percent and rounded money out. */

/** 0.0725 → "7.25%" (two decimals by default, trailing zeros dropped). */
export function pct(x: number | null | undefined, dp = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return `${Number((x * 100).toFixed(dp))}%`;
}

/** A fraction as a percent string for an input box: 0.0725 → "7.25". */
export function pctInput(x: number | null | undefined, dp = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '';
  return String(Number((x * 100).toFixed(dp)));
}

/** "7.25" or "7.25%" → 0.0725; null when empty or not a number. */
export function parsePct(s: string): number | null {
  const t = s.trim().replace(/%$/, '').trim();
  if (t === '' || !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(t)) return null;
  return Number(t) / 100;
}

/** A plain number from an input box, or null. Thousands separators are allowed. */
export function parseNumber(s: string): number | null {
  const t = s.trim().replace(/,/g, '');
  if (t === '' || !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(t)) return null;
  return Number(t);
}

/** Money rounded for reading: 181947.23 → "£182,000" above 10,000, to the unit below. */
export function money(x: number | null | undefined, currency = 'GBP'): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const rounded = Math.abs(x) >= 10_000 ? Math.round(x / 1000) * 1000 : Math.round(x);
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency, maximumFractionDigits: 0 }).format(rounded);
  } catch {
    return `${currency} ${rounded.toLocaleString('en-GB')}`;
  }
}

/** "2026-10-14T10:00:00Z" → "14 Oct 2026". */
export function day(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso.length === 10 ? `${iso}T00:00:00Z` : iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
}
