import { schemeOf, type ServiceContext } from './context';
import { and, desc, eq } from 'drizzle-orm';
import type { AppContext } from '../context';
import { assumptionSets, reports, reviewRuns, reviews, schemeRoles, schemes, users } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { audit } from './audit';
import { loadFinishedRun, slug } from './statements';
import { buildReportContent, type RunForReport } from '../reports/content';
import { comparisonCsvRows, renderBoardReport } from '../reports/boardPdf';
import { toCsv } from '../reports/csv';
import { CAUTION_TEXT, date } from '../../figures';
import { listFunds } from './funds';
import { backgroundProducer } from '../jobs/background';
import { queueMail } from '../email/outbox';
import { exactFiguresAt } from './runs';

/** The scheme's name and currency, which reports print. */
async function schemeFacts(app: AppContext, schemeId: string) {
  const [s] = await app.db.select({ id: schemes.id, name: schemes.name, currency: schemes.currency }).from(schemes).where(eq(schemes.id, schemeId));
  if (!s) throw notFound('No such scheme.');
  return s;
}

export type ReportRequest = { runId: string; title?: string; riskAversion?: number };

/**
 * Makes a board scenario report from a finished run: the content (every printed figure), the
 * PDF drawn from it, and the stored row with its audit event in one transaction.
 */
export async function createReport(app: AppContext, ctx: ServiceContext, body: ReportRequest) {
  const scheme = await schemeFacts(app, schemeOf(ctx));
  const run = await loadFinishedRun(app.db, scheme.id, body.runId);
  let approvedBy: string | null = null;
  if (run.assumptionSetId) {
    const [row] = await app.db
      .select({ name: users.displayName })
      .from(assumptionSets)
      .innerJoin(users, eq(users.id, assumptionSets.approvedBy))
      .where(eq(assumptionSets.id, run.assumptionSetId));
    approvedBy = row?.name ?? null;
  }
  const createdAt = new Date();
  const lambda = body.riskAversion ?? run.riskAversion;
  const title = body.title?.trim() || `Default option review, ${date(createdAt)}`;
  const figures = await exactFiguresAt(app.db, { ...run, status: 'done' }, lambda);
  const forReport: RunForReport = { id: run.id, finishedAt: run.finishedAt, assumptionsDraft: run.assumptionsDraft, riskAversion: run.riskAversion, engineVersion: run.engineVersion, input: run.input, result: run.result, baselineOptionId: run.baselineOptionId, figures };
  const content = buildReportContent(forReport, { title, schemeName: scheme.name, currency: scheme.currency, lambda, createdAt, approvedBy, decision: await decisionOnRun(app, scheme.id, run.id) });
  const schemeFunds = await listFunds(app.db, scheme.id);
  const pdf = await renderBoardReport(content, forReport, schemeFunds.map((f) => f.id));
  return app.db.transaction(async (tx) => {
    const [row] = await tx
      .insert(reports)
      .values({ schemeId: scheme.id, runId: run.id, title, riskAversion: lambda, draft: run.assumptionsDraft, content, pdf, createdBy: ctx.actor?.id ?? null, createdAt })
      .returning({ id: reports.id, title: reports.title, runId: reports.runId, riskAversion: reports.riskAversion, draft: reports.draft, createdAt: reports.createdAt });
    await audit(tx, ctx, { action: 'report.created', entity: 'report', entityId: row.id, after: { runId: run.id, title, riskAversion: lambda, draft: row.draft, bytes: pdf.length } });
    return { ...row, sizeBytes: pdf.length };
  });
}

/** The decision of the latest signed-off review that used this run, for the report's summary. */
async function decisionOnRun(app: AppContext, schemeId: string, runId: string) {
  const [r] = await app.db
    .select({ title: reviews.title, signedOffAt: reviews.signedOffAt, record: reviews.record })
    .from(reviews)
    .innerJoin(reviewRuns, eq(reviewRuns.reviewId, reviews.id))
    .where(and(eq(reviewRuns.runId, runId), eq(reviews.schemeId, schemeId), eq(reviews.status, 'signed_off')))
    .orderBy(desc(reviews.signedOffAt))
    .limit(1);
  if (!r?.record || !r.signedOffAt) return null;
  return { reviewTitle: r.title, signedOffOn: date(r.signedOffAt), sentence: r.record.decision.sentence };
}

export async function listReports(app: AppContext, schemeId: string) {
  return app.db
    .select({ id: reports.id, title: reports.title, runId: reports.runId, riskAversion: reports.riskAversion, draft: reports.draft, createdAt: reports.createdAt, createdBy: users.displayName })
    .from(reports)
    .leftJoin(users, eq(users.id, reports.createdBy))
    .where(eq(reports.schemeId, schemeId))
    .orderBy(desc(reports.createdAt))
    .limit(100);
}

export async function getReport(app: AppContext, schemeId: string, id: string) {
  const [r] = await app.db
    .select({ id: reports.id, title: reports.title, runId: reports.runId, riskAversion: reports.riskAversion, draft: reports.draft, createdAt: reports.createdAt, content: reports.content, createdBy: users.displayName })
    .from(reports)
    .leftJoin(users, eq(users.id, reports.createdBy))
    .where(and(eq(reports.id, id), eq(reports.schemeId, schemeId)));
  if (!r) throw notFound('No such report in this scheme.');
  return r;
}

export async function reportPdf(app: AppContext, schemeId: string, id: string) {
  const [r] = await app.db.select({ pdf: reports.pdf, title: reports.title, createdAt: reports.createdAt }).from(reports).where(and(eq(reports.id, id), eq(reports.schemeId, schemeId)));
  if (!r) throw notFound('No such report in this scheme.');
  return { filename: `${slug(r.title)}.pdf`, body: r.pdf };
}

/** The comparison table with exact values, a header row, and the caution as a last line. */
export async function reportComparisonCsv(app: AppContext, schemeId: string, id: string) {
  const r = await getReport(app, schemeId, id);
  const { header, rows } = comparisonCsvRows(r.content);
  const note = [`Caution: ${CAUTION_TEXT}${r.content.draft ? ' DRAFT assumptions.' : ''}`];
  return { filename: `${slug(r.title)}-comparison.csv`, body: toCsv(header, [...rows, note]) };
}

/** E-mails the report's PDF to every board reviewer of the scheme, through the outbox. */
export async function emailReport(app: AppContext, ctx: ServiceContext, id: string) {
  const scheme = await schemeFacts(app, schemeOf(ctx));
  const [r] = await app.db.select({ id: reports.id, title: reports.title, pdf: reports.pdf, draft: reports.draft, content: reports.content }).from(reports).where(and(eq(reports.id, id), eq(reports.schemeId, scheme.id)));
  if (!r) throw notFound('No such report in this scheme.');
  const reviewers = await app.db
    .select({ email: users.email })
    .from(schemeRoles)
    .innerJoin(users, eq(users.id, schemeRoles.userId))
    .where(and(eq(schemeRoles.schemeId, scheme.id), eq(schemeRoles.role, 'board')))
    .orderBy(users.email);
  if (!reviewers.length) throw conflict('This scheme has no board reviewers to send the report to.');
  const content = r.content;
  const text = [
    `${ctx.actor?.displayName ?? ctx.actor?.email ?? 'Keelson'} has shared a board scenario report for ${scheme.name}: "${r.title}".`,
    '',
    `It comes from projection run ${content.runId} (assumption set version ${content.assumptionSet.version}${r.draft ? ', DRAFT' : ''}), with certainty equivalents at λ = ${content.lambdaDisplay}.`,
    'The report is attached as a PDF. It is also kept in Keelson under Reports.',
    '',
    CAUTION_TEXT,
  ].join('\n');
  await backgroundProducer(app.pool);
  return app.db.transaction(async (tx) => {
    const msg = await queueMail(app.pool, tx, ctx, {
      to: reviewers.map((x) => x.email),
      subject: `${r.draft ? '[DRAFT] ' : ''}Board report: ${r.title}`,
      text,
      schemeId: scheme.id,
      kind: 'board-report',
      attachments: [{ filename: `${slug(r.title)}.pdf`, contentType: 'application/pdf', content: r.pdf }],
    });
    await audit(tx, ctx, { action: 'report.emailed', entity: 'report', entityId: r.id, after: { messageId: msg.id, recipients: msg.recipients } });
    return { messageId: msg.id, recipients: msg.recipients, status: msg.status };
  });
}
