/**
 * Figures for the comparison view, computed in the browser from a stored run with the
 * engine's pure functions, so moving λ re-ranks the options without simulating again.
 */
import { breakEvenLambda, ceAnnualReturn, certaintyEquivalentPot, memberTimeline, type ScenarioInput } from '@/simulation';
import type { PairFigures, StoredVariant } from '@/hooks/useRuns';

export type OptionFigures = {
  optionId: string;
  name: string;
  pair: PairFigures;
  cePot: number;
  ceStandardError: number;
  ceAnnualReturn: number | null;
};

/** Money rounded for reading: £182,000 (three significant figures above 1,000). */
export function money(value: number, currency: string): string {
  if (!Number.isFinite(value)) return '–';
  const abs = Math.abs(value);
  const digits = abs >= 1000 ? Math.max(0, Math.floor(Math.log10(abs)) - 2) : 0;
  const step = 10 ** digits;
  const rounded = Math.round(value / step) * step;
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency, maximumFractionDigits: 0 }).format(rounded);
}

/** A fraction shown as a percentage, e.g. 0.0412 → "4.1%". */
export function pct(fraction: number | null | undefined, digits = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '–';
  return `${(fraction * 100).toFixed(digits)}%`;
}

/**
 * Monte Carlo standard error of the certainty-equivalent pot by the delta method:
 * CE = g(m) with m = mean(W^(1−γ)) and g(m) = m^(1/(1−γ)), so SE(CE)/CE ≈ SE(m)/(|1−γ|·m);
 * for γ = 1, CE = exp(mean ln W) and SE(CE)/CE ≈ sd(ln W)/√n. γ = 2λ (simulation/utility.ts).
 * The spread comes from the stored sample; n is the run's number of paths. Computed in a
 * shifted log scale so that large γ does not overflow. Zero pots give no estimate (NaN).
 */
export function ceStandardError(sample: ArrayLike<number>, lambda: number, paths: number): number {
  const n = sample.length;
  if (n < 2) return Number.NaN;
  const e = 1 - 2 * lambda;
  const logs = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!(sample[i] > 0)) return Number.NaN;
    logs[i] = Math.log(sample[i]);
  }
  const ce = certaintyEquivalentPot(sample, lambda);
  if (Math.abs(e) < 1e-9) return (ce * sd(logs)) / Math.sqrt(paths);
  let mx = -Infinity;
  for (let i = 0; i < n; i++) mx = Math.max(mx, e * logs[i]);
  const u = new Float64Array(n);
  for (let i = 0; i < n; i++) u[i] = Math.exp(e * logs[i] - mx);
  let m = 0;
  for (let i = 0; i < n; i++) m += u[i];
  m /= n;
  return (ce * sd(u)) / (Math.sqrt(paths) * Math.abs(e) * m);
}

/** Sample standard deviation (n − 1 in the denominator). */
function sd(x: Float64Array): number {
  let mean = 0;
  for (let i = 0; i < x.length; i++) mean += x[i];
  mean /= x.length;
  let ss = 0;
  for (let i = 0; i < x.length; i++) ss += (x[i] - mean) ** 2;
  return Math.sqrt(ss / (x.length - 1));
}

/**
 * Each option's figures for one member at λ, ranked by certainty-equivalent pot (highest
 * first). At the run's own λ the full-sample CE stored by the server is used; at any other λ
 * the stored sample (every path, or 2,000 quantiles for larger runs).
 */
export function rankOptions(variant: StoredVariant, scenario: ScenarioInput, names: Record<string, string>, memberId: string, lambda: number): OptionFigures[] {
  const member = scenario.members.find((m) => m.id === memberId)!;
  const timeline = memberTimeline(member, scenario.inflation);
  const schedule = { initialPot: timeline.initialPot, contributions: timeline.realContributions };
  const rows = variant.result.results
    .filter((p) => p.memberId === memberId)
    .map((pair) => {
      const sample = variant.samples.find((s) => s.optionId === pair.optionId && s.memberId === memberId)!.realPots;
      const atRunLambda = lambda === variant.result.riskAversion;
      const cePot = atRunLambda ? pair.atRetirement.certaintyEquivalent.realPot : certaintyEquivalentPot(sample, lambda);
      return {
        optionId: pair.optionId,
        name: names[pair.optionId] ?? pair.optionId,
        pair,
        cePot,
        ceStandardError: ceStandardError(sample, lambda, variant.result.paths),
        ceAnnualReturn: atRunLambda ? pair.atRetirement.certaintyEquivalent.realAnnualReturn : ceAnnualReturn(cePot, schedule),
      };
    });
  return rows.sort((a, b) => b.cePot - a.cePot);
}

/**
 * A plain sentence about where the top two options swap places as λ changes, e.g.
 * "Cautious glide ranks above Long-horizon growth when λ is at least 2.4."
 */
export function breakEvenSentence(variant: StoredVariant, ranked: OptionFigures[], memberId: string): string | null {
  if (ranked.length < 2) return null;
  const [first, second] = ranked;
  const sample = (id: string) => variant.samples.find((s) => s.optionId === id && s.memberId === memberId)!.realPots;
  const be = breakEvenLambda(sample(first.optionId), sample(second.optionId));
  if (be.status === 'identical') return `${first.name} and ${second.name} give the same outcomes at every λ.`;
  if (be.status === 'none-in-range' || be.lambda === null) return `${first.name} ranks above ${second.name} at every λ from −5 to 50.`;
  const at = be.lambda.toFixed(1);
  // Which one leads above the crossing: compare just above it.
  const above = certaintyEquivalentPot(sample(first.optionId), be.lambda + 0.05) >= certaintyEquivalentPot(sample(second.optionId), be.lambda + 0.05);
  return above
    ? `${first.name} ranks above ${second.name} when λ is at least ${at}; below that, ${second.name} ranks higher.`
    : `${first.name} ranks above ${second.name} when λ is below ${at}; from ${at}, ${second.name} ranks higher.`;
}
