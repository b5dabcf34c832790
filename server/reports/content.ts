import { percentileKey } from '../../simulation/statistics';
import type { ScenarioSnapshot } from '../services/scenario';
import type { StoredResult } from '../jobs/result';
import {
  CAUTION_TEXT,
  DRAFT_TEXT,
  STANDARD_ERRORS_TEXT,
  baselineFigureSentence,
  baselineOf,
  baselineSentence,
  breakEvenRows,
  ceBasisText,
  comparisonCells,
  comparisonColumns,
  count,
  date,
  decimal,
  decisionSummary,
  differenceRows,
  differenceSentence,
  differencesToBaseline,
  exactErrors,
  lambda as lambdaText,
  leadCell,
  leadSentence,
  money,
  percent,
  pinFirst,
  rankAt,
  reportQuestion,
  stressCells,
  stressDescription,
  stressSentence,
  summaryCautions,
  tooCloseLines,
  type BreakEvenRow,
  type ComparisonColumn,
  type ComparisonKey,
  type DifferenceCell,
  type ExactFigures,
  type StressKey,
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
  /** Certainty-equivalent lead over the next-ranked option, and the too-close mark (absent from older reports). */
  lead?: { text: string; standardError: string | null; mark: string | null; exact?: number; exactStandardError?: number | null } | null;
};

/** The first page: what the board is asked, and the answer's key figures with their uncertainty. */
export type ReportSummary = {
  question: string;
  options: string[];
  baseline: string;
  /** Per member: the baseline's figures, then whether the top option is separated from the next. */
  keyFigures: string[];
  /** The stress and its effect per member; null when the run had no stress. */
  stress: { description: string; sentences: string[] } | null;
  decision: string;
  cautions: string[];
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
  /** How the certainty equivalents were computed at this λ ('sample': reports made before figures were exact at every λ). */
  ceBasis: 'run' | 'sample' | 'exact';
  /** Absent from reports made before the summary page. */
  summary?: ReportSummary;
  /** Per member: whether the top option is separated, and which ranked neighbours are too close to call. */
  ranking?: { memberId: string; memberLabel: string; lead: string | null; tooClose: string[] }[];
  /** Per member, each option against the baseline as a table: CE, median and chance, each ± its standard error. */
  differenceTables?: { memberId: string; memberLabel: string; baselineName: string; rows: { optionId: string; option: string; ce: DifferenceCell; median: DifferenceCell; chance: DifferenceCell }[] }[];
  /** Break-even λ, one row per member × pair of options (older reports have sentences in `breakEven`). */
  breakEvenTable?: BreakEvenRow[];
  /** The stressed figures beside the base ones, when the run had a stress. */
  stressed?: { description: string; members: { memberId: string; memberLabel: string; rows: Record<StressKey, string>[]; lead: string | null }[] } | null;
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
  /** The exact figures at the report's λ (server/services/runs.ts exactFiguresAt), base and stressed. */
  figures: { base: ExactFigures; stressed: ExactFigures | null };
};

export function buildReportContent(
  run: RunForReport,
  opts: {
    title: string;
    schemeName: string;
    currency: string;
    lambda: number;
    createdAt: Date;
    approvedBy: string | null;
    /** The decision of a signed-off review that used this run, if any. */
    decision?: { reviewTitle: string; signedOffOn: string; sentence: string } | null;
  },
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
  if (run.figures.base.lambda !== lambda) throw new Error(`the report is at λ = ${lambda} but its figures are at λ = ${run.figures.base.lambda}`);
  const ranked = new Map(memberIds.map((id) => [id, rankAt(base, run.figures.base, id, optionName)]));

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
        lead: leadCell(r, cur),
      };
    }),
  );

  const label = (memberId: string) => memberLabel.get(memberId) ?? memberId;
  const againstBaseline = memberIds.map((memberId) => {
    const rows = ranked.get(memberId)!;
    const b = baselineOf(rows, baselineId);
    return { memberId, baseline: b, diffs: b ? differencesToBaseline(rows, b.optionId, exactErrors(run.figures.base, memberId)) : [] };
  });
  const differences = againstBaseline.map(({ memberId, baseline: b, diffs }) => ({ memberId, memberLabel: label(memberId), sentences: b ? diffs.map((d) => differenceSentence(d, b.name, cur)) : [] }));
  const differenceTables = againstBaseline.flatMap(({ memberId, baseline: b, diffs }) => (b && diffs.length ? [{ memberId, memberLabel: label(memberId), baselineName: b.name, rows: differenceRows(diffs, cur) }] : []));
  const paths = run.figures.base.paths;
  const ranking = memberIds.map((memberId) => ({ memberId, memberLabel: label(memberId), lead: leadSentence(ranked.get(memberId)!, cur, paths), tooClose: tooCloseLines(ranked.get(memberId)!) }));
  const breakEvenTable = breakEvenRows(res.breakEven, optionName, memberLabel);

  // A stressed run: the same options and members on the same paths with the shock, at the same λ.
  const stressedVariant = run.result.stressed;
  const stressFigures = run.figures.stressed;
  let stressed: ReportContent['stressed'] = null;
  let stressSentences: string[] = [];
  if (snap.stress && stressedVariant && stressFigures) {
    const description = stressDescription(fundName.get(snap.stress.fundId) ?? snap.stress.fundId, snap.stress.fall, snap.stress.yearsBeforeRetirement);
    const members = memberIds.map((memberId) => {
        const baseRows = pinFirst(ranked.get(memberId)!, baselineId);
        const stressedRanked = rankAt(stressedVariant, stressFigures, memberId, optionName);
        const pairsOf = baseRows.map((b) => ({ base: b, stressed: stressedRanked.find((x) => x.optionId === b.optionId)! }));
        return {
          memberId,
          memberLabel: label(memberId),
          rows: pairsOf.map((p) => stressCells(p.base, p.stressed, cur)),
          lead: leadSentence(stressedRanked, cur, stressFigures.paths),
          sentence: stressSentence(label(memberId), pairsOf, cur),
        };
      });
    stressed = { description, members: members.map(({ sentence: _s, ...m }) => m) };
    stressSentences = members.map((m) => m.sentence);
  }

  const baselineText = baselineSentence(
    snap.options.map((o) => ({ optionId: o.id, name: o.name })).find((o) => o.optionId === baselineId),
    baselineId,
  );
  const summary: ReportSummary = {
    question: reportQuestion({ schemeName: opts.schemeName, options: snap.options.length, members: memberIds.length, lambda }),
    options: snap.options.map((o) => o.name),
    baseline: baselineText,
    // The baseline and the lead sentence already worked out above, member by member.
    keyFigures: againstBaseline.flatMap(({ memberId, baseline: b }, i) => {
      const lead = ranking[i].lead;
      return [...(b ? [baselineFigureSentence(label(memberId), b, ranked.get(memberId)!.length, cur)] : []), ...(lead ? [lead] : [])];
    }),
    stress: stressed ? { description: stressed.description, sentences: stressSentences } : null,
    decision: decisionSummary(opts.decision ?? null),
    cautions: summaryCautions({ paths, antithetic: res.antithetic, draft: run.assumptionsDraft, inflation: percent(sc.inflation, 'rate') }),
  };

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
    ceBasis: 'exact',
    summary,
    ranking,
    differenceTables,
    breakEvenTable,
    stressed,
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
      stress: stressed ? `The run also has a stressed variant, on the same paths: ${stressed.description}.` : null,
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
    baseline: baselineText,
    breakEven: [],
    monteCarlo: {
      paths: res.paths,
      seed: res.seed,
      antithetic: res.antithetic,
      engineVersion: run.result.engineVersion,
      sample: `every path (${count(paths)})`,
      lines: [
        `${count(res.paths)} paths, seed ${res.seed}${res.antithetic ? ', antithetic pairs' : ''}, engine version ${run.result.engineVersion}.`,
        STANDARD_ERRORS_TEXT,
        ceBasisText(lambda, run.riskAversion, paths),
        'The same inputs and seed reproduce these figures exactly.',
      ],
    },
    caution: CAUTION_TEXT,
    draftText: run.assumptionsDraft ? DRAFT_TEXT : null,
  };
}
