import { and, asc, count, desc, eq, inArray, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../../db/client';
import { defaultOptions, optionVersions, reviewOptionVersions, runOptionVersions, users, type GlidePathPoint } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { approvalsOf, recordApproval, withdrawApprovals, type Approval } from './approvals';
import { audit } from './audit';
import { schemeOf, type ServiceContext } from './context';
import { assertSchemeFunds } from './funds';
import { settingsOf } from './governance';

/**
 * Default options and their versions. An option is an identity; what it invests in lives in
 * its versions. A draft version may be edited; once trustees approve it (four-eyes) it never
 * changes, and the next edit starts a new draft. Runs and reviews name the versions they used.
 */
export type OptionInput = { name: string; description: string; glidePath: GlidePathPoint[] };
type VersionRow = typeof optionVersions.$inferSelect;

export type VersionSummary = { id: string; version: number; status: 'draft' | 'approved'; name: string; updatedAt: Date; approvedAt: Date | null };
export type OptionSummary = {
  id: string;
  archived: boolean;
  createdAt: Date;
  updatedAt: Date;
  /** The newest version's content (a draft when one is pending). */
  name: string;
  description: string;
  glidePath: GlidePathPoint[];
  latest: VersionSummary;
  /** The newest approved version: what runs use unless told otherwise. */
  approved: VersionSummary | null;
  isCurrentDefault: boolean;
};
export type VersionDetail = VersionSummary & {
  optionId: string;
  description: string;
  glidePath: GlidePathPoint[];
  basedOnId: string | null;
  basedOnVersion: number | null;
  createdBy: string | null;
  createdAt: Date;
  updatedBy: string | null;
  updatedById: string | null;
  approvedBy: string | null;
  approvals: Approval[];
  approvalsRequired: number;
  usedByRuns: number;
};

const versionSummary = (v: VersionRow): VersionSummary => ({ id: v.id, version: v.version, status: v.status, name: v.name, updatedAt: v.updatedAt, approvedAt: v.approvedAt });
const content = (o: OptionInput | VersionRow) => ({ name: o.name, description: o.description, glidePath: o.glidePath });
const label = (v: Pick<VersionRow, 'name' | 'version'>) => `${v.name} v${v.version}`;

/**
 * Points sorted from furthest to nearest retirement, with zero weights dropped and the funds in
 * id order — the order PostgreSQL's jsonb keeps them in, so a stored path and the same path as
 * typed compare equal.
 */
function normalise(path: GlidePathPoint[]): GlidePathPoint[] {
  return [...path]
    .sort((a, b) => b.yearsToRetirement - a.yearsToRetirement)
    .map((p) => ({
      yearsToRetirement: p.yearsToRetirement,
      weights: Object.fromEntries(
        Object.entries(p.weights)
          .filter(([, w]) => w > 0)
          .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)),
      ),
    }));
}

const sameContent = (a: OptionInput, b: OptionInput) => a.name === b.name && a.description === b.description && JSON.stringify(normalise(a.glidePath)) === JSON.stringify(normalise(b.glidePath));

async function checkFunds(db: DbOrTx, schemeId: string, input: OptionInput) {
  const ids: string[] = [];
  const paths: string[] = [];
  input.glidePath.forEach((p, i) => Object.keys(p.weights).forEach((fid) => (ids.push(fid), paths.push(`glidePath.${i}.weights.${fid}`))));
  await assertSchemeFunds(db, schemeId, ids, paths);
}

/** Every version of the given options, newest first, by option id. */
async function versionsByOption(db: DbOrTx, optionIds: string[]): Promise<Map<string, VersionRow[]>> {
  const out = new Map<string, VersionRow[]>(optionIds.map((id) => [id, []]));
  if (!optionIds.length) return out;
  const rows = await db.select().from(optionVersions).where(inArray(optionVersions.optionId, optionIds)).orderBy(desc(optionVersions.version));
  for (const r of rows) out.get(r.optionId)!.push(r);
  return out;
}

/** An active option (other than `exceptId`) whose newest version has this name, case aside. */
async function nameTaken(db: DbOrTx, schemeId: string, name: string, exceptId?: string) {
  const rows = await db.execute(sql`
    select o.id from default_options o
    join lateral (select v.name from default_option_versions v where v.option_id = o.id order by v.version desc limit 1) latest on true
    where o.scheme_id = ${schemeId} and not o.archived and lower(latest.name) = lower(${name})`);
  return (rows.rows as { id: string }[]).some((r) => r.id !== exceptId);
}

/** An option as lists show it: its newest version's content, its newest approved version, and whether it is the current default. */
function summarise(row: typeof defaultOptions.$inferSelect, versions: VersionRow[], currentDefaultOptionId: string | null): OptionSummary {
  const approved = versions.find((v) => v.status === 'approved') ?? null;
  return {
    id: row.id,
    archived: row.archived,
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    ...content(versions[0]),
    latest: versionSummary(versions[0]),
    approved: approved && versionSummary(approved),
    isCurrentDefault: row.id === currentDefaultOptionId,
  };
}

export async function listOptions(db: DbOrTx, schemeId: string, includeArchived: boolean): Promise<OptionSummary[]> {
  const rows = await db
    .select()
    .from(defaultOptions)
    .where(and(eq(defaultOptions.schemeId, schemeId), includeArchived ? undefined : eq(defaultOptions.archived, false)))
    .orderBy(asc(defaultOptions.archived), asc(defaultOptions.createdAt));
  const versions = await versionsByOption(
    db,
    rows.map((r) => r.id),
  );
  const { currentDefaultOptionId } = await settingsOf(db, schemeId);
  return rows.filter((r) => versions.get(r.id)!.length > 0).map((r) => summarise(r, versions.get(r.id)!, currentDefaultOptionId));
}

/** One option with every version (newest first). */
export async function getOption(db: DbOrTx, schemeId: string, id: string) {
  const [row] = await db.select().from(defaultOptions).where(and(eq(defaultOptions.id, id), eq(defaultOptions.schemeId, schemeId)));
  if (!row) throw notFound('No such default option in this scheme.');
  const vs = (await versionsByOption(db, [id])).get(id)!;
  if (!vs.length) throw notFound('No such default option in this scheme.');
  const { currentDefaultOptionId } = await settingsOf(db, schemeId);
  return { ...summarise(row, vs, currentDefaultOptionId), versions: vs.map(versionSummary) };
}

const creator = alias(users, 'creator');
const editor = alias(users, 'editor');
const approver = alias(users, 'approver');
const base = alias(optionVersions, 'base');

/** One version with who made, changed and approved it, its approvals, and how many runs used it. */
export async function getVersion(db: DbOrTx, schemeId: string, optionId: string, versionId: string): Promise<VersionDetail> {
  const [r] = await db
    .select({ v: optionVersions, createdBy: creator.displayName, updatedBy: editor.displayName, approvedBy: approver.displayName, basedOnVersion: base.version })
    .from(optionVersions)
    .leftJoin(creator, eq(creator.id, optionVersions.createdBy))
    .leftJoin(editor, eq(editor.id, optionVersions.updatedBy))
    .leftJoin(approver, eq(approver.id, optionVersions.approvedBy))
    .leftJoin(base, eq(base.id, optionVersions.basedOnId))
    .where(and(eq(optionVersions.id, versionId), eq(optionVersions.optionId, optionId), eq(optionVersions.schemeId, schemeId)));
  if (!r) throw notFound('No such version of this default option.');
  const [used] = await db.select({ n: count() }).from(runOptionVersions).where(eq(runOptionVersions.optionVersionId, versionId));
  const { approvalsRequired } = await settingsOf(db, schemeId);
  return {
    ...versionSummary(r.v),
    optionId: r.v.optionId,
    description: r.v.description,
    glidePath: r.v.glidePath,
    basedOnId: r.v.basedOnId,
    basedOnVersion: r.basedOnVersion,
    createdBy: r.createdBy,
    createdAt: r.v.createdAt,
    updatedBy: r.updatedBy,
    updatedById: r.v.updatedBy,
    approvedBy: r.approvedBy,
    approvals: (await approvalsOf(db, 'option_version', [versionId])).get(versionId)!,
    approvalsRequired,
    usedByRuns: Number(used.n),
  };
}

/** A new option, as a draft version 1 awaiting approval. */
export async function createOption(db: DbOrTx, ctx: ServiceContext, input: OptionInput) {
  const schemeId = schemeOf(ctx);
  await checkFunds(db, schemeId, input);
  return db.transaction(async (tx) => {
    if (await nameTaken(tx, schemeId, input.name)) throw conflict(`There is already an option called "${input.name}".`);
    const [row] = await tx.insert(defaultOptions).values({ schemeId }).returning();
    const [v] = await tx
      .insert(optionVersions)
      .values({ optionId: row.id, schemeId, version: 1, status: 'draft', ...content(input), glidePath: normalise(input.glidePath), createdBy: ctx.actor?.id, updatedBy: ctx.actor?.id })
      .returning();
    await audit(tx, ctx, { action: 'option.created', entity: 'default_option', entityId: row.id, after: { version: 1, versionId: v.id, ...content(v) } });
    return getOption(tx, schemeId, row.id);
  });
}

/** Locks an option of the scheme and returns it with its versions (newest first). */
async function lockOption(tx: DbOrTx, schemeId: string, id: string) {
  const [row] = await tx.select().from(defaultOptions).where(and(eq(defaultOptions.id, id), eq(defaultOptions.schemeId, schemeId))).for('update');
  if (!row) throw notFound('No such default option in this scheme.');
  return { row, versions: (await versionsByOption(tx, [id])).get(id)! };
}

/**
 * Edits an option. A pending draft is changed in place (and loses any approvals it had);
 * otherwise the edit starts the next version as a draft based on the newest one.
 */
export async function updateOption(db: DbOrTx, ctx: ServiceContext, id: string, input: OptionInput) {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    const { versions } = await lockOption(tx, schemeId, id);
    await checkFunds(tx, schemeId, input);
    if (await nameTaken(tx, schemeId, input.name, id)) throw conflict(`There is already an option called "${input.name}".`);
    const newest = versions[0];
    const now = new Date();
    if (newest.status === 'draft') {
      await tx
        .update(optionVersions)
        .set({ ...content(input), glidePath: normalise(input.glidePath), updatedBy: ctx.actor?.id, updatedAt: now })
        .where(eq(optionVersions.id, newest.id));
      const withdrawn = await withdrawApprovals(tx, 'option_version', newest.id);
      await audit(tx, ctx, {
        action: 'option.draft-updated',
        entity: 'default_option',
        entityId: id,
        before: { version: newest.version, versionId: newest.id, ...content(newest) },
        after: { version: newest.version, versionId: newest.id, ...content(input), approvalsWithdrawn: withdrawn },
      });
    } else {
      if (sameContent(input, newest)) throw conflict(`Nothing changed: this is version ${newest.version} as approved.`);
      const [v] = await tx
        .insert(optionVersions)
        .values({ optionId: id, schemeId, version: newest.version + 1, status: 'draft', ...content(input), glidePath: normalise(input.glidePath), basedOnId: newest.id, createdBy: ctx.actor?.id, updatedBy: ctx.actor?.id })
        .returning();
      await audit(tx, ctx, {
        action: 'option.version-drafted',
        entity: 'default_option',
        entityId: id,
        before: { version: newest.version, versionId: newest.id, ...content(newest) },
        after: { version: v.version, versionId: v.id, ...content(v) },
      });
    }
    await tx.update(defaultOptions).set({ updatedAt: now }).where(eq(defaultOptions.id, id));
    return getOption(tx, schemeId, id);
  });
}

/** A trustee other than its last editor approves a draft version (four-eyes; two approvals when the scheme says so). */
export async function approveVersion(db: DbOrTx, ctx: ServiceContext, optionId: string, versionId: string) {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    await lockOption(tx, schemeId, optionId);
    const [v] = await tx
      .select()
      .from(optionVersions)
      .where(and(eq(optionVersions.id, versionId), eq(optionVersions.optionId, optionId)))
      .for('update');
    if (!v) throw notFound('No such version of this default option.');
    if (v.status !== 'draft') throw conflict(`${label(v)} is already approved and can no longer change.`);
    const result = await recordApproval(tx, ctx, { kind: 'option_version', id: v.id, schemeId, label: label(v), lastEditorId: v.updatedBy });
    if (result.complete) {
      await tx.update(optionVersions).set({ status: 'approved', approvedBy: ctx.actor!.id, approvedAt: result.at }).where(eq(optionVersions.id, v.id));
    }
    await audit(tx, ctx, {
      action: result.complete ? 'option.version-approved' : 'option.approval-recorded',
      entity: 'default_option',
      entityId: optionId,
      after: { version: v.version, versionId: v.id, name: v.name, approvals: result.count, required: result.required },
    });
  });
  return getVersion(db, schemeId, optionId, versionId);
}

/** Discards a draft version that no run or review used; an option keeps at least one version. */
export async function discardDraft(db: DbOrTx, ctx: ServiceContext, optionId: string, versionId: string) {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    const { versions } = await lockOption(tx, schemeId, optionId);
    const v = versions.find((x) => x.id === versionId);
    if (!v) throw notFound('No such version of this default option.');
    if (v.status !== 'draft') throw conflict(`${label(v)} is approved and is kept as a record.`);
    if (versions.length === 1) throw conflict('This is the option’s only version; archive the option instead.');
    const [runs] = await tx.select({ n: count() }).from(runOptionVersions).where(eq(runOptionVersions.optionVersionId, versionId));
    const [inReviews] = await tx.select({ n: count() }).from(reviewOptionVersions).where(eq(reviewOptionVersions.optionVersionId, versionId));
    if (Number(runs.n) + Number(inReviews.n) > 0) throw conflict(`${label(v)} was used by a projection run or a review, so it is kept as a record.`);
    await tx.delete(optionVersions).where(eq(optionVersions.id, versionId));
    await audit(tx, ctx, { action: 'option.draft-discarded', entity: 'default_option', entityId: optionId, before: { version: v.version, versionId, ...content(v) } });
  });
}

/** Archives (or restores) an option: past runs keep their own snapshot, so nothing is deleted. */
export async function setArchived(db: DbOrTx, ctx: ServiceContext, id: string, archived: boolean) {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    const { row: before, versions } = await lockOption(tx, schemeId, id);
    if (archived && (await settingsOf(tx, schemeId)).currentDefaultOptionId === id) {
      throw conflict('This option is the scheme’s current default; mark another option as the current default before archiving it.');
    }
    if (!archived && (await nameTaken(tx, schemeId, versions[0].name, id))) throw conflict(`An active option is already called "${versions[0].name}"; rename one first.`);
    await tx.update(defaultOptions).set({ archived, updatedAt: new Date() }).where(eq(defaultOptions.id, id));
    await audit(tx, ctx, { action: archived ? 'option.archived' : 'option.restored', entity: 'default_option', entityId: id, before: { archived: before.archived, name: versions[0].name }, after: { archived, name: versions[0].name } });
    return getOption(tx, schemeId, id);
  });
}

export type VersionComparison = {
  a: VersionDetail;
  b: VersionDetail;
  changed: { name: boolean; description: boolean; glidePath: boolean };
  /** Years to retirement named by either version, furthest first. */
  years: number[];
};

/** Two versions side by side (usually of one option): what changed and the glide-path points of both. */
export function compareVersions(a: VersionDetail, b: VersionDetail): VersionComparison {
  const years = [...new Set([...a.glidePath, ...b.glidePath].map((p) => p.yearsToRetirement))].sort((x, y) => y - x);
  return {
    a,
    b,
    changed: { name: a.name !== b.name, description: a.description !== b.description, glidePath: JSON.stringify(normalise(a.glidePath)) !== JSON.stringify(normalise(b.glidePath)) },
    years,
  };
}

/** A version of any option of the scheme, by its id alone (for comparisons across options). */
export async function getVersionById(db: DbOrTx, schemeId: string, versionId: string): Promise<VersionDetail> {
  const [v] = await db.select({ optionId: optionVersions.optionId }).from(optionVersions).where(and(eq(optionVersions.id, versionId), eq(optionVersions.schemeId, schemeId)));
  if (!v) throw notFound('No such option version in this scheme.');
  return getVersion(db, schemeId, v.optionId, versionId);
}
