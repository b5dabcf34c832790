import { certaintyEquivalentPot } from '../simulation';
import { BOARD_LAMBDA_RANGE } from '../constants/riskAversion';
import { lambda as lambdaText } from './numbers';

/**
 * Where two options swap places as the board's λ changes, in one wording for every output.
 * The engine reports break-even λ per pair of options and member; a pair can cross once, never,
 * several times, or be identical on every path. Which option leads between crossings is read
 * from the stored samples at the middle of each interval.
 */

/** The crossings of one pair, in the board's range, ascending. */
export type Crossings = { status: 'identical' | 'none' | 'crossings'; lambdas: number[] };

/**
 * Reads an engine break-even entry: today's form gives one `lambda` with a status; a list of
 * crossings (`crossings: { lambda }[]`, or plain `lambdas`) is accepted as well, so an engine
 * that reports every crossing needs no change here.
 */
export function crossingsOf(
  b: { status: string; lambda?: number | null; lambdas?: readonly number[] | null; crossings?: readonly { lambda: number }[] | null },
  range: readonly [number, number] = BOARD_LAMBDA_RANGE,
): Crossings {
  if (b.status === 'identical') return { status: 'identical', lambdas: [] };
  const all = b.crossings?.map((c) => c.lambda) ?? b.lambdas ?? (b.lambda !== null && b.lambda !== undefined ? [b.lambda] : []);
  const lambdas = [...all].filter((l) => Number.isFinite(l) && l >= range[0] && l <= range[1]).sort((x, y) => x - y);
  return lambdas.length ? { status: 'crossings', lambdas } : { status: 'none', lambdas: [] };
}

export type BreakEvenPair = {
  /** The illustrative member, named at the start of the sentence (omit for a sentence about one member on screen). */
  memberLabel?: string | null;
  a: { name: string; pots: ArrayLike<number> };
  b: { name: string; pots: ArrayLike<number> };
  crossings: Crossings;
  /** The λ the board chose. */
  lambda: number;
  /** Who leads at the chosen λ, when the caller already knows it (the ranking's own order); else read from the samples. */
  leaderAtLambda?: 'a' | 'b';
  range?: readonly [number, number];
};

/**
 * The sentence, e.g. "For Member aged 45, Cautious glide ranks above Long-horizon growth when
 * λ is below 2.41; from 2.41, Long-horizon growth ranks higher. At the chosen λ = 2,
 * Cautious glide ranks higher." "Ranks higher" means a higher certainty-equivalent pot.
 */
export function breakEvenSentence(p: BreakEvenPair): string {
  const range = p.range ?? BOARD_LAMBDA_RANGE;
  const prefix = p.memberLabel ? `For ${p.memberLabel}, ` : '';
  const A = p.a.name;
  const B = p.b.name;
  if (p.crossings.status === 'identical') return `${prefix}${A} and ${B} give the same pot on every path, so neither ranks above the other at any λ.`;
  const leads = (at: number): 'a' | 'b' => (certaintyEquivalentPot(p.a.pots, at) >= certaintyEquivalentPot(p.b.pots, at) ? 'a' : 'b');
  const name = (w: 'a' | 'b') => (w === 'a' ? A : B);
  const other = (w: 'a' | 'b') => (w === 'a' ? B : A);
  const atChosen = p.leaderAtLambda ?? leads(p.lambda);
  if (p.crossings.status === 'none') {
    return `${prefix}${name(atChosen)} ranks above ${other(atChosen)} at every λ from ${lambdaText(range[0])} to ${lambdaText(range[1])}.`;
  }
  const cuts = p.crossings.lambdas;
  const edges = [range[0], ...cuts, range[1]];
  const leaders = edges.slice(0, -1).map((lo, i) => leads((lo + edges[i + 1]) / 2));
  const parts = [`${prefix}${name(leaders[0])} ranks above ${other(leaders[0])} when λ is below ${lambdaText(cuts[0])}`];
  for (let i = 1; i < leaders.length; i++) {
    const upTo = i < cuts.length ? ` to ${lambdaText(cuts[i])}` : '';
    parts.push(`from ${lambdaText(cuts[i - 1])}${upTo}, ${name(leaders[i])} ranks higher`);
  }
  return `${parts.join('; ')}. At the chosen λ = ${lambdaText(p.lambda)}, ${name(atChosen)} ranks higher.`;
}
