import { CAUTION_TEXT, moneyRoundingNote, roundFigures, STATEMENT_PERCENTILES, statementText, type StatementFigures } from '../../figures';
import { toCsv } from './csv';
import { contentWidth, finishPages, MARGIN, newDocument, noticeBox, paragraph, PDF_COLORS, toBuffer } from './draw';

/** Member statements as a PDF: one page per member (one file for many members). */
export async function renderStatements(all: StatementFigures[]): Promise<Buffer> {
  const doc = newDocument({ title: all.length === 1 ? `Pension projection for ${all[0].memberLabel}` : `Pension projections for ${all.length} members`, subject: 'Member pension projection' });
  all.forEach((f, i) => {
    if (i > 0) doc.addPage();
    const t = statementText(f);
    doc.font('semibold').fontSize(9).fillColor(PDF_COLORS.primary).text('YOUR PENSION PROJECTION', MARGIN, MARGIN);
    doc.moveDown(0.4);
    doc.font('bold').fontSize(19).fillColor(PDF_COLORS.ink).text(t.title, { width: contentWidth(doc) });
    doc.moveDown(0.5);
    for (const s of t.intro) paragraph(doc, s, { size: 11 });
    // Three cases side by side.
    const w = contentWidth(doc);
    const gap = 10;
    const bw = (w - gap * 2) / 3;
    const y = doc.y + 4;
    t.cases.forEach((c, k) => {
      const x = MARGIN + k * (bw + gap);
      const fill = c.key === 'typical' ? PDF_COLORS.accentTint : PDF_COLORS.primaryTint;
      doc.save().roundedRect(x, y, bw, 74, 6).fill(fill).restore();
      doc.font('semibold').fontSize(10).fillColor(PDF_COLORS.muted).text(c.label, x + 10, y + 9, { width: bw - 20 });
      doc.font('bold').fontSize(18).fillColor(PDF_COLORS.ink).text(c.pot, x + 10, y + 26, { width: bw - 20 });
      doc.font('regular').fontSize(9.5).fillColor(PDF_COLORS.ink).text(`about ${c.income} a year`, x + 10, y + 52, { width: bw - 20 });
    });
    doc.x = MARGIN;
    doc.y = y + 86;
    for (const c of t.cases) paragraph(doc, c.sentence, { size: 11 });
    paragraph(doc, 'The income it could buy', { font: 'bold', size: 13, color: PDF_COLORS.primary });
    for (const s of t.income) paragraph(doc, s, { size: 11 });
    paragraph(doc, 'What would change it', { font: 'bold', size: 13, color: PDF_COLORS.primary });
    for (const s of t.changes) paragraph(doc, s, { size: 11 });
    paragraph(doc, 'About these figures', { font: 'bold', size: 13, color: PDF_COLORS.primary });
    for (const s of t.notes) paragraph(doc, s, { size: 10, color: PDF_COLORS.muted });
    noticeBox(doc, 'Please read', t.caution, f.draft ? 'danger' : 'caution');
  });
  finishPages(doc, all.length === 1 ? `Pension projection for ${all[0].memberLabel}` : 'Pension projections', all.some((f) => f.draft));
  return toBuffer(doc);
}

/**
 * Statements as CSV: the figures a member reads (rounded by figures/, as numbers), the exact
 * figures behind them, the rounding rule in words and the caution.
 */
export function statementCsv(all: StatementFigures[]): string {
  const P = STATEMENT_PERCENTILES;
  const header = [
    'member',
    'option',
    'age',
    'retirement_age',
    `weak_pot_p${P.weak}_rounded`,
    `typical_pot_p${P.typical}_rounded`,
    `strong_pot_p${P.strong}_rounded`,
    `weak_income_p${P.weak}_rounded`,
    `typical_income_p${P.typical}_rounded`,
    `strong_income_p${P.strong}_rounded`,
    'extra_contribution_adds_rounded',
    'later_retirement_adds_rounded',
    `weak_pot_p${P.weak}_exact`,
    `typical_pot_p${P.typical}_exact`,
    `strong_pot_p${P.strong}_exact`,
    `weak_income_p${P.weak}_exact`,
    `typical_income_p${P.typical}_exact`,
    `strong_income_p${P.strong}_exact`,
    'extra_contribution_adds_exact',
    'later_retirement_adds_exact',
    'paths',
    'draft_assumptions',
    'rounding',
    'caution',
  ];
  const rows = all.map((f) => {
    const rounding = `${moneyRoundingNote('pot', f.currency)} ${moneyRoundingNote('income', f.currency)} Today's money.`;
    const r = roundFigures(f);
    return [
      f.memberLabel,
      f.optionName,
      f.age,
      f.retirementAge,
      r.pots.weak,
      r.pots.typical,
      r.pots.strong,
      r.incomes.weak,
      r.incomes.typical,
      r.incomes.strong,
      r.extraContribution,
      r.laterRetirement,
      f.pots.weak,
      f.pots.typical,
      f.pots.strong,
      f.incomes.weak,
      f.incomes.typical,
      f.incomes.strong,
      f.whatIf.extraContribution,
      f.whatIf.laterRetirement,
      f.paths,
      f.draft,
      rounding,
      CAUTION_TEXT,
    ];
  });
  return toCsv(header, rows);
}
