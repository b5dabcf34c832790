import { weightsAt } from '../../simulation';
import { percentileKey } from '../../simulation/statistics';
import { optionStyle } from '../../constants/theme';
import { BREAK_EVEN_COLUMNS, breakEvenNote, count, differenceColumns, DRAFT_TEXT, fanChartSummary, glideMixText, LEAD_COLUMN_LABEL, moneyRoundingNote, NOT_SEPARATED_TEXT, percentileLabel, STRESS_COLUMNS, type DifferenceCell } from '../../figures';
import type { ReportContent, RunForReport } from './content';
import { contentWidth, factRows, fanChart, finishPages, glidePathChart, heading, MARGIN, newDocument, noticeBox, optionSwatch, paragraph, PDF_COLORS, table, toBuffer, type Column } from './draw';

/**
 * Renders the board scenario report. Every figure printed comes from `content` (or, for the
 * charts, the run's bands through figures/). `schemeFundIds` is the scheme's list of funds, whose
 * order gives each fund its colour, as on screen.
 */
export async function renderBoardReport(content: ReportContent, run: RunForReport, schemeFundIds: string[] = []): Promise<Buffer> {
  const doc = newDocument({ title: content.title, subject: `${content.schemeName}: scenario report from run ${content.runId}` });
  const sc = run.input.scenario;
  const colourIndex = (fundId: string, fallback: number) => {
    const i = schemeFundIds.indexOf(fundId);
    return i >= 0 ? i : schemeFundIds.length + fallback;
  };
  const optionIndex = (optionId: string) => sc.options.findIndex((o) => o.id === optionId);
  const res = run.result.base.result;

  // Title page.
  doc.font('semibold').fontSize(11).fillColor(PDF_COLORS.primary).text('KEELSON · BOARD SCENARIO REPORT', MARGIN, 90);
  doc.moveDown(1.5);
  doc.font('bold').fontSize(26).fillColor(PDF_COLORS.ink).text(content.title, { width: contentWidth(doc) });
  doc.moveDown(0.4);
  doc.font('regular').fontSize(14).fillColor(PDF_COLORS.muted).text(content.schemeName, { width: contentWidth(doc) });
  doc.moveDown(1);
  if (content.summary) summaryPage(doc, content);

  // What the report is made from.
  if (content.summary) doc.addPage();
  heading(doc, 'This report');
  const set = content.assumptionSet;
  const facts: [string, string][] = [
    ['Report date', content.createdOn],
    ['Projection run', content.runId],
    ['Assumption set', `version ${set.version} (${set.status === 'approved' ? 'approved' : 'DRAFT'}), set on ${set.setAt}`],
    ['Approved by', set.approvedBy ? `${set.approvedBy}${set.approvedOn ? `, ${set.approvedOn}` : ''}` : set.status === 'approved' ? `not recorded${set.approvedOn ? ` (approved ${set.approvedOn})` : ''}` : 'not approved'],
    ['Risk aversion (λ)', content.lambdaDisplay],
    ['Monte Carlo', `${count(content.monteCarlo.paths)} paths, seed ${content.monteCarlo.seed}, engine ${content.monteCarlo.engineVersion}`],
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
    const ids = sc.funds.map((x) => x.id);
    const series = sc.funds
      .map((f, k) => ({ name: content.assumptions.funds[k].name, colourIndex: colourIndex(f.id, k), weights: years.map((y) => weightsAt(eng.glidePath, ids, y)[k]) }))
      .filter((s) => s.weights.some((w) => w > 0));
    glidePathChart(doc, { title: o.name, years, series });
    if (o.description) paragraph(doc, o.description, { size: 9, color: PDF_COLORS.muted });
    paragraph(doc, o.glidePath.map((p) => glideMixText(p.yearsToRetirement, p.weights.map((w) => ({ name: w.fund, weight: w.fraction ?? Number.NaN })))).join('. ') + '.', { size: 8.5 });
  }

  // Fan charts.
  doc.addPage();
  heading(doc, "Projected pots in today's money");
  const ps = res.percentiles;
  for (const memberId of [...new Set(content.comparison.map((r) => r.memberId))]) {
    const pairs = res.results.filter((p) => p.memberId === memberId);
    // One money axis per member, so the options' charts compare at a glance (as on screen).
    const yMax = Math.max(...pairs.map((p) => Math.max(...p.bands.real.p95, p.atRetirement.targetRealPot))) * 1.05;
    for (const row of content.comparison.filter((r) => r.memberId === memberId)) {
      const pair = pairs.find((p) => p.optionId === row.optionId)!;
      const title = `${row.optionName} — ${row.memberLabel}`;
      fanChart(doc, {
        title,
        ages: pair.ages,
        bands: pair.bands.real,
        target: pair.atRetirement.targetRealPot,
        currency: content.currency,
        yMax,
        option: optionStyle(optionIndex(row.optionId)),
        summary: fanChartSummary({ title, ages: pair.ages, bands: pair.bands.real, target: pair.atRetirement.targetRealPot, currency: content.currency, realTerms: true }),
      });
    }
  }

  // Comparison.
  doc.addPage();
  heading(doc, 'Comparison of options');
  paragraph(doc, `Pots at retirement in today's money, options ranked by certainty-equivalent pot at λ = ${content.lambdaDisplay}. ± is one Monte Carlo standard error. Exact values are in the CSV export of this table.`, { size: 9, color: PDF_COLORS.muted });
  if (content.baseline) paragraph(doc, content.baseline, { size: 9, color: PDF_COLORS.muted });
  const memberIds = [...new Set(content.comparison.map((r) => r.memberId))];
  const cell = (r: ReportContent['comparison'][number], key: ReportContent['columns'][number]['key']) => {
    const se = r.standardErrors[key];
    return se ? `${r.display[key]}\n${se}` : r.display[key];
  };
  for (const memberId of memberIds) {
    const rows = content.comparison.filter((r) => r.memberId === memberId);
    paragraph(doc, rows[0].memberLabel, { font: 'semibold', size: 11 });
    const lead = (r: (typeof rows)[number]) => (r.lead ? [r.lead.text, r.lead.standardError, r.lead.mark].filter(Boolean).join('\n') : '—');
    const [ceColumn, ...otherColumns] = content.columns;
    table(
      doc,
      [
        { header: 'Rank and option', width: 110 },
        { header: ceColumn.label, width: 62, align: 'right' },
        ...(content.ranking ? [{ header: LEAD_COLUMN_LABEL, width: 70, align: 'right' } as Column] : []),
        ...otherColumns.map((c): Column => ({ header: c.label, width: 58, align: 'right' })),
      ],
      rows.map((r) => [`${r.rank}. ${r.optionName}`, cell(r, ceColumn.key), ...(content.ranking ? [lead(r)] : []), ...otherColumns.map((c) => cell(r, c.key))]),
      { size: 7.5 },
    );
    const ranking = content.ranking?.find((x) => x.memberId === memberId);
    if (ranking?.lead) paragraph(doc, ranking.lead, { size: 9, font: 'semibold' });
    for (const t of ranking?.tooClose ?? []) paragraph(doc, t, { size: 9 });
    table(
      doc,
      [{ header: 'Option', width: 130 }, ...ps.map((p): Column => ({ header: percentileLabel(p), width: 52, align: 'right' }))],
      rows.map((r) => [r.optionName, ...ps.map((p) => r.display.percentilesReal[percentileKey(p)])]),
    );
    const dt = content.differenceTables?.find((d) => d.memberId === memberId);
    if (dt) {
      const [option, ...figs] = differenceColumns(dt.baselineName);
      const shown = (c: DifferenceCell) => [c.text, c.standardError, c.tooCloseToCall ? NOT_SEPARATED_TEXT : null].filter(Boolean).join('\n');
      table(
        doc,
        [{ header: option.label, width: 150 }, ...figs.map((c): Column => ({ header: c.label, width: 115, align: 'right' }))],
        dt.rows.map((r) => [r.option, shown(r.ce), shown(r.median), shown(r.chance)]),
        { size: 8 },
      );
    } else {
      for (const d of content.differences?.find((x) => x.memberId === memberId)?.sentences ?? []) paragraph(doc, d, { size: 9 });
    }
  }
  paragraph(doc, 'How each option is marked in the charts', { font: 'semibold', size: 10 });
  for (const o of content.options) {
    const yy = doc.y;
    optionSwatch(doc, MARGIN, yy + 5, optionStyle(optionIndex(o.id)));
    doc.font('regular').fontSize(9).fillColor(PDF_COLORS.ink).text(o.name, MARGIN + 28, yy, { width: contentWidth(doc) - 28 });
    doc.moveDown(0.2);
  }
  doc.x = MARGIN;
  if (content.breakEvenTable?.length) {
    paragraph(doc, 'Where the board’s risk appetite changes the order', { font: 'semibold', size: 11 });
    table(
      doc,
      BREAK_EVEN_COLUMNS.map((c): Column => ({ header: c.label, width: c.key === 'text' ? 215 : 140 })),
      content.breakEvenTable.map((r) => BREAK_EVEN_COLUMNS.map((c) => r[c.key])),
      { size: 8.5 },
    );
    paragraph(doc, breakEvenNote(), { size: 8.5, color: PDF_COLORS.muted });
  } else if (content.breakEven.length) {
    paragraph(doc, 'Where the board’s risk appetite changes the choice', { font: 'semibold', size: 11 });
    for (const s of content.breakEven) paragraph(doc, s);
  }

  // The stressed variant, beside the base figures.
  if (content.stressed) {
    heading(doc, 'Under stress');
    paragraph(doc, `The same paths with ${content.stressed.description}; figures at λ = ${content.lambdaDisplay}, each without and with the stress.`, { size: 9, color: PDF_COLORS.muted });
    for (const m of content.stressed.members) {
      paragraph(doc, m.memberLabel, { font: 'semibold', size: 11 });
      table(
        doc,
        STRESS_COLUMNS.map((c): Column => ({ header: c.label, width: c.key === 'option' ? 110 : 68, align: c.key === 'option' ? 'left' : 'right' })),
        m.rows.map((r) => STRESS_COLUMNS.map((c) => r[c.key])),
        { size: 7.5 },
      );
      if (m.lead) paragraph(doc, m.lead, { size: 9 });
    }
  }

  // Monte Carlo details.
  heading(doc, 'Monte Carlo details');
  for (const l of content.monteCarlo.lines) paragraph(doc, l, { size: 9.5 });
  table(
    doc,
    [
      { header: 'Option', width: 130 },
      { header: 'Member', width: 95 },
      { header: 'SE of CE pot', width: 56, align: 'right' },
      { header: 'SE of mean', width: 56, align: 'right' },
      { header: 'SE of median', width: 56, align: 'right' },
      { header: 'SE of 5th', width: 56, align: 'right' },
      { header: 'SE of chance', width: 52, align: 'right' },
    ],
    content.comparison.map((r) => [
      r.optionName,
      r.memberLabel,
      ...(['certaintyEquivalentPot', 'meanReal', 'medianReal', 'p5Real', 'probabilityReachingTarget'] as const).map((k) => (r.standardErrors[k] ?? '—').replace(/^± /, '')),
    ]),
  );

  heading(doc, 'Cautions');
  if (content.draft) noticeBox(doc, 'DRAFT', [DRAFT_TEXT], 'danger');
  noticeBox(doc, 'Illustration only', [
    content.caution,
    'Markets can behave outside the assumed range: the percentiles describe the model, not the limits of what can happen.',
    `${moneyRoundingNote('pot', content.currency)} ${moneyRoundingNote('income', content.currency)} ${moneyRoundingNote('standardError', content.currency)} The CSV export carries exact values.`,
  ]);

  finishPages(doc, `${content.schemeName} · ${content.title} · run ${content.runId.slice(0, 8)}${content.draft ? ' · DRAFT' : ''}`, content.draft);
  return toBuffer(doc);
}

/** The first page: the question, the options, the baseline, key figures with their uncertainty, stress, decision and cautions. */
function summaryPage(doc: Parameters<typeof heading>[0], content: ReportContent) {
  const sm = content.summary!;
  heading(doc, 'Summary');
  paragraph(doc, sm.question);
  paragraph(doc, `Options: ${sm.options.join('; ')}.`, { size: 9.5 });
  paragraph(doc, sm.baseline, { size: 9.5 });
  paragraph(doc, 'Key figures', { font: 'semibold', size: 11 });
  for (const k of sm.keyFigures) paragraph(doc, k, { size: 9.5 });
  if (sm.stress) {
    paragraph(doc, `Under stress: ${sm.stress.description}`, { font: 'semibold', size: 11 });
    for (const k of sm.stress.sentences) paragraph(doc, k, { size: 9.5 });
  }
  paragraph(doc, 'Decision', { font: 'semibold', size: 11 });
  paragraph(doc, sm.decision, { size: 9.5 });
  noticeBox(doc, 'Main cautions', [content.caution, ...sm.cautions], content.draft ? 'danger' : 'caution');
}

/**
 * The comparison as CSV rows: for every figure its exact value (`_exact`), its standard error
 * where it has one (`_standard_error_exact`) and the text as printed (`_as_shown`), then the
 * percentiles. Money is real (today's money) in the scheme's currency; rates are fractions.
 */
export function comparisonCsvRows(content: ReportContent) {
  const ps = content.percentiles;
  const withSe = content.columns.filter((c) => content.comparison.some((r) => r.exactStandardErrors?.[c.key] !== undefined));
  // Each option's certainty-equivalent lead over the next-ranked one (reports made before it was stored have none).
  const hasLead = content.comparison.some((r) => r.lead !== undefined);
  const header = [
    'member',
    'option',
    'rank',
    'risk_aversion_lambda',
    ...content.columns.map((c) => `${c.csv}_exact`),
    ...withSe.map((c) => `${c.csv}_standard_error_exact`),
    ...ps.map((p) => `real_pot_p${p}_exact`),
    'target_real_pot_exact',
    ...content.columns.map((c) => `${c.csv}_as_shown`),
    ...ps.map((p) => `real_pot_p${p}_as_shown`),
    ...(hasLead ? ['ahead_of_next_exact', 'ahead_of_next_standard_error_exact', 'ahead_of_next_as_shown', 'too_close_to_call'] : []),
  ];
  const rows = content.comparison.map((r) => [
    r.memberLabel,
    r.optionName,
    r.rank,
    content.lambda,
    ...content.columns.map((c) => r.exact[c.key]),
    ...withSe.map((c) => r.exactStandardErrors?.[c.key]),
    ...ps.map((p) => r.exact.percentilesReal[percentileKey(p)]),
    r.exact.targetRealPot,
    ...content.columns.map((c) => r.display[c.key]),
    ...ps.map((p) => r.display.percentilesReal[percentileKey(p)]),
    ...(hasLead ? [r.lead?.exact, r.lead?.exactStandardError, r.lead ? [r.lead.text, r.lead.standardError].filter(Boolean).join(' ') : '', r.lead?.mark ?? ''] : []),
  ]);
  return { header, rows };
}
