import { and, desc, eq, sql } from 'drizzle-orm';
import { schemeOf, type ServiceContext } from './context';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../../db/client';
import { assumptionSets, fundAssumptions, funds, users } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { approvalsOf, recordApproval, withdrawApprovals, type Approval } from './approvals';
import { date } from '../../figures';
import { audit } from './audit';
import { assertSchemeFunds } from './funds';
import { settingsOf } from './governance';

export type FundAssumptionInput = { fundId: string; expectedReturn: number; volatility: number; annualCharge: number };
/** The editable content of an assumption set; `funds` order is the correlation matrix's order. */
export type AssumptionContent = {
  setAt: string;
  rationale: string;
  inflation: number;
  salaryGrowth: number;
  annuityRealRate: number;
  annuityYears: number;
  funds: FundAssumptionInput[];
  correlations: number[][];
};

export type AssumptionSetSummary = {
  id: string;
  version: number;
  status: 'draft' | 'approved';
  setAt: string;
  basedOnId: string | null;
  createdBy: string | null;
  createdAt: Date;
  updatedAt: Date;
  approvedBy: string | null;
  approvedAt: Date | null;
};
export type AssumptionSetDetail = AssumptionSetSummary &
  Omit<AssumptionContent, 'funds'> & {
    funds: (FundAssumptionInput & { name: string; assetClass: string })[];
    basedOnVersion: number | null;
    /** Who last changed the content: the four-eyes rule keeps them from approving it. */
    updatedBy: string | null;
    updatedById: string | null;
    approvals: Approval[];
    approvalsRequired: number;
  };

const creator = alias(users, 'creator');
const editor = alias(users, 'editor');
const approver = alias(users, 'approver');
const base = alias(assumptionSets, 'base');

const summaryColumns = {
  id: assumptionSets.id,
  version: assumptionSets.version,
  status: assumptionSets.status,
  setAt: assumptionSets.setAt,
  basedOnId: assumptionSets.basedOnId,
  createdBy: creator.displayName,
  createdAt: assumptionSets.createdAt,
  updatedAt: assumptionSets.updatedAt,
  approvedBy: approver.displayName,
  approvedAt: assumptionSets.approvedAt,
};

/** Every version of the scheme's assumptions, newest first, with who created and approved it. */
export async function listSets(db: DbOrTx, schemeId: string): Promise<AssumptionSetSummary[]> {
  return db
    .select(summaryColumns)
    .from(assumptionSets)
    .leftJoin(creator, eq(creator.id, assumptionSets.createdBy))
    .leftJoin(approver, eq(approver.id, assumptionSets.approvedBy))
    .where(eq(assumptionSets.schemeId, schemeId))
    .orderBy(desc(assumptionSets.version));
}

export async function getSet(db: DbOrTx, schemeId: string, id: string): Promise<AssumptionSetDetail> {
  const [row] = await db
    .select({
      ...summaryColumns,
      rationale: assumptionSets.rationale,
      inflation: assumptionSets.inflation,
      salaryGrowth: assumptionSets.salaryGrowth,
      annuityRealRate: assumptionSets.annuityRealRate,
      annuityYears: assumptionSets.annuityYears,
      fundOrder: assumptionSets.fundOrder,
      correlations: assumptionSets.correlations,
      basedOnVersion: base.version,
      updatedBy: editor.displayName,
      updatedById: assumptionSets.updatedBy,
    })
    .from(assumptionSets)
    .leftJoin(creator, eq(creator.id, assumptionSets.createdBy))
    .leftJoin(editor, eq(editor.id, assumptionSets.updatedBy))
    .leftJoin(approver, eq(approver.id, assumptionSets.approvedBy))
    .leftJoin(base, eq(base.id, assumptionSets.basedOnId))
    .where(and(eq(assumptionSets.id, id), eq(assumptionSets.schemeId, schemeId)));
  if (!row) throw notFound('No such assumption set in this scheme.');
  const perFund = await db
    .select({ fundId: fundAssumptions.fundId, expectedReturn: fundAssumptions.expectedReturn, volatility: fundAssumptions.volatility, annualCharge: fundAssumptions.annualCharge, name: funds.name, assetClass: funds.assetClass })
    .from(fundAssumptions)
    .innerJoin(funds, eq(funds.id, fundAssumptions.fundId))
    .where(eq(fundAssumptions.assumptionSetId, id));
  const byId = new Map(perFund.map((f) => [f.fundId, f]));
  const { fundOrder, ...rest } = row;
  const approvals = (await approvalsOf(db, 'assumption_set', [id])).get(id)!;
  const { approvalsRequired } = await settingsOf(db, schemeId);
  return { ...rest, funds: fundOrder.map((fid) => byId.get(fid)).filter((f): f is NonNullable<typeof f> => !!f), approvals, approvalsRequired };
}

/** The newest approved set, or null. */
export async function latestApproved(db: DbOrTx, schemeId: string): Promise<AssumptionSetDetail | null> {
  const [row] = await db
    .select({ id: assumptionSets.id })
    .from(assumptionSets)
    .where(and(eq(assumptionSets.schemeId, schemeId), eq(assumptionSets.status, 'approved')))
    .orderBy(desc(assumptionSets.version))
    .limit(1);
  return row ? getSet(db, schemeId, row.id) : null;
}

function contentOf(set: AssumptionSetDetail | AssumptionContent): AssumptionContent {
  return {
    setAt: set.setAt,
    rationale: set.rationale,
    inflation: set.inflation,
    salaryGrowth: set.salaryGrowth,
    annuityRealRate: set.annuityRealRate,
    annuityYears: set.annuityYears,
    funds: set.funds.map((f) => ({ fundId: f.fundId, expectedReturn: f.expectedReturn, volatility: f.volatility, annualCharge: f.annualCharge })),
    correlations: set.correlations,
  };
}

/** The assumption_sets columns that hold a set's content (the per-fund figures live in fund_assumptions). */
function contentColumns(c: AssumptionContent) {
  return {
    setAt: c.setAt,
    rationale: c.rationale,
    inflation: c.inflation,
    salaryGrowth: c.salaryGrowth,
    annuityRealRate: c.annuityRealRate,
    annuityYears: c.annuityYears,
    fundOrder: c.funds.map((f) => f.fundId),
    correlations: c.correlations,
  };
}

/** Every fund the content names must be a fund of the scheme (400 naming funds.i.fundId otherwise). */
function assertContentFunds(db: DbOrTx, schemeId: string, c: AssumptionContent) {
  return assertSchemeFunds(db, schemeId, c.funds.map((f) => f.fundId), c.funds.map((_, i) => `funds.${i}.fundId`));
}

async function writeContent(tx: DbOrTx, setId: string, c: AssumptionContent) {
  await tx.delete(fundAssumptions).where(eq(fundAssumptions.assumptionSetId, setId));
  await tx.insert(fundAssumptions).values(c.funds.map((f) => ({ assumptionSetId: setId, ...f })));
}

async function nextVersion(tx: DbOrTx, schemeId: string): Promise<number> {
  // Serialise version numbering per scheme for the rest of the transaction.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`assumption-version:${schemeId}`}))`);
  const [r] = await tx.select({ v: sql<number>`coalesce(max(${assumptionSets.version}), 0)::int` }).from(assumptionSets).where(eq(assumptionSets.schemeId, schemeId));
  return r.v + 1;
}

/** Creates a new draft from the given content (a copy of `basedOnId` when given). */
export async function createDraft(db: DbOrTx, ctx: ServiceContext, content: AssumptionContent, basedOnId: string | null = null): Promise<AssumptionSetDetail> {
  const schemeId = schemeOf(ctx);
  await assertContentFunds(db, schemeId, content);
  const id = await db.transaction(async (tx) => {
    const version = await nextVersion(tx, schemeId);
    const [row] = await tx
      .insert(assumptionSets)
      .values({
        schemeId,
        version,
        status: 'draft',
        ...contentColumns(content),
        basedOnId,
        createdBy: ctx.actor?.id ?? null,
        updatedBy: ctx.actor?.id ?? null,
      })
      .returning({ id: assumptionSets.id });
    await writeContent(tx, row.id, content);
    await audit(tx, ctx, { action: 'assumptions.draft-created', entity: 'assumption_set', entityId: row.id, after: { version, basedOnId, ...content } });
    return row.id;
  });
  return getSet(db, schemeId, id);
}

/** A new draft copied from an existing version (approved or not). */
export async function copyToDraft(db: DbOrTx, ctx: ServiceContext, fromId: string): Promise<AssumptionSetDetail> {
  const from = await getSet(db, schemeOf(ctx), fromId);
  return createDraft(db, ctx, contentOf(from), from.id);
}

function immutable(set: { version: number; approvedBy: string | null; approvedAt: Date | null }) {
  const when = set.approvedAt ? date(set.approvedAt) : 'an earlier date';
  return conflict(`Version ${set.version} was approved${set.approvedBy ? ` by ${set.approvedBy}` : ''} on ${when} and can no longer change. Start a new draft from it instead.`);
}

/** Replaces a draft's content. An approved set answers 409. */
export async function updateDraft(db: DbOrTx, ctx: ServiceContext, id: string, content: AssumptionContent): Promise<AssumptionSetDetail> {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    // Lock the row so an approval cannot slip in between the check and the write.
    const [locked] = await tx.select({ id: assumptionSets.id }).from(assumptionSets).where(and(eq(assumptionSets.id, id), eq(assumptionSets.schemeId, schemeId))).for('update');
    if (!locked) throw notFound('No such assumption set in this scheme.');
    const before = await getSet(tx, schemeId, id);
    if (before.status !== 'draft') throw immutable(before);
    await assertContentFunds(tx, schemeId, content);
    await tx
      .update(assumptionSets)
      .set({ ...contentColumns(content), updatedAt: new Date(), updatedBy: ctx.actor?.id ?? null })
      .where(and(eq(assumptionSets.id, id), eq(assumptionSets.status, 'draft')));
    await writeContent(tx, id, content);
    // An approval was of the content as it stood; a changed draft needs approving afresh.
    const approvalsWithdrawn = await withdrawApprovals(tx, 'assumption_set', id);
    await audit(tx, ctx, {
      action: 'assumptions.draft-updated',
      entity: 'assumption_set',
      entityId: id,
      before: { version: before.version, ...contentOf(before) },
      after: { version: before.version, ...content, approvalsWithdrawn },
    });
  });
  return getSet(db, schemeId, id);
}

/** Discards a draft. An approved set answers 409. */
export async function deleteDraft(db: DbOrTx, ctx: ServiceContext, id: string): Promise<void> {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    const [locked] = await tx.select({ id: assumptionSets.id }).from(assumptionSets).where(and(eq(assumptionSets.id, id), eq(assumptionSets.schemeId, schemeId))).for('update');
    if (!locked) throw notFound('No such assumption set in this scheme.');
    const before = await getSet(tx, schemeId, id);
    if (before.status !== 'draft') throw immutable(before);
    await tx.delete(assumptionSets).where(eq(assumptionSets.id, id));
    await audit(tx, ctx, { action: 'assumptions.draft-discarded', entity: 'assumption_set', entityId: id, before: { version: before.version, ...contentOf(before) } });
  });
}

/**
 * A trustee other than the draft's last editor approves it (four-eyes). When the scheme
 * requires two approvals the first leaves it a draft; the last one makes it immutable.
 */
export async function approve(db: DbOrTx, ctx: ServiceContext, id: string): Promise<AssumptionSetDetail> {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    const [locked] = await tx.select({ id: assumptionSets.id }).from(assumptionSets).where(and(eq(assumptionSets.id, id), eq(assumptionSets.schemeId, schemeId))).for('update');
    if (!locked) throw notFound('No such assumption set in this scheme.');
    const before = await getSet(tx, schemeId, id);
    if (before.status !== 'draft') throw immutable(before);
    if (before.funds.length === 0) throw conflict(`Version ${before.version} has no funds; add at least one before approving.`);
    const result = await recordApproval(tx, ctx, { kind: 'assumption_set', id, schemeId, label: `assumption set v${before.version}`, lastEditorId: before.updatedById });
    if (result.complete) {
      await tx.update(assumptionSets).set({ status: 'approved', approvedBy: ctx.actor!.id, approvedAt: result.at }).where(eq(assumptionSets.id, id));
    }
    await audit(tx, ctx, {
      action: result.complete ? 'assumptions.approved' : 'assumptions.approval-recorded',
      entity: 'assumption_set',
      entityId: id,
      before: { version: before.version, status: 'draft' },
      after: { version: before.version, status: result.complete ? 'approved' : 'draft', approvals: result.count, required: result.required, ...(result.complete ? { approvedAt: result.at } : {}) },
    });
  });
  return getSet(db, schemeId, id);
}

export type FieldChange = { field: keyof Omit<AssumptionContent, 'funds' | 'correlations'>; a: string | number; b: string | number; changed: boolean };
export type FundChange = {
  fundId: string;
  name: string;
  a: FundAssumptionInput | null;
  b: FundAssumptionInput | null;
  changed: ('expectedReturn' | 'volatility' | 'annualCharge' | 'added' | 'removed')[];
};
export type CorrelationChange = { fundA: string; fundB: string; nameA: string; nameB: string; a: number | null; b: number | null };
export type SetComparison = {
  a: AssumptionSetSummary;
  b: AssumptionSetSummary;
  fields: FieldChange[];
  funds: FundChange[];
  correlations: CorrelationChange[];
};

/** Two versions of the scheme's assumptions, compared. */
export async function compareVersions(db: DbOrTx, schemeId: string, aId: string, bId: string): Promise<SetComparison> {
  const [a, b] = await Promise.all([getSet(db, schemeId, aId), getSet(db, schemeId, bId)]);
  return compareSets(a, b);
}

/** Side-by-side difference of two versions: every field, every fund and every correlation pair that differs. */
export function compareSets(a: AssumptionSetDetail, b: AssumptionSetDetail): SetComparison {
  const fieldNames: FieldChange['field'][] = ['setAt', 'inflation', 'salaryGrowth', 'annuityRealRate', 'annuityYears', 'rationale'];
  const fields = fieldNames.map((field) => ({ field, a: a[field], b: b[field], changed: a[field] !== b[field] }));
  const ids = [...new Set([...a.funds.map((f) => f.fundId), ...b.funds.map((f) => f.fundId)])];
  const pick = (f?: AssumptionSetDetail['funds'][number]) => (f ? { fundId: f.fundId, expectedReturn: f.expectedReturn, volatility: f.volatility, annualCharge: f.annualCharge } : null);
  const name = (id: string) => (a.funds.find((f) => f.fundId === id) ?? b.funds.find((f) => f.fundId === id))!.name;
  const fundsOut = ids.map<FundChange>((fundId) => {
    const fa = pick(a.funds.find((f) => f.fundId === fundId));
    const fb = pick(b.funds.find((f) => f.fundId === fundId));
    const changed: FundChange['changed'] = [];
    if (!fa) changed.push('added');
    else if (!fb) changed.push('removed');
    else for (const k of ['expectedReturn', 'volatility', 'annualCharge'] as const) if (fa[k] !== fb[k]) changed.push(k);
    return { fundId, name: name(fundId), a: fa, b: fb, changed };
  });
  const corr = (s: AssumptionSetDetail, x: string, y: string) => {
    const i = s.funds.findIndex((f) => f.fundId === x);
    const j = s.funds.findIndex((f) => f.fundId === y);
    return i < 0 || j < 0 ? null : s.correlations[i][j];
  };
  const correlations: CorrelationChange[] = [];
  for (let i = 0; i < ids.length; i++)
    for (let j = i + 1; j < ids.length; j++) {
      const ca = corr(a, ids[i], ids[j]);
      const cb = corr(b, ids[i], ids[j]);
      if (ca !== cb) correlations.push({ fundA: ids[i], fundB: ids[j], nameA: name(ids[i]), nameB: name(ids[j]), a: ca, b: cb });
    }
  const summary = (s: AssumptionSetDetail): AssumptionSetSummary => ({
    id: s.id, version: s.version, status: s.status, setAt: s.setAt, basedOnId: s.basedOnId, createdBy: s.createdBy, createdAt: s.createdAt, updatedAt: s.updatedAt, approvedBy: s.approvedBy, approvedAt: s.approvedAt,
  });
  return { a: summary(a), b: summary(b), fields, funds: fundsOut, correlations };
}
