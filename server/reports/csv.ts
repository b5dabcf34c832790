/**
 * CSV as RFC 4180 describes it: comma-separated, CRLF line ends, a field quoted when it holds
 * a comma, a double quote, CR or LF, with inner quotes doubled. Numbers are written exactly
 * (JavaScript's shortest round-trip form), never rounded.
 */
export type CsvValue = string | number | boolean | null | undefined;

export function csvField(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : String(v);
  // A leading =, +, - or @ would be run as a formula by spreadsheet programs; prefix text cells.
  const safe = typeof v === 'string' && /^[=+\-@]/.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function toCsv(header: string[], rows: CsvValue[][]): string {
  return [header, ...rows].map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}
