import { buildReportContent, type RunForReport } from './content';
import { CAUTION_TEXT, count, date, lambda as lambdaText, plural } from '../../figures';
import { contentWidth, factRows, finishPages, heading, MARGIN, newDocument, noticeBox, paragraph, PDF_COLORS, table, toBuffer } from './draw';

/**
 * The decision record of a default-option review: what the trustees looked at, what they
 * decided and who signed. Every figure it prints names the run it comes from, with that
 * run's seed and engine version, so anyone can reproduce it. Kept with the review when the
 * quorum signs, so the record reads the same for ever after.
 */
export type DecisionRecord = {
  reviewId: string;
  title: string;
  schemeName: string;
  final: boolean;
  generatedOn: string;
  signedOffOn: string | null;
  decision: { kind: 'option' | 'no_change' | null; sentence: string };
  lambda: { value: string | null; calibration: string };
  reasons: string;
  dissent: string;
  assumptionSet: { version: number; setAt: string; approvals: string } | null;
  optionVersions: { name: string; version: number; approvals: string; chosen: boolean }[];
  runs: {
    id: string;
    seed: number;
    paths: number;
    engineVersion: string;
    finishedOn: string | null;
    assumptionSetVersion: number;
    draft: boolean;
    stress: string | null;
    lambda: string;
    /** As the board report prints them (figures/); the standard errors read "± …". */
    figures: { member: string; option: string; median: string; medianSe: string; chance: string; chanceSe: string; ce: string }[];
  }[];
  reports: { title: string; runId: string; createdOn: string; lambda: string }[];
  signOffs: { name: string; on: string }[];
  quorum: number;
  nextReviewDue: string | null;
  caution: string;
};

export type DecisionRecordInput = {
  review: {
    id: string;
    title: string;
    decision: 'option' | 'no_change' | null;
    riskAversion: number | null;
    lambdaCalibration: string;
    reasons: string;
    dissent: string;
    signedOffAt: Date | null;
  };
  schemeName: string;
  currency: string;
  now: Date;
  chosen: { name: string; version: number } | null;
  currentDefault: { name: string | null } | null;
  assumptionSet: { version: number; setAt: string; approvals: { name: string; at: Date }[] } | null;
  optionVersions: { id: string; name: string; version: number; approvals: { name: string; at: Date }[] }[];
  chosenVersionId: string | null;
  runs: RunForReport[];
  reports: { title: string; runId: string; createdAt: Date; riskAversion: number }[];
  signOffs: { name: string; at: Date }[];
  quorum: number;
  nextReviewDue: string | null;
};

const approvalsText = (a: { name: string; at: Date }[]) => (a.length ? a.map((x) => `${x.name}, ${date(x.at)}`).join('; ') : 'approved before approvals were recorded one by one');

/** The sentence that states the decision, as the record and the screen print it. */
export function decisionSentence(kind: 'option' | 'no_change' | null, chosen: { name: string; version: number } | null, currentDefault: { name: string | null } | null): string {
  if (kind === 'option' && chosen) return `The trustees chose ${chosen.name} (version ${chosen.version}) as the scheme's default option.`;
  if (kind === 'no_change') return `The trustees decided to make no change to the default option${currentDefault?.name ? ` (${currentDefault.name})` : ''}.`;
  return 'No decision has been recorded yet.';
}

export function buildDecisionRecord(i: DecisionRecordInput): DecisionRecord {
  const r = i.review;
  return {
    reviewId: r.id,
    title: r.title,
    schemeName: i.schemeName,
    final: !!r.signedOffAt,
    generatedOn: date(i.now),
    signedOffOn: r.signedOffAt ? date(r.signedOffAt) : null,
    decision: { kind: r.decision, sentence: decisionSentence(r.decision, i.chosen, i.currentDefault) },
    lambda: { value: r.riskAversion === null ? null : lambdaText(r.riskAversion), calibration: r.lambdaCalibration },
    reasons: r.reasons,
    dissent: r.dissent,
    assumptionSet: i.assumptionSet && { version: i.assumptionSet.version, setAt: date(i.assumptionSet.setAt), approvals: approvalsText(i.assumptionSet.approvals) },
    optionVersions: i.optionVersions.map((v) => ({ name: v.name, version: v.version, approvals: approvalsText(v.approvals), chosen: v.id === i.chosenVersionId })),
    runs: i.runs.map((run) => {
      // The figures at the board's λ, computed by the board report's own rules (one source for every figure).
      const lambda = run.figures.base.lambda;
      const c = buildReportContent(run, { title: r.title, schemeName: i.schemeName, currency: i.currency, lambda, createdAt: i.now, approvedBy: null });
      return {
        id: run.id,
        seed: c.monteCarlo.seed,
        paths: c.monteCarlo.paths,
        engineVersion: c.monteCarlo.engineVersion,
        finishedOn: run.finishedAt ? date(run.finishedAt) : null,
        assumptionSetVersion: run.input.assumptionSet.version,
        draft: run.assumptionsDraft,
        stress: c.assumptions.stress,
        lambda: c.lambdaDisplay,
        figures: c.comparison.map((row) => ({
          member: row.memberLabel,
          option: row.optionName,
          median: row.display.medianReal,
          medianSe: row.standardErrors.medianReal ?? '',
          chance: row.display.probabilityReachingTarget,
          chanceSe: row.standardErrors.probabilityReachingTarget ?? '',
          ce: row.display.certaintyEquivalentPot,
        })),
      };
    }),
    reports: i.reports.map((p) => ({ title: p.title, runId: p.runId, createdOn: date(p.createdAt), lambda: lambdaText(p.riskAversion) })),
    signOffs: i.signOffs.map((s) => ({ name: s.name, on: date(s.at) })),
    quorum: i.quorum,
    nextReviewDue: i.nextReviewDue ? date(i.nextReviewDue) : null,
    caution: CAUTION_TEXT,
  };
}

/** The decision record as a PDF for the minutes. A record not yet signed off is marked DRAFT on every page. */
export async function renderDecisionRecord(rec: DecisionRecord): Promise<Buffer> {
  const doc = newDocument({ title: `${rec.title}: decision record`, subject: `${rec.schemeName}: decision of review ${rec.reviewId}` });
  doc.font('semibold').fontSize(11).fillColor(PDF_COLORS.primary).text('KEELSON · DECISION RECORD', MARGIN, 80);
  doc.moveDown(1);
  doc.font('bold').fontSize(24).fillColor(PDF_COLORS.ink).text(rec.title, { width: contentWidth(doc) });
  doc.font('regular').fontSize(13).fillColor(PDF_COLORS.muted).text(rec.schemeName, { width: contentWidth(doc) });
  doc.moveDown(1);
  factRows(doc, [
    ['Review', rec.reviewId],
    ['Status', rec.final ? `Signed off on ${rec.signedOffOn}` : 'Not signed off: a draft of the record'],
    ['Record made', rec.generatedOn],
    ['Next review due', rec.nextReviewDue ?? 'set at sign-off'],
  ]);
  if (!rec.final) noticeBox(doc, 'DRAFT', ['This review has not been signed off by the scheme’s quorum of trustees. The decision below may still change.'], 'danger');

  heading(doc, 'Decision');
  paragraph(doc, rec.decision.sentence, { font: 'semibold', size: 12 });
  factRows(doc, [['Risk aversion (λ)', rec.lambda.value ?? 'not stated']]);
  paragraph(doc, 'How the board arrived at λ', { font: 'semibold' });
  paragraph(doc, rec.lambda.calibration || 'Not stated.');
  paragraph(doc, 'Reasons, in the board’s words', { font: 'semibold' });
  paragraph(doc, rec.reasons || 'Not stated.');
  paragraph(doc, 'Dissent', { font: 'semibold' });
  paragraph(doc, rec.dissent || 'None recorded.');

  heading(doc, 'Sign-off');
  paragraph(doc, `The scheme requires ${plural(rec.quorum, 'trustee')} to sign.`);
  if (rec.signOffs.length) table(doc, [{ header: 'Trustee', width: 300 }, { header: 'Signed on', width: 195 }], rec.signOffs.map((s) => [s.name, s.on]), { size: 9.5 });
  else paragraph(doc, 'No trustee has signed yet.');

  heading(doc, 'What the trustees considered');
  paragraph(doc, 'Assumptions', { font: 'semibold' });
  paragraph(doc, rec.assumptionSet ? `Assumption set version ${rec.assumptionSet.version}, set on ${rec.assumptionSet.setAt}. Approved by ${rec.assumptionSet.approvals}.` : 'No assumption set was named.');
  paragraph(doc, 'Default option versions', { font: 'semibold' });
  if (rec.optionVersions.length) {
    table(
      doc,
      [{ header: 'Option', width: 170 }, { header: 'Version', width: 55, align: 'right' }, { header: 'Approved by', width: 210 }, { header: 'Chosen', width: 60 }],
      rec.optionVersions.map((v) => [v.name, String(v.version), v.approvals, v.chosen ? 'chosen' : '']),
      { size: 9 },
    );
  } else paragraph(doc, 'None named.');
  paragraph(doc, 'Board reports', { font: 'semibold' });
  if (rec.reports.length) {
    table(
      doc,
      [{ header: 'Report', width: 190 }, { header: 'From run', width: 200 }, { header: 'Made on', width: 70 }, { header: 'λ', width: 35, align: 'right' }],
      rec.reports.map((p) => [p.title, p.runId, p.createdOn, p.lambda]),
      { size: 8.5 },
    );
  } else paragraph(doc, 'None named.');

  heading(doc, 'Projection runs and their key figures');
  paragraph(doc, "Pots at retirement in today's money, net of charges; ± is one Monte Carlo standard error. Each table names the run it comes from; the same inputs, seed and engine version reproduce it.", {
    size: 9,
    color: PDF_COLORS.muted,
  });
  if (!rec.runs.length) paragraph(doc, 'No run was named.');
  for (const run of rec.runs) {
    paragraph(
      doc,
      `Run ${run.id} · seed ${run.seed} · engine ${run.engineVersion} · ${count(run.paths)} paths · assumptions v${run.assumptionSetVersion}${run.draft ? ' (DRAFT)' : ''}${run.finishedOn ? ` · finished ${run.finishedOn}` : ''}`,
      { font: 'semibold', size: 9.5 },
    );
    if (run.stress) paragraph(doc, run.stress, { size: 8.5, color: PDF_COLORS.muted });
    table(
      doc,
      [
        { header: 'Member', width: 110 },
        { header: 'Option', width: 150 },
        { header: 'Median pot', width: 95, align: 'right' },
        { header: 'Chance of target', width: 85, align: 'right' },
        { header: `CE pot (λ = ${run.lambda})`, width: 65, align: 'right' },
      ],
      run.figures.map((f) => [f.member, f.option, [f.median, f.medianSe].filter(Boolean).join('\n'), [f.chance, f.chanceSe].filter(Boolean).join('\n'), f.ce]),
      { size: 8 },
    );
  }

  heading(doc, 'Cautions');
  noticeBox(doc, 'Illustration only', [rec.caution]);

  finishPages(doc, `${rec.schemeName} · ${rec.title} · review ${rec.reviewId.slice(0, 8)}${rec.final ? '' : ' · DRAFT'}`, !rec.final);
  return toBuffer(doc);
}
