import { BOARD_LAMBDA_RANGE } from '../constants/riskAversion';
import { lambda as lambdaText } from './numbers';

/**
 * Where two options swap places as the board's λ changes, as one small table for every output
 * (screen, board report, decision record): one row per member × pair of options, giving none,
 * one or several break-even λs, each with its 95% interval (the engine's delta-method interval,
 * simulation/breakEven.ts). Which option is higher at the chosen λ is in the ranking itself.
 */

/** One engine break-even entry: engine 2 lists every crossing; engine 1 stored only its first `lambda`. */
export type BreakEvenEntry = {
  memberId: string;
  optionA: string;
  optionB: string;
  status: string;
  lambda?: number | null;
  crossings?: readonly { lambda: number; interval: readonly [number, number] | null; favouredAbove?: 'A' | 'B' }[] | null;
};

export type BreakEvenRow = {
  memberId: string;
  member: string;
  /** "Option A and Option B". */
  options: string;
  kind: 'none' | 'identical' | 'crossings';
  /** The λs in the board's range, ascending (exact). */
  lambdas: number[];
  /** The cell as shown: "none from −5 to 50", "1.57 (1.4 to 1.74)", or several separated by "; ". */
  text: string;
};

/** Headings of the break-even table. */
export const BREAK_EVEN_COLUMNS = [
  { key: 'member', label: 'Member' },
  { key: 'options', label: 'Options' },
  { key: 'text', label: 'Break-even λ (95% interval)' },
] as const;

/** What the table means, printed under it. */
export function breakEvenNote(range: readonly [number, number] = BOARD_LAMBDA_RANGE): string {
  return `A break-even λ is a risk aversion at which the two options' certainty-equivalent pots are equal, so their order swaps there; every one between ${lambdaText(range[0])} and ${lambdaText(range[1])} is listed, with its 95% interval from the Monte Carlo error. "None" means the order of the pair is the same at every λ in that range.`;
}

/** One crossing: "1.57 (1.4 to 1.74)", or "1.57" when its interval cannot be estimated. */
export function crossingText(c: { lambda: number; interval: readonly [number, number] | null }): string {
  return c.interval ? `${lambdaText(c.lambda)} (${lambdaText(c.interval[0])} to ${lambdaText(c.interval[1])})` : lambdaText(c.lambda);
}

/** The cell of one pair: none, identical, one crossing or several. */
export function breakEvenCell(b: BreakEvenEntry, range: readonly [number, number] = BOARD_LAMBDA_RANGE): { kind: BreakEvenRow['kind']; lambdas: number[]; text: string } {
  if (b.status === 'identical') return { kind: 'identical', lambdas: [], text: 'same pot on every path' };
  const listed = b.crossings ?? (b.lambda !== null && b.lambda !== undefined ? [{ lambda: b.lambda, interval: null }] : []);
  const inRange = listed.filter((c) => Number.isFinite(c.lambda) && c.lambda >= range[0] && c.lambda <= range[1]).sort((x, y) => x.lambda - y.lambda);
  if (!inRange.length) return { kind: 'none', lambdas: [], text: `none from ${lambdaText(range[0])} to ${lambdaText(range[1])}` };
  return { kind: 'crossings', lambdas: inRange.map((c) => c.lambda), text: inRange.map(crossingText).join('; ') };
}

type Names = Map<string, string> | Record<string, string>;
const nameOf = (names: Names, id: string) => (names instanceof Map ? names.get(id) : names[id]) ?? id;

/** The break-even table's rows, member by member in the engine's order, pairs in option order. */
export function breakEvenRows(entries: readonly BreakEvenEntry[], optionNames: Names, memberLabels: Names, range: readonly [number, number] = BOARD_LAMBDA_RANGE): BreakEvenRow[] {
  return entries.map((b) => ({
    memberId: b.memberId,
    member: nameOf(memberLabels, b.memberId),
    options: `${nameOf(optionNames, b.optionA)} and ${nameOf(optionNames, b.optionB)}`,
    ...breakEvenCell(b, range),
  }));
}
