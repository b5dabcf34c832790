import { and, asc, count, desc, eq, inArray } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../../db/client';
import {
  assumptionSets,
  defaultOptions,
  optionVersions,
  projectionRuns,
  reports,
  reviewOptionVersions,
  reviewReports,
  reviewRuns,
  reviewSignOffs,
  reviews,
  schemes,
  users,
} from '../../db/schema';
import { badRequest, conflict, notFound, type FieldIssue } from '../errors';
import { exactFiguresAt } from './runs';
import { buildDecisionRecord, decisionSentence, renderDecisionRecord, type DecisionRecord } from '../reports/decisionRecord';
import { approvalsOf } from './approvals';
import { audit } from './audit';
import { date } from '../../figures';
import type { ServiceContext } from './context';
import { currentDefaultOf, newestApproved, settingsOf, writeSettings } from './governance';
import { slug } from './statements';

/**
 * A review of the default option, from opening to the signed decision. While open, trustees
 * gather what they considered and write the decision; each trustee's signature is withdrawn
 * if the decision changes after it. When the scheme's quorum has signed, the review is final:
 * its decision record is kept as signed, the next review date is set, and every change
 * answers 409.
 */
export type ReviewPatch = Partial<{
  title: string;
  assumptionSetId: string | null;
  optionVersionIds: string[];
  runIds: string[];
  reportIds: string[];
  decision: 'option' | 'no_change' | null;
  chosenVersionId: string | null;
  riskAversion: number | null;
  lambdaCalibration: string;
  reasons: string;
  dissent: string;
  nextReviewDue: string | null;
}>;

type ReviewRow = typeof reviews.$inferSelect;

const opener = alias(users, 'opener');
const editor = alias(users, 'editor');

/** ISO date (UTC) `years` after `d`; 29 February falls back to 28 February. */
export function yearsLater(d: Date, years: number): string {
  const y = d.getUTCFullYear() + years;
  const m = d.getUTCMonth();
  const day = Math.min(d.getUTCDate(), new Date(Date.UTC(y, m + 1, 0)).getUTCDate());
  return new Date(Date.UTC(y, m, day)).toISOString().slice(0, 10);
}

const today = (now = new Date()) => now.toISOString().slice(0, 10);

function finalised(r: Pick<ReviewRow, 'signedOffAt' | 'title'>) {
  const when = r.signedOffAt ? date(r.signedOffAt) : 'an earlier date';
  return conflict(`"${r.title}" was signed off on ${when} and can no longer change. Open a new review instead.`);
}

export async function listReviews(db: DbOrTx, schemeId: string) {
  const { signOffQuorum } = await settingsOf(db, schemeId);
  const rows = await db
    .select({
      id: reviews.id,
      title: reviews.title,
      status: reviews.status,
      decision: reviews.decision,
      createdAt: reviews.createdAt,
      openedBy: opener.displayName,
      updatedAt: reviews.updatedAt,
      signedOffAt: reviews.signedOffAt,
      nextReviewDue: reviews.nextReviewDue,
    })
    .from(reviews)
    .leftJoin(opener, eq(opener.id, reviews.openedBy))
    .where(eq(reviews.schemeId, schemeId))
    .orderBy(desc(reviews.createdAt));
  const signed = rows.length
    ? await db
        .select({ reviewId: reviewSignOffs.reviewId, n: count() })
        .from(reviewSignOffs)
        .where(inArray(reviewSignOffs.reviewId, rows.map((r) => r.id)))
        .groupBy(reviewSignOffs.reviewId)
    : [];
  return rows.map((r) => ({ ...r, signatures: Number(signed.find((s) => s.reviewId === r.id)?.n ?? 0), quorum: signOffQuorum }));
}

async function loadRow(db: DbOrTx, schemeId: string, id: string, lock = false) {
  const q = db.select().from(reviews).where(and(eq(reviews.id, id), eq(reviews.schemeId, schemeId)));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('No such review in this scheme.');
  return row;
}

/** Runs `change` in a transaction on the review, locked and known to be open (409 once it is final). */
async function changeOpenReview<T>(db: DbOrTx, ctx: ServiceContext, id: string, change: (tx: DbOrTx, row: ReviewRow) => Promise<T>): Promise<T> {
  return db.transaction(async (tx) => {
    const row = await loadRow(tx, ctx.schemeId!, id, true);
    if (row.status !== 'open') throw finalised(row);
    return change(tx, row);
  });
}

/** Everything a review gathers, in the order the trustees gave. */
async function gathered(db: DbOrTx, reviewId: string) {
  const versionRows = await db
    .select({ v: optionVersions })
    .from(reviewOptionVersions)
    .innerJoin(optionVersions, eq(optionVersions.id, reviewOptionVersions.optionVersionId))
    .where(eq(reviewOptionVersions.reviewId, reviewId))
    .orderBy(asc(reviewOptionVersions.position));
  const runRows = await db
    .select({
      id: projectionRuns.id,
      status: projectionRuns.status,
      createdAt: projectionRuns.createdAt,
      finishedAt: projectionRuns.finishedAt,
      seed: projectionRuns.seed,
      paths: projectionRuns.paths,
      riskAversion: projectionRuns.riskAversion,
      engineVersion: projectionRuns.engineVersion,
      assumptionsDraft: projectionRuns.assumptionsDraft,
      input: projectionRuns.input,
    })
    .from(reviewRuns)
    .innerJoin(projectionRuns, eq(projectionRuns.id, reviewRuns.runId))
    .where(eq(reviewRuns.reviewId, reviewId))
    .orderBy(asc(reviewRuns.position));
  const reportRows = await db
    .select({ id: reports.id, title: reports.title, runId: reports.runId, createdAt: reports.createdAt, riskAversion: reports.riskAversion, draft: reports.draft })
    .from(reviewReports)
    .innerJoin(reports, eq(reports.id, reviewReports.reportId))
    .where(eq(reviewReports.reviewId, reviewId))
    .orderBy(asc(reviewReports.position));
  const signOffs = await db
    .select({ userId: reviewSignOffs.userId, name: reviewSignOffs.signerName, at: reviewSignOffs.at })
    .from(reviewSignOffs)
    .where(eq(reviewSignOffs.reviewId, reviewId))
    .orderBy(asc(reviewSignOffs.at));
  return { versions: versionRows.map((r) => r.v), runs: runRows, reports: reportRows, signOffs };
}

/** What still stops the review being signed off, in words (empty: ready). */
function missingForSignOff(row: ReviewRow, g: Awaited<ReturnType<typeof gathered>>, now = new Date()): string[] {
  const out: string[] = [];
  if (!row.assumptionSetId) out.push('name the approved assumption set the review relied on');
  if (!g.versions.length) out.push('list the option versions considered');
  if (!g.runs.length) out.push('add at least one finished projection run');
  if (!row.decision) out.push('record the decision: an option chosen, or no change');
  if (row.decision === 'option' && !row.chosenVersionId) out.push('name the option version chosen');
  if (row.decision === 'option' && row.chosenVersionId && !g.versions.some((v) => v.id === row.chosenVersionId)) out.push('the option chosen must be one of the versions considered');
  if (row.riskAversion === null) out.push('state the risk aversion λ the board used');
  if (!row.lambdaCalibration.trim()) out.push('say how the board arrived at λ');
  if (!row.reasons.trim()) out.push('give the reasons in the board’s words');
  if (row.nextReviewDue && row.nextReviewDue <= today(now)) out.push('the next review date must be after today');
  return out;
}

export async function getReview(db: DbOrTx, schemeId: string, id: string) {
  const [r] = await db
    .select({ row: reviews, openedBy: opener.displayName, updatedBy: editor.displayName })
    .from(reviews)
    .leftJoin(opener, eq(opener.id, reviews.openedBy))
    .leftJoin(editor, eq(editor.id, reviews.updatedBy))
    .where(and(eq(reviews.id, id), eq(reviews.schemeId, schemeId)));
  if (!r) throw notFound('No such review in this scheme.');
  const row = r.row;
  const g = await gathered(db, id);
  const settings = await settingsOf(db, schemeId);
  const set = row.assumptionSetId
    ? (await db.select({ id: assumptionSets.id, version: assumptionSets.version, setAt: assumptionSets.setAt, status: assumptionSets.status, approvedAt: assumptionSets.approvedAt }).from(assumptionSets).where(eq(assumptionSets.id, row.assumptionSetId)))[0]
    : null;
  const setApprovals = set ? (await approvalsOf(db, 'assumption_set', [set.id])).get(set.id)! : [];
  const versionApprovals = await approvalsOf(
    db,
    'option_version',
    g.versions.map((v) => v.id),
  );
  const chosen = row.chosenVersionId ? (g.versions.find((v) => v.id === row.chosenVersionId) ?? (await db.select().from(optionVersions).where(eq(optionVersions.id, row.chosenVersionId)))[0]) : null;
  const currentDefault = await currentDefaultOf(db, schemeId);
  const { record: _record, pdf: _pdf, ...fields } = row;
  return {
    ...fields,
    openedBy: r.openedBy,
    updatedBy: r.updatedBy,
    decisionSentence: decisionSentence(row.decision, chosen ? { name: chosen.name, version: chosen.version } : null, currentDefault),
    assumptionSet: set ? { ...set, approvals: setApprovals } : null,
    optionVersions: g.versions.map((v) => ({ id: v.id, optionId: v.optionId, version: v.version, name: v.name, status: v.status, approvedAt: v.approvedAt, approvals: versionApprovals.get(v.id)! })),
    runs: g.runs.map((run) => {
      const input = run.input;
      return {
        id: run.id,
        status: run.status,
        createdAt: run.createdAt,
        finishedAt: run.finishedAt,
        seed: run.seed,
        paths: run.paths,
        engineVersion: run.engineVersion,
        assumptionsDraft: run.assumptionsDraft,
        assumptionSetVersion: input.assumptionSet.version,
        options: input.options.map((o) => (o.version ? `${o.name} v${o.version}` : o.name)),
        members: input.members.length,
        stress: !!input.stress,
      };
    }),
    reports: g.reports,
    signOffs: g.signOffs,
    quorum: settings.signOffQuorum,
    reviewIntervalYears: settings.reviewIntervalYears,
    currentDefault,
    missing: row.status === 'open' ? missingForSignOff(row, g) : [],
  };
}

/** Checks that every object a patch names belongs to the scheme and may be part of a review. */
async function checkPatch(db: DbOrTx, schemeId: string, p: ReviewPatch) {
  const issues: FieldIssue[] = [];
  if (p.assumptionSetId) {
    const [s] = await db.select({ status: assumptionSets.status }).from(assumptionSets).where(and(eq(assumptionSets.id, p.assumptionSetId), eq(assumptionSets.schemeId, schemeId)));
    if (!s) issues.push({ path: 'assumptionSetId', message: 'is not an assumption set of this scheme' });
    else if (s.status !== 'approved') issues.push({ path: 'assumptionSetId', message: 'is a draft; a review relies on an approved assumption set' });
  }
  const versionIds = [...(p.optionVersionIds ?? []), ...(p.chosenVersionId ? [p.chosenVersionId] : [])];
  if (versionIds.length) {
    const vs = await db.select({ id: optionVersions.id, status: optionVersions.status }).from(optionVersions).where(and(inArray(optionVersions.id, versionIds), eq(optionVersions.schemeId, schemeId)));
    (p.optionVersionIds ?? []).forEach((id, i) => {
      const v = vs.find((x) => x.id === id);
      if (!v) issues.push({ path: `optionVersionIds.${i}`, message: 'is not an option version of this scheme' });
      else if (v.status !== 'approved') issues.push({ path: `optionVersionIds.${i}`, message: 'is a draft; only approved option versions can be considered' });
    });
    if (p.chosenVersionId && !vs.some((x) => x.id === p.chosenVersionId)) issues.push({ path: 'chosenVersionId', message: 'is not an option version of this scheme' });
  }
  if (p.runIds?.length) {
    const rs = await db.select({ id: projectionRuns.id, status: projectionRuns.status }).from(projectionRuns).where(and(inArray(projectionRuns.id, p.runIds), eq(projectionRuns.schemeId, schemeId)));
    p.runIds.forEach((id, i) => {
      const run = rs.find((x) => x.id === id);
      if (!run) issues.push({ path: `runIds.${i}`, message: 'is not a projection run of this scheme' });
      else if (run.status !== 'done') issues.push({ path: `runIds.${i}`, message: `has not finished (${run.status})` });
    });
  }
  if (p.reportIds?.length) {
    const rs = await db.select({ id: reports.id }).from(reports).where(and(inArray(reports.id, p.reportIds), eq(reports.schemeId, schemeId)));
    p.reportIds.forEach((id, i) => {
      if (!rs.some((x) => x.id === id)) issues.push({ path: `reportIds.${i}`, message: 'is not a board report of this scheme' });
    });
  }
  if (issues.length) throw badRequest('Some fields are not valid.', issues);
}

async function replaceLinks(tx: DbOrTx, reviewId: string, p: ReviewPatch) {
  if (p.optionVersionIds) {
    await tx.delete(reviewOptionVersions).where(eq(reviewOptionVersions.reviewId, reviewId));
    if (p.optionVersionIds.length) await tx.insert(reviewOptionVersions).values(p.optionVersionIds.map((optionVersionId, position) => ({ reviewId, optionVersionId, position })));
  }
  if (p.runIds) {
    await tx.delete(reviewRuns).where(eq(reviewRuns.reviewId, reviewId));
    if (p.runIds.length) await tx.insert(reviewRuns).values(p.runIds.map((runId, position) => ({ reviewId, runId, position })));
  }
  if (p.reportIds) {
    await tx.delete(reviewReports).where(eq(reviewReports.reviewId, reviewId));
    if (p.reportIds.length) await tx.insert(reviewReports).values(p.reportIds.map((reportId, position) => ({ reviewId, reportId, position })));
  }
}

/**
 * A trustee opens a review. It starts with the newest approved assumption set and the newest
 * approved version of every active option; runs, reports and the decision are added after.
 */
export async function openReview(db: DbOrTx, ctx: ServiceContext, input: { title: string }) {
  const schemeId = ctx.schemeId!;
  const id = await db.transaction(async (tx) => {
    const [set] = await tx
      .select({ id: assumptionSets.id })
      .from(assumptionSets)
      .where(and(eq(assumptionSets.schemeId, schemeId), eq(assumptionSets.status, 'approved')))
      .orderBy(desc(assumptionSets.version))
      .limit(1);
    const active = await tx.select({ id: defaultOptions.id }).from(defaultOptions).where(and(eq(defaultOptions.schemeId, schemeId), eq(defaultOptions.archived, false))).orderBy(asc(defaultOptions.createdAt));
    const approved = await newestApproved(
      tx,
      active.map((o) => o.id),
    );
    const optionVersionIds = active.flatMap((o) => (approved.get(o.id) ? [approved.get(o.id)!.id] : []));
    const [row] = await tx
      .insert(reviews)
      .values({ schemeId, title: input.title, assumptionSetId: set?.id ?? null, openedBy: ctx.actor?.id, updatedBy: ctx.actor?.id })
      .returning();
    await replaceLinks(tx, row.id, { optionVersionIds });
    await audit(tx, ctx, { action: 'review.opened', entity: 'review', entityId: row.id, after: { title: row.title, assumptionSetId: row.assumptionSetId, optionVersionIds } });
    return row.id;
  });
  return getReview(db, schemeId, id);
}

/** Changes an open review; a change withdraws the signatures given so far (they signed what it said before). */
export async function updateReview(db: DbOrTx, ctx: ServiceContext, id: string, patch: ReviewPatch) {
  const schemeId = ctx.schemeId!;
  await changeOpenReview(db, ctx, id, async (tx, row) => {
    await checkPatch(tx, schemeId, patch);
    const { optionVersionIds: _v, runIds: _r, reportIds: _p, ...fields } = patch;
    const decisionCleared = fields.decision === 'no_change' ? { chosenVersionId: null } : {};
    await tx
      .update(reviews)
      .set({ ...fields, ...decisionCleared, updatedBy: ctx.actor?.id, updatedAt: new Date() })
      .where(eq(reviews.id, id));
    await replaceLinks(tx, id, patch);
    const withdrawn = await tx.delete(reviewSignOffs).where(eq(reviewSignOffs.reviewId, id)).returning({ name: reviewSignOffs.signerName });
    await audit(tx, ctx, {
      action: 'review.updated',
      entity: 'review',
      entityId: id,
      before: Object.fromEntries(Object.keys(fields).map((k) => [k, row[k as keyof ReviewRow]])),
      after: { ...patch, title: patch.title ?? row.title, signaturesWithdrawn: withdrawn.map((w) => w.name) },
    });
  });
  return getReview(db, schemeId, id);
}

/** Discards an open review. */
export async function discardReview(db: DbOrTx, ctx: ServiceContext, id: string) {
  await changeOpenReview(db, ctx, id, async (tx, row) => {
    await tx.delete(reviews).where(eq(reviews.id, id));
    await audit(tx, ctx, { action: 'review.discarded', entity: 'review', entityId: id, before: { title: row.title } });
  });
}

/** The figures and words of a review's decision record, from the stored rows. */
async function recordOf(db: DbOrTx, schemeId: string, row: ReviewRow, extra: { now: Date; nextReviewDue: string | null; signedOffAt: Date | null }): Promise<DecisionRecord> {
  const [scheme] = await db.select({ name: schemes.name, currency: schemes.currency }).from(schemes).where(eq(schemes.id, schemeId));
  const g = await gathered(db, row.id);
  const { signOffQuorum } = await settingsOf(db, schemeId);
  const set = row.assumptionSetId ? (await db.select().from(assumptionSets).where(eq(assumptionSets.id, row.assumptionSetId)))[0] : null;
  const vApprovals = await approvalsOf(
    db,
    'option_version',
    g.versions.map((v) => v.id),
  );
  const chosen = g.versions.find((v) => v.id === row.chosenVersionId) ?? null;
  const runs = await db
    .select()
    .from(projectionRuns)
    .where(
      inArray(
        projectionRuns.id,
        g.runs.map((r) => r.id),
      ),
    );
  return buildDecisionRecord({
    review: { ...row, signedOffAt: extra.signedOffAt },
    schemeName: scheme.name,
    currency: scheme.currency,
    now: extra.now,
    chosen: chosen && { name: chosen.name, version: chosen.version },
    currentDefault: await currentDefaultOf(db, schemeId),
    assumptionSet: set && { version: set.version, setAt: set.setAt, approvals: (await approvalsOf(db, 'assumption_set', [set.id])).get(set.id)! },
    optionVersions: g.versions.map((v) => ({ id: v.id, name: v.name, version: v.version, approvals: vApprovals.get(v.id)! })),
    chosenVersionId: row.chosenVersionId,
    runs: await Promise.all(
      g.runs.map(async (gr) => {
        const run = runs.find((x) => x.id === gr.id)!;
        // Exact figures at the board's λ; a run stored before pots were kept has them at its own λ only (the record names the λ per run).
        const figures = await exactFiguresAt(db, run, row.riskAversion ?? run.riskAversion).catch(() => exactFiguresAt(db, run, run.riskAversion));
        return { id: run.id, finishedAt: run.finishedAt, assumptionsDraft: run.assumptionsDraft, riskAversion: run.riskAversion, engineVersion: run.engineVersion, input: run.input, result: run.result!, baselineOptionId: run.baselineOptionId, figures };
      }),
    ),
    reports: g.reports,
    signOffs: g.signOffs,
    quorum: signOffQuorum,
    nextReviewDue: extra.nextReviewDue,
  });
}

/**
 * A trustee signs the decision. 409 when the review is final, incomplete, or already signed by
 * them. The signature that completes the quorum finalises the review in the same transaction:
 * the decision record is drawn and kept, the next review date is set on the scheme, and an
 * option chosen becomes the scheme's current default.
 */
export async function signOff(db: DbOrTx, ctx: ServiceContext, id: string) {
  const schemeId = ctx.schemeId!;
  const actor = ctx.actor!;
  await changeOpenReview(db, ctx, id, async (tx, row) => {
    const g = await gathered(tx, id);
    const now = new Date();
    const missing = missingForSignOff(row, g, now);
    if (missing.length) throw conflict(`"${row.title}" is not ready to sign: ${missing.join('; ')}.`);
    if (g.signOffs.some((s) => s.userId === actor.id)) throw conflict('You have already signed this review; it needs the signatures of other trustees.');
    const [me] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actor.id));
    await tx.insert(reviewSignOffs).values({ reviewId: id, userId: actor.id, signerName: me?.name ?? actor.email, at: now });
    const settings = await settingsOf(tx, schemeId);
    const signatures = g.signOffs.length + 1;
    if (signatures < settings.signOffQuorum) {
      await audit(tx, ctx, { action: 'review.signed', entity: 'review', entityId: id, after: { title: row.title, signatures, quorum: settings.signOffQuorum } });
      return;
    }
    const nextReviewDue = row.nextReviewDue ?? yearsLater(now, settings.reviewIntervalYears);
    const record = await recordOf(tx, schemeId, row, { now, nextReviewDue, signedOffAt: now });
    const pdf = await renderDecisionRecord(record);
    await tx.update(reviews).set({ status: 'signed_off', signedOffAt: now, nextReviewDue, record, pdf }).where(eq(reviews.id, id));
    const chosen = row.decision === 'option' ? g.versions.find((v) => v.id === row.chosenVersionId)! : null;
    await writeSettings(tx, schemeId, actor.id, { nextReviewDue, ...(chosen ? { currentDefaultOptionId: chosen.optionId } : {}) });
    await audit(tx, ctx, {
      action: 'review.signed-off',
      entity: 'review',
      entityId: id,
      after: { title: row.title, signatures, quorum: settings.signOffQuorum, decision: record.decision.sentence, nextReviewDue, bytes: pdf.length },
    });
    if (chosen && settings.currentDefaultOptionId !== chosen.optionId) {
      await audit(tx, ctx, {
        action: 'option.current-default-set',
        entity: 'default_option',
        entityId: chosen.optionId,
        before: { optionId: settings.currentDefaultOptionId },
        after: { optionId: chosen.optionId, name: chosen.name, byReview: id },
      });
    }
  });
  return getReview(db, schemeId, id);
}

/** A trustee withdraws their own signature before the review is final. */
export async function withdrawSignature(db: DbOrTx, ctx: ServiceContext, id: string) {
  const schemeId = ctx.schemeId!;
  await changeOpenReview(db, ctx, id, async (tx, row) => {
    const gone = await tx
      .delete(reviewSignOffs)
      .where(and(eq(reviewSignOffs.reviewId, id), eq(reviewSignOffs.userId, ctx.actor!.id)))
      .returning();
    if (!gone.length) throw conflict('You have not signed this review.');
    await audit(tx, ctx, { action: 'review.signature-withdrawn', entity: 'review', entityId: id, before: { title: row.title } });
  });
  return getReview(db, schemeId, id);
}

/** The decision record as a PDF: the one kept at sign-off, or a draft drawn now while the review is open. */
export async function decisionRecordPdf(db: DbOrTx, schemeId: string, id: string) {
  const row = await loadRow(db, schemeId, id);
  const body = row.status === 'signed_off' && row.pdf ? row.pdf : await renderDecisionRecord(await recordOf(db, schemeId, row, { now: new Date(), nextReviewDue: row.nextReviewDue, signedOffAt: null }));
  return { filename: `${slug(row.title)}-decision-record${row.status === 'signed_off' ? '' : '-draft'}.pdf`, body };
}
