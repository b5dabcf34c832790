import { percentileKey } from '../../simulation/statistics';
import type { ScenarioSnapshot } from '../services/scenario';
import type { StoredResult } from '../jobs/result';
import {
  CAUTION_TEXT,
  DRAFT_TEXT,
  baselineOf,
  baselineSentence,
  breakEvenSentence,
  comparisonCells,
  comparisonColumns,
  count,
  crossingsOf,
  date,
  decimal,
  differenceSentence,
  differencesToBaseline,
  lambda as lambdaText,
  money,
  percent,
  pinFirst,
  rankAt,
  sampleOf,
  type ComparisonColumn,
  type ComparisonKey,
} from '../../figures';

/**
 * The content of a board scenario report: every figure and sentence the PDF prints, exact and
 * as displayed, all worded and rounded by figures/. It is stored with the report, so the app
 * shows the same words as the file.
 */
export type ComparisonRow = {
  memberId: string;
  memberLabel: string;
  optionId: string;
  optionName: string;
  /** 1 for the highest certainty-equivalent pot of the member at the report's λ. */
  rank: number;
  /** Exact values in the scheme's currency (real terms, today's money) and fractions. */
  exact: Record<ComparisonKey, number | null> & { percentilesReal: Record<string, number>; targetRealPot: number };
  /** The same figures as printed. */
  display: Record<ComparisonKey, string> & { percentilesReal: Record<string, string>; targetRealPot: string };
  /** "± …" (one Monte Carlo standard error) for the figures that have one, and their exact values. */
  standardErrors: Partial<Record<ComparisonKey, string>>;
  exactStandardErrors: Partial<Record<ComparisonKey, number>>;
};

export type ReportContent = {
  title: string;
  schemeName: string;
  currency: string;
  createdAt: string;
  createdOn: string;
  runId: string;
  runFinishedAt: string | null;
  draft: boolean;
  assumptionSet: { version: number; status: string; setAt: string; approvedOn: string | null; approvedBy: string | null };
  lambda: number;
  lambdaDisplay: string;
  /** How the certainty equivalents were computed at this λ. */
  ceBasis: 'run' | 'sample';
  percentiles: number[];
  assumptions: {
    inflation: string;
    annuity: string;
    annuityFactor: string;
    targetReplacementRatio: string;
    funds: { name: string; expectedReturn: string; volatility: string; annualCharge: string }[];
    correlations: { names: string[]; rows: string[][] };
    members: { label: string; age: number; retirementAge: number; salary: string; salaryGrowth: string; contributionRate: string; pot: string }[];
    stress: string | null;
  };
  options: { id: string; name: string; description: string; glidePath: { yearsToRetirement: number; weights: { fund: string; weight: string; fraction: number }[] }[] }[];
  /** The comparison's columns, headings as printed. */
  columns: ComparisonColumn[];
  comparison: ComparisonRow[];
  /** Per member, each option against the baseline (the current default when the run was made, else the top-ranked one). */
  differences: { memberId: string; memberLabel: string; sentences: string[] }[];
  /** Which option is the baseline, in words (absent from reports made before options had a current default). */
  baseline?: string;
  breakEven: string[];
  monteCarlo: { paths: number; seed: number; antithetic: boolean; engineVersion: string; sample: string; lines: string[] };
  caution: string;
  draftText: string | null;
};

export type RunForReport = {
  id: string;
  finishedAt: Date | null;
  assumptionsDraft: boolean;
  riskAversion: number;
  engineVersion: string | null;
  input: ScenarioSnapshot;
  result: StoredResult;
  /** The scheme's current default when the run was made: pinned first, and what differences are measured from. */
  baselineOptionId: string | null;
};

export function buildReportContent(
  run: RunForReport,
  opts: { title: string; schemeName: string; currency: string; lambda: number; createdAt: Date; approvedBy: string | null },
): ReportContent {
  const snap = run.input;
  const sc = snap.scenario;
  const base = run.result.base;
  const res = base.result;
  const cur = opts.currency;
  const fundName = new Map(snap.funds.map((f) => [f.id, f.name]));
  const optionName = new Map(snap.options.map((o) => [o.id, o.name]));
  const memberLabel = new Map(snap.members.map((m) => [m.id, m.label]));
  const lambda = opts.lambda;
  const lam = lambdaText(lambda);
  const memberIds = [...new Set(res.results.map((p) => p.memberId))];
  const ranked = new Map(memberIds.map((id) => [id, rankAt(base, sc, id, lambda, optionName)]));

  const baselineId = run.baselineOptionId;
  // Laid out as on screen: the current default first (with its rank), then the others by rank.
  const comparison: ComparisonRow[] = memberIds.flatMap((memberId) =>
    pinFirst(ranked.get(memberId)!, baselineId).map((r) => {
      const a = r.pair.atRetirement;
      const cells = comparisonCells(r, cur);
      const keys = Object.keys(cells) as ComparisonKey[];
      const percentilesReal = Object.fromEntries(res.percentiles.map((p) => [percentileKey(p), a.percentiles.real[percentileKey(p)]]));
      const withSe = keys.filter((k) => cells[k].standardError !== null);
      return {
        memberId,
        memberLabel: memberLabel.get(memberId) ?? memberId,
        optionId: r.optionId,
        optionName: r.name,
        rank: r.rank,
        exact: { ...(Object.fromEntries(keys.map((k) => [k, cells[k].exact])) as Record<ComparisonKey, number | null>), percentilesReal, targetRealPot: a.targetRealPot },
        display: {
          ...(Object.fromEntries(keys.map((k) => [k, cells[k].text])) as Record<ComparisonKey, string>),
          percentilesReal: Object.fromEntries(Object.entries(percentilesReal).map(([k, v]) => [k, money(v, cur)])),
          targetRealPot: money(a.targetRealPot, cur),
        },
        standardErrors: Object.fromEntries(withSe.map((k) => [k, cells[k].standardError!])),
        exactStandardErrors: Object.fromEntries(withSe.filter((k) => cells[k].exactStandardError !== null).map((k) => [k, cells[k].exactStandardError!])),
      };
    }),
  );

  const differences = memberIds.map((memberId) => {
    const rows = ranked.get(memberId)!;
    const base = baselineOf(rows, baselineId);
    return { memberId, memberLabel: memberLabel.get(memberId) ?? memberId, sentences: base ? differencesToBaseline(rows, base.optionId).map((d) => differenceSentence(d, base.name, cur)) : [] };
  });

  const breakEven = res.breakEven.map((b) => {
    const rows = ranked.get(b.memberId)!;
    const rankOf = (id: string) => rows.find((r) => r.optionId === id)!.rank;
    return breakEvenSentence({
      memberLabel: memberLabel.get(b.memberId) ?? b.memberId,
      a: { name: optionName.get(b.optionA) ?? b.optionA, pots: sampleOf(base, b.optionA, b.memberId) },
      b: { name: optionName.get(b.optionB) ?? b.optionB, pots: sampleOf(base, b.optionB, b.memberId) },
      crossings: crossingsOf(b),
      lambda,
      leaderAtLambda: rankOf(b.optionA) < rankOf(b.optionB) ? 'a' : 'b',
    });
  });

  const sample = run.result.sample;
  const set = snap.assumptionSet;
  return {
    title: opts.title,
    schemeName: opts.schemeName,
    currency: cur,
    createdAt: opts.createdAt.toISOString(),
    createdOn: date(opts.createdAt),
    runId: run.id,
    runFinishedAt: run.finishedAt ? run.finishedAt.toISOString() : null,
    draft: run.assumptionsDraft,
    assumptionSet: {
      version: set.version,
      status: set.status,
      setAt: date(set.setAt),
      approvedOn: set.approvedAt ? date(set.approvedAt) : null,
      approvedBy: opts.approvedBy,
    },
    lambda,
    lambdaDisplay: lam,
    ceBasis: lambda === run.riskAversion ? 'run' : 'sample',
    percentiles: res.percentiles,
    assumptions: {
      inflation: percent(sc.inflation, 'rate'),
      annuity: `${percent(sc.annuity.realRate, 'rate')} a year real, over ${sc.annuity.years} years`,
      annuityFactor: decimal(res.annuityFactor, 2),
      targetReplacementRatio: percent(sc.targetReplacementRatio, 'rate'),
      funds: sc.funds.map((f) => ({
        name: fundName.get(f.id) ?? f.name,
        expectedReturn: percent(f.expectedReturn, 'rate'),
        volatility: percent(f.volatility, 'rate'),
        annualCharge: percent(f.annualCharge, 'rate'),
      })),
      correlations: {
        names: sc.funds.map((f) => fundName.get(f.id) ?? f.name),
        rows: (sc.correlations ?? sc.funds.map((_, i) => sc.funds.map((__, j) => (i === j ? 1 : 0)))).map((row) => row.map((v) => decimal(v, 2))),
      },
      members: sc.members.map((m) => ({
        label: memberLabel.get(m.id) ?? m.id,
        age: m.age,
        retirementAge: m.retirementAge,
        salary: money(m.salary, cur, 'entered'),
        salaryGrowth: percent(m.salaryGrowth, 'rate'),
        contributionRate: percent(m.contributionRate, 'rate'),
        pot: money(m.pot, cur, 'entered'),
      })),
      stress: snap.stress
        ? `A stress variant was also run: ${fundName.get(snap.stress.fundId) ?? snap.stress.fundId} falls ${percent(snap.stress.fall, 'share')} in the year starting ${snap.stress.yearsBeforeRetirement} year(s) before retirement.`
        : null,
    },
    options: snap.options.map((o) => {
      const eng = sc.options.find((x) => x.id === o.id)!;
      return {
        id: o.id,
        name: o.name,
        description: o.description,
        glidePath: [...eng.glidePath]
          .sort((x, y) => y.yearsToRetirement - x.yearsToRetirement)
          .map((p) => ({
            yearsToRetirement: p.yearsToRetirement,
            weights: Object.entries(p.weights)
              .filter(([, w]) => w > 0)
              .map(([id, w]) => ({ fund: fundName.get(id) ?? id, weight: percent(w, 'share'), fraction: w })),
          })),
      };
    }),
    columns: comparisonColumns(lambda),
    comparison,
    differences,
    baseline: baselineSentence(
      snap.options.map((o) => ({ optionId: o.id, name: o.name })).find((o) => o.optionId === baselineId),
      baselineId,
    ),
    breakEven,
    monteCarlo: {
      paths: res.paths,
      seed: res.seed,
      antithetic: res.antithetic,
      engineVersion: run.result.engineVersion,
      sample: sample.kind === 'all' ? `every path (${count(sample.size)})` : `${count(sample.size)} quantiles of the path distribution`,
      lines: [
        `${count(res.paths)} paths, seed ${res.seed}${res.antithetic ? ', antithetic pairs' : ''}, engine version ${run.result.engineVersion}.`,
        'Every option and member saw the same market paths (common random numbers), so differences between options are not sampling noise between separate draws.',
        'Standard errors: of the mean from the n − 1 sample variance; of the 50th and 5th percentiles from order-statistic intervals; of the probability as √(p(1 − p)/n); of the certainty-equivalent pot by the delta method.',
        lambda === run.riskAversion
          ? `Certainty equivalents at λ = ${lam} are the run's own, computed from every path.`
          : `The run used λ = ${lambdaText(run.riskAversion)}; certainty equivalents at λ = ${lam} are computed from the stored sample of terminal pots (${sample.kind === 'all' ? 'every path' : `${count(sample.size)} quantiles`}).`,
        'The same inputs and seed reproduce these figures exactly.',
      ],
    },
    caution: CAUTION_TEXT,
    draftText: run.assumptionsDraft ? DRAFT_TEXT : null,
  };
}
