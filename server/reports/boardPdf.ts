import { weightsAt } from '../../simulation';
import type { ReportContent, RunForReport } from './content';
import { pctKey } from './content';
import { DRAFT_TEXT } from './caution';
import { currencySymbol, formatMoney } from './format';
import { contentWidth, factRows, fanChart, finishPages, glidePathChart, heading, MARGIN, newDocument, noticeBox, paragraph, PDF_COLORS, table, toBuffer, type Column } from './draw';

const ordinal = (n: number) => `${n}${n % 100 >= 11 && n % 100 <= 13 ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th'}`;
const pctLabel = (p: number) => (p === 50 ? 'Median' : ordinal(p));

/** Renders the board scenario report. Every figure printed comes from `content` (or, for the charts, the run's bands). */
export async function renderBoardReport(content: ReportContent, run: RunForReport): Promise<Buffer> {
  const doc = newDocument({ title: content.title, subject: `${content.schemeName}: scenario report from run ${content.runId}` });
  const symbol = currencySymbol(content.currency);
  const sc = run.input.scenario;
  const res = run.result.base.result;

  // Title page.
  doc.font('semibold').fontSize(11).fillColor(PDF_COLORS.primary).text('KEELSON · BOARD SCENARIO REPORT', MARGIN, 90);
  doc.moveDown(1.5);
  doc.font('bold').fontSize(26).fillColor(PDF_COLORS.ink).text(content.title, { width: contentWidth(doc) });
  doc.moveDown(0.4);
  doc.font('regular').fontSize(14).fillColor(PDF_COLORS.muted).text(content.schemeName, { width: contentWidth(doc) });
  doc.moveDown(2);
  const set = content.assumptionSet;
  const facts: [string, string][] = [
    ['Report date', content.createdOn],
    ['Projection run', content.runId],
    ['Assumption set', `version ${set.version} (${set.status === 'approved' ? 'approved' : 'DRAFT'}), set on ${set.setAt}`],
    ['Approved by', set.approvedBy ? `${set.approvedBy}${set.approvedOn ? `, ${set.approvedOn}` : ''}` : set.status === 'approved' ? `not recorded${set.approvedOn ? ` (approved ${set.approvedOn})` : ''}` : 'not approved'],
    ['Risk aversion (λ)', content.lambdaDisplay],
    ['Monte Carlo', `${content.monteCarlo.paths.toLocaleString('en-GB')} paths, seed ${content.monteCarlo.seed}, engine ${content.monteCarlo.engineVersion}`],
    ['Options compared', content.options.map((o) => o.name).join('; ')],
    ['Illustrative members', content.assumptions.members.map((m) => m.label).join('; ')],
  ];
  factRows(doc, facts);
  doc.moveDown(1);
  if (content.draft) noticeBox(doc, 'DRAFT', [DRAFT_TEXT], 'danger');
  noticeBox(doc, 'Illustration only', [content.caution]);
  paragraph(
    doc,
    `All money is in today's money (real terms, deflated by assumed inflation of ${content.assumptions.inflation} a year) and net of charges. ` +
      `The certainty-equivalent pot is the sure pot the board would value as much as the spread of outcomes, at risk aversion λ = ${content.lambdaDisplay}.`,
    { size: 9.5, color: PDF_COLORS.muted },
  );

  // Assumptions.
  doc.addPage();
  heading(doc, 'Assumptions');
  paragraph(doc, `Inflation ${content.assumptions.inflation} a year. Income is bought at ${content.assumptions.annuity} (annuity factor ${content.assumptions.annuityFactor}). Income target: ${content.assumptions.targetReplacementRatio} of final salary.`);
  table(
    doc,
    [
      { header: 'Fund', width: 215 },
      { header: 'Expected return (a year)', width: 95, align: 'right' },
      { header: 'Volatility (a year)', width: 95, align: 'right' },
      { header: 'Annual charge', width: 90, align: 'right' },
    ],
    content.assumptions.funds.map((f) => [f.name, f.expectedReturn, f.volatility, f.annualCharge]),
  );
  paragraph(doc, 'Correlations of the funds’ returns', { font: 'semibold' });
  const cn = content.assumptions.correlations.names;
  table(
    doc,
    [{ header: '', width: 150 }, ...cn.map((n): Column => ({ header: n.length > 16 ? `${n.slice(0, 15)}…` : n, width: Math.max(45, 345 / cn.length), align: 'right' }))],
    content.assumptions.correlations.rows.map((r, i) => [cn[i], ...r]),
    { size: 7.5 },
  );
  paragraph(doc, 'Illustrative members', { font: 'semibold' });
  table(
    doc,
    [
      { header: 'Member', width: 120 },
      { header: 'Age', width: 40, align: 'right' },
      { header: 'Retires at', width: 55, align: 'right' },
      { header: 'Salary', width: 70, align: 'right' },
      { header: 'Salary growth', width: 65, align: 'right' },
      { header: 'Contribution', width: 70, align: 'right' },
      { header: 'Pot today', width: 75, align: 'right' },
    ],
    content.assumptions.members.map((m) => [m.label, String(m.age), String(m.retirementAge), m.salary, m.salaryGrowth, m.contributionRate, m.pot]),
  );
  if (content.assumptions.stress) paragraph(doc, content.assumptions.stress);

  // Glide paths.
  heading(doc, 'Default options and their glide paths');
  const maxYears = Math.max(...sc.members.map((m) => m.retirementAge - m.age), 10);
  const years = Array.from({ length: maxYears + 1 }, (_, i) => maxYears - i);
  for (const o of content.options) {
    const eng = sc.options.find((x) => x.id === o.id)!;
    const series = sc.funds
      .map((f) => ({ name: content.assumptions.funds[sc.funds.indexOf(f)].name, weights: years.map((y) => weightsAt(eng.glidePath, sc.funds.map((x) => x.id), y)[sc.funds.indexOf(f)]) }))
      .filter((s) => s.weights.some((w) => w > 0));
    glidePathChart(doc, { title: o.name, years, series });
    if (o.description) paragraph(doc, o.description, { size: 9, color: PDF_COLORS.muted });
    paragraph(doc, o.glidePath.map((p) => `${p.yearsToRetirement} years to go: ${p.weights.map((w) => `${w.fund} ${w.weight}`).join(', ')}`).join('. ') + '.', { size: 8.5 });
  }

  // Fan charts.
  doc.addPage();
  heading(doc, "Projected pots in today's money");
  const ps = res.percentiles;
  const outer = [Math.min(...ps), Math.max(...ps)];
  const innerCandidates = ps.filter((p) => p > outer[0] && p < 50);
  const inner = [innerCandidates.length ? innerCandidates[innerCandidates.length - 1] : outer[0], 0];
  inner[1] = 100 - inner[0];
  if (!ps.includes(inner[1])) inner[1] = outer[1];
  for (const pair of res.results) {
    const row = content.comparison.find((r) => r.optionId === pair.optionId && r.memberId === pair.memberId)!;
    const b = pair.bands.real;
    fanChart(doc, {
      title: `${row.optionName}: ${row.memberLabel}`,
      ages: pair.ages,
      lowOuter: b[pctKey(outer[0])],
      highOuter: b[pctKey(outer[1])],
      lowInner: b[pctKey(inner[0])],
      highInner: b[pctKey(inner[1])],
      median: b.p50,
      target: pair.atRetirement.targetRealPot,
      symbol,
      outerLabel: `${ordinal(outer[0])}–${ordinal(outer[1])} percentile`,
      innerLabel: `${ordinal(inner[0])}–${ordinal(inner[1])} percentile`,
      summary: `At ${pair.ages[pair.ages.length - 1]}: median ${row.display.percentilesReal.p50}; ${ordinal(outer[0])} to ${ordinal(outer[1])} percentile ${row.display.percentilesReal[pctKey(outer[0])]} to ${row.display.percentilesReal[pctKey(outer[1])]}; target pot ${row.display.targetRealPot}.`,
    });
  }

  // Comparison.
  doc.addPage();
  heading(doc, 'Comparison of options');
  paragraph(doc, `Pots at retirement in today's money. Certainty equivalents at λ = ${content.lambdaDisplay}. Exact values are in the CSV export of this table.`, { size: 9, color: PDF_COLORS.muted });
  const memberIds = [...new Set(content.comparison.map((r) => r.memberId))];
  for (const memberId of memberIds) {
    const rows = content.comparison.filter((r) => r.memberId === memberId);
    paragraph(doc, rows[0].memberLabel, { font: 'semibold', size: 11 });
    table(
      doc,
      [{ header: 'Option', width: 130 }, ...ps.map((p): Column => ({ header: `${pctLabel(p)}`, width: 52, align: 'right' }))],
      rows.map((r) => [r.optionName, ...ps.map((p) => r.display.percentilesReal[pctKey(p)])]),
    );
    table(
      doc,
      [
        { header: 'Option', width: 130 },
        { header: 'Mean', width: 58, align: 'right' },
        { header: 'Chance of target', width: 52, align: 'right' },
        { header: 'Average of worst 5%', width: 62, align: 'right' },
        { header: 'Median income a year', width: 60, align: 'right' },
        { header: `CE pot (λ = ${content.lambdaDisplay})`, width: 62, align: 'right' },
        { header: 'CE return a year', width: 50, align: 'right' },
      ],
      rows.map((r) => [r.optionName, r.display.meanReal, r.display.probabilityReachingTarget, r.display.expectedShortfallReal, r.display.medianRealIncome, r.display.certaintyEquivalentPot, r.display.certaintyEquivalentReturn]),
    );
  }
  if (content.breakEven.length) {
    paragraph(doc, 'Where the board’s risk appetite changes the choice', { font: 'semibold', size: 11 });
    for (const s of content.breakEven) paragraph(doc, s);
  }

  // Monte Carlo details.
  heading(doc, 'Monte Carlo details');
  for (const l of content.monteCarlo.lines) paragraph(doc, l, { size: 9.5 });
  table(
    doc,
    [
      { header: 'Option', width: 130 },
      { header: 'Member', width: 95 },
      { header: 'SE of mean', width: 68, align: 'right' },
      { header: 'SE of median', width: 68, align: 'right' },
      { header: 'SE of 5th', width: 68, align: 'right' },
      { header: 'SE of chance', width: 66, align: 'right' },
    ],
    content.comparison.map((r) => [r.optionName, r.memberLabel, r.standardErrors.meanReal, r.standardErrors.p50Real, r.standardErrors.p5Real, r.standardErrors.probabilityReachingTarget]),
  );

  heading(doc, 'Cautions');
  if (content.draft) noticeBox(doc, 'DRAFT', [DRAFT_TEXT], 'danger');
  noticeBox(doc, 'Illustration only', [
    content.caution,
    'Markets can behave outside the assumed range: the percentiles describe the model, not the limits of what can happen.',
    `Figures are rounded to the nearest ${formatMoney(1, content.currency)} for reading; the CSV export carries exact values.`,
  ]);

  finishPages(doc, `${content.schemeName} · ${content.title} · run ${content.runId.slice(0, 8)}${content.draft ? ' · DRAFT' : ''}`, content.draft);
  return toBuffer(doc);
}

export function comparisonCsvRows(content: ReportContent) {
  const ps = content.percentiles;
  const header = [
    'member',
    'option',
    ...ps.map((p) => `real_pot_p${p}`),
    'real_pot_mean',
    'probability_reaching_target',
    'target_real_pot',
    'expected_shortfall_real_worst_5pct',
    'median_real_income',
    'risk_aversion_lambda',
    'certainty_equivalent_real_pot',
    'certainty_equivalent_real_return',
  ];
  const rows = content.comparison.map((r) => [
    r.memberLabel,
    r.optionName,
    ...ps.map((p) => r.exact.percentilesReal[pctKey(p)]),
    r.exact.meanReal,
    r.exact.probabilityReachingTarget,
    r.exact.targetRealPot,
    r.exact.expectedShortfallReal,
    r.exact.medianRealIncome,
    content.lambda,
    r.exact.certaintyEquivalentPot,
    r.exact.certaintyEquivalentReturn,
  ]);
  return { header, rows };
}
