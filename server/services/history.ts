import { historyStatistics, type HistoryStatistics } from '../../simulation/history';
import { CsvProblems, numberCell, readCsv } from '../uploads';
import type { DbOrTx } from '../../db/client';
import { latestApproved } from './assumptions';
import { listFunds, type FundRow } from './funds';

export const HISTORY_METHOD =
  'Monthly simple returns (Pₜ − Pₜ₋₁)/Pₜ₋₁ from month-end total-return index levels. Expected return: the mean monthly return compounded, (1 + m̄)¹² − 1. Volatility: √12 × the sample standard deviation of monthly returns (n − 1). Correlations: Pearson, of monthly returns.';

/** Fewer months than this and the suggestion is flagged as thin (common practice, no source). */
export const THIN_HISTORY_MONTHS = 36;

export type HistorySuggestion = Omit<HistoryStatistics, 'funds'> & {
  from: string;
  to: string;
  dates: string[];
  method: string;
  thin: boolean;
  fileName: string;
  funds: (HistoryStatistics['funds'][number] & { fundId: string; name: string })[];
};

const DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function parseDate(raw: string): { iso: string; monthIndex: number } | string {
  const m = DATE.exec(raw.trim());
  if (!m) return `"${raw}" is not a date written YYYY-MM-DD`;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const dt = new Date(Date.UTC(y, mo - 1, d));
  if (dt.getUTCFullYear() !== y || dt.getUTCMonth() !== mo - 1 || dt.getUTCDate() !== d) return `"${raw}" is not a calendar date`;
  return { iso: raw.trim(), monthIndex: y * 12 + (mo - 1) };
}

/**
 * Reads a CSV of month-end index levels — a `date` column then one column per fund, headed
 * with the fund's name — and computes suggested assumptions. Every problem is collected with
 * its line and column; any problem ⇒ a 400 listing them (nothing is stored either way).
 */
export async function suggestFromHistory(buffer: Buffer, fileName: string, schemeFunds: FundRow[]): Promise<HistorySuggestion> {
  const problems = new CsvProblems();
  const byName = new Map(schemeFunds.map((f) => [f.name.trim().toLowerCase(), f]));
  let columns: { index: number; header: string; fund: FundRow }[] = [];
  let dateIndex = -1;
  const dates: string[] = [];
  const levels: number[][] = [];
  let lastMonth: { iso: string; monthIndex: number } | null = null;

  await readCsv(
    buffer,
    problems,
    (header) => {
      dateIndex = header.findIndex((h) => h.trim().toLowerCase() === 'date');
      if (dateIndex < 0) problems.add(1, 'date', 'there is no "date" column');
      const seen = new Set<string>();
      header.forEach((h, index) => {
        if (index === dateIndex) return;
        const key = h.trim().toLowerCase();
        const fund = byName.get(key);
        if (!h.trim()) problems.add(1, `column ${index + 1}`, 'has no heading; head each column with a fund name');
        else if (!fund)
          problems.add(1, h, schemeFunds.length ? `is not a fund of this scheme (headings must match fund names: ${schemeFunds.map((f) => f.name).join(', ')})` : 'is not a fund of this scheme, which has no funds yet');
        else if (seen.has(key)) problems.add(1, h, 'appears twice');
        else {
          seen.add(key);
          columns.push({ index, header: h, fund });
        }
      });
      if (columns.length === 0 && !problems.any) problems.add(1, '', 'no fund columns were found');
      columns = columns.sort((a, b) => a.index - b.index);
    },
    (cells, line) => {
      if (dateIndex < 0) return;
      const row: number[] = [];
      let ok = true;
      const date = parseDate(cells[dateIndex] ?? '');
      if (typeof date === 'string') {
        problems.add(line, 'date', date);
        ok = false;
      } else if (lastMonth && date.monthIndex !== lastMonth.monthIndex + 1) {
        problems.add(
          line,
          'date',
          date.monthIndex <= lastMonth.monthIndex
            ? `${date.iso} is not after the previous row (${lastMonth.iso}); rows must run oldest first, one per month`
            : `${date.iso} does not follow ${lastMonth.iso}: ${date.monthIndex - lastMonth.monthIndex - 1} month(s) are missing`,
        );
        ok = false;
      }
      for (const c of columns) {
        const v = numberCell(cells[c.index] ?? '');
        if (typeof v === 'string') {
          problems.add(line, c.header, v);
          ok = false;
        } else if (!(v > 0)) {
          problems.add(line, c.header, `index level must be above 0 (got ${v})`);
          ok = false;
        } else row.push(v);
      }
      if (typeof date !== 'string') lastMonth = date;
      if (ok && typeof date !== 'string') {
        dates.push(date.iso);
        levels.push(row);
      }
    },
  );
  if (!problems.any && dates.length < 3) problems.add(1, '', `at least 3 month-end rows are needed (2 monthly returns); the file has ${dates.length}`);
  if (problems.any) throw problems.toError();

  const stats = historyStatistics(columns.map((c, k) => ({ id: c.fund.id, levels: levels.map((r) => r[k]) })));
  return {
    ...stats,
    funds: stats.funds.map((f, k) => ({ ...f, fundId: columns[k].fund.id, name: columns[k].fund.name })),
    from: dates[0],
    to: dates[dates.length - 1],
    dates,
    method: HISTORY_METHOD,
    thin: stats.months < THIN_HISTORY_MONTHS,
    fileName,
  };
}

/** A suggestion from an uploaded history, beside the scheme's latest approved figures (nothing is stored). */
export async function suggestionForScheme(db: DbOrTx, schemeId: string, file: { buffer: Buffer; name: string }) {
  const suggestion = await suggestFromHistory(file.buffer, file.name, await listFunds(db, schemeId));
  const current = await latestApproved(db, schemeId);
  return { ...suggestion, current: current ? { id: current.id, version: current.version, funds: current.funds, correlations: current.correlations } : null };
}
