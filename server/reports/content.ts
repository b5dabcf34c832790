import { BREAK_EVEN_RANGE, certaintyEquivalentPot, ceAnnualReturn, memberTimeline } from '../../simulation';
import type { ScenarioSnapshot } from '../services/scenario';
import type { PairFigures, StoredResult } from '../jobs/result';
import { CAUTION_TEXT, DRAFT_TEXT } from './caution';
import { formatDate, formatLambda, formatMoney, formatPercent } from './format';

/**
 * The content of a board scenario report: every figure and sentence the PDF prints, exact and
 * as displayed. It is stored with the report, so the app shows the same words as the file.
 */
export type ComparisonRow = {
  memberId: string;
  memberLabel: string;
  optionId: string;
  optionName: string;
  /** Exact values in the scheme's currency (real terms, today's money) and fractions. */
  exact: {
    meanReal: number;
    percentilesReal: Record<string, number>;
    probabilityReachingTarget: number | null;
    targetRealPot: number;
    expectedShortfallReal: number;
    medianRealIncome: number;
    certaintyEquivalentPot: number;
    certaintyEquivalentReturn: number | null;
  };
  /** The same figures formatted as printed. */
  display: {
    meanReal: string;
    percentilesReal: Record<string, string>;
    probabilityReachingTarget: string;
    targetRealPot: string;
    expectedShortfallReal: string;
    medianRealIncome: string;
    certaintyEquivalentPot: string;
    certaintyEquivalentReturn: string;
  };
  standardErrors: { meanReal: string; p50Real: string; p5Real: string; probabilityReachingTarget: string };
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
  options: { id: string; name: string; description: string; glidePath: { yearsToRetirement: number; weights: { fund: string; weight: string }[] }[] }[];
  comparison: ComparisonRow[];
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
};

export function pctKey(p: number): string {
  return `p${p}`;
}

/** Certainty-equivalent pot and return for one pair at λ: the run's own figure at the run's λ, else from the stored sample. */
function ceAt(run: RunForReport, pair: PairFigures, lambda: number): { pot: number; ret: number | null } {
  if (lambda === run.riskAversion) {
    return { pot: pair.atRetirement.certaintyEquivalent.realPot, ret: pair.atRetirement.certaintyEquivalent.realAnnualReturn };
  }
  const sample = run.result.base.samples.find((s) => s.optionId === pair.optionId && s.memberId === pair.memberId);
  if (!sample) throw new Error(`run ${run.id} has no stored sample for ${pair.optionId} × ${pair.memberId}`);
  const pot = certaintyEquivalentPot(sample.realPots, lambda);
  const m = run.input.scenario.members.find((x) => x.id === pair.memberId)!;
  const t = memberTimeline(m, run.input.scenario.inflation);
  return { pot, ret: ceAnnualReturn(pot, { initialPot: t.initialPot, contributions: t.realContributions }) };
}

export function buildReportContent(
  run: RunForReport,
  opts: { title: string; schemeName: string; currency: string; lambda: number; createdAt: Date; approvedBy: string | null },
): ReportContent {
  const snap = run.input;
  const sc = snap.scenario;
  const res = run.result.base.result;
  const cur = opts.currency;
  const money = (v: number) => formatMoney(v, cur);
  const fundName = new Map(snap.funds.map((f) => [f.id, f.name]));
  const optionName = new Map(snap.options.map((o) => [o.id, o.name]));
  const memberLabel = new Map(snap.members.map((m) => [m.id, m.label]));
  const lambda = opts.lambda;

  const comparison: ComparisonRow[] = res.results.map((pair) => {
    const a = pair.atRetirement;
    const ce = ceAt(run, pair, lambda);
    const percentilesReal = Object.fromEntries(res.percentiles.map((p) => [pctKey(p), a.percentiles.real[pctKey(p)]]));
    const exact = {
      meanReal: a.mean.real,
      percentilesReal,
      probabilityReachingTarget: a.probabilityReachingTarget,
      targetRealPot: a.targetRealPot,
      expectedShortfallReal: a.expectedShortfall.real,
      medianRealIncome: a.realIncome.p50,
      certaintyEquivalentPot: ce.pot,
      certaintyEquivalentReturn: ce.ret,
    };
    return {
      memberId: pair.memberId,
      memberLabel: memberLabel.get(pair.memberId) ?? pair.memberId,
      optionId: pair.optionId,
      optionName: optionName.get(pair.optionId) ?? pair.optionId,
      exact,
      display: {
        meanReal: money(exact.meanReal),
        percentilesReal: Object.fromEntries(Object.entries(percentilesReal).map(([k, v]) => [k, money(v)])),
        probabilityReachingTarget: formatPercent(exact.probabilityReachingTarget, 0),
        targetRealPot: money(exact.targetRealPot),
        expectedShortfallReal: money(exact.expectedShortfallReal),
        medianRealIncome: money(exact.medianRealIncome),
        certaintyEquivalentPot: money(exact.certaintyEquivalentPot),
        certaintyEquivalentReturn: formatPercent(exact.certaintyEquivalentReturn, 2),
      },
      standardErrors: {
        meanReal: money(a.standardError.real),
        p50Real: money(pair.extraStandardErrors.p50Real),
        p5Real: money(pair.extraStandardErrors.p5Real),
        probabilityReachingTarget: formatPercent(pair.extraStandardErrors.probabilityReachingTarget, 1),
      },
    };
  });

  const lam = formatLambda(lambda);
  const breakEven = res.breakEven.map((b) => {
    const member = memberLabel.get(b.memberId) ?? b.memberId;
    const A = optionName.get(b.optionA) ?? b.optionA;
    const B = optionName.get(b.optionB) ?? b.optionB;
    const ca = comparison.find((r) => r.memberId === b.memberId && r.optionId === b.optionA)!;
    const cb = comparison.find((r) => r.memberId === b.memberId && r.optionId === b.optionB)!;
    const better = ca.exact.certaintyEquivalentPot >= cb.exact.certaintyEquivalentPot ? A : B;
    if (b.status === 'identical') return `For ${member}, ${A} and ${B} give the same pot on every path, so neither is preferred at any λ.`;
    if (b.status === 'found' && b.lambda !== null) {
      return `For ${member}, ${A} and ${B} have equal certainty-equivalent pots at λ = ${formatLambda(b.lambda)}. At the chosen λ = ${lam}, ${better} has the higher certainty-equivalent pot.`;
    }
    return `For ${member}, ${A} and ${B} have no break-even λ between ${BREAK_EVEN_RANGE[0]} and ${BREAK_EVEN_RANGE[1]}; at the chosen λ = ${lam}, ${better} has the higher certainty-equivalent pot.`;
  });

  const sample = run.result.sample;
  const set = snap.assumptionSet;
  return {
    title: opts.title,
    schemeName: opts.schemeName,
    currency: cur,
    createdAt: opts.createdAt.toISOString(),
    createdOn: formatDate(opts.createdAt),
    runId: run.id,
    runFinishedAt: run.finishedAt ? run.finishedAt.toISOString() : null,
    draft: run.assumptionsDraft,
    assumptionSet: {
      version: set.version,
      status: set.status,
      setAt: formatDate(set.setAt),
      approvedOn: set.approvedAt ? formatDate(set.approvedAt) : null,
      approvedBy: opts.approvedBy,
    },
    lambda,
    lambdaDisplay: lam,
    ceBasis: lambda === run.riskAversion ? 'run' : 'sample',
    percentiles: res.percentiles,
    assumptions: {
      inflation: formatPercent(sc.inflation, 2),
      annuity: `${formatPercent(sc.annuity.realRate, 2)} a year real, over ${sc.annuity.years} years`,
      annuityFactor: res.annuityFactor.toFixed(2),
      targetReplacementRatio: formatPercent(sc.targetReplacementRatio, 0),
      funds: sc.funds.map((f) => ({
        name: fundName.get(f.id) ?? f.name,
        expectedReturn: formatPercent(f.expectedReturn, 2),
        volatility: formatPercent(f.volatility, 2),
        annualCharge: formatPercent(f.annualCharge, 2),
      })),
      correlations: {
        names: sc.funds.map((f) => fundName.get(f.id) ?? f.name),
        rows: (sc.correlations ?? sc.funds.map((_, i) => sc.funds.map((__, j) => (i === j ? 1 : 0)))).map((row) => row.map((v) => v.toFixed(2))),
      },
      members: sc.members.map((m) => ({
        label: memberLabel.get(m.id) ?? m.id,
        age: m.age,
        retirementAge: m.retirementAge,
        salary: money(m.salary),
        salaryGrowth: formatPercent(m.salaryGrowth, 2),
        contributionRate: formatPercent(m.contributionRate, 1),
        pot: money(m.pot),
      })),
      stress: snap.stress
        ? `A stress variant was also run: ${fundName.get(snap.stress.fundId) ?? snap.stress.fundId} falls ${formatPercent(snap.stress.fall, 0)} in the year starting ${snap.stress.yearsBeforeRetirement} year(s) before retirement.`
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
              .map(([id, w]) => ({ fund: fundName.get(id) ?? id, weight: formatPercent(w, 0) })),
          })),
      };
    }),
    comparison,
    breakEven,
    monteCarlo: {
      paths: res.paths,
      seed: res.seed,
      antithetic: res.antithetic,
      engineVersion: run.result.engineVersion,
      sample: sample.kind === 'all' ? `every path (${sample.size})` : `${sample.size.toLocaleString('en-GB')} quantiles of the path distribution`,
      lines: [
        `${res.paths.toLocaleString('en-GB')} paths, seed ${res.seed}${res.antithetic ? ', antithetic pairs' : ''}, engine version ${run.result.engineVersion}.`,
        'Every option and member saw the same market paths (common random numbers), so differences between options are not sampling noise between separate draws.',
        'Standard errors: of the mean from the n − 1 sample variance; of the 50th and 5th percentiles from order-statistic intervals; of the probability as √(p(1 − p)/n).',
        lambda === run.riskAversion
          ? `Certainty equivalents at λ = ${lam} are the run's own, computed from every path.`
          : `The run used λ = ${formatLambda(run.riskAversion)}; certainty equivalents at λ = ${lam} are computed from the stored sample of terminal pots (${sample.kind === 'all' ? 'every path' : `${sample.size} quantiles`}).`,
        'The same inputs and seed reproduce these figures exactly.',
      ],
    },
    caution: CAUTION_TEXT,
    draftText: run.assumptionsDraft ? DRAFT_TEXT : null,
  };
}
