import { randomInt } from 'node:crypto';
import { contextOf } from './context';
import type { Request } from 'express';
import { and, desc, eq, getTableColumns } from 'drizzle-orm';
import type { AppContext } from '../context';
import { assumptionSets, funds, illustrativeMembers, projectionRuns, runOptionVersions } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { enqueueRun, producerFor, queueSettings } from '../jobs/queue';
import { audit } from './audit';
import { settingsOf } from './governance';
import { listOptions } from './options';
import { buildScenario, type ScenarioChoice, type ScenarioSnapshot } from './scenario';

export type RunRequest = Omit<ScenarioChoice, 'seed'> & { seed?: number };

/** Seeds are stored as PostgreSQL integers: 0 … 2³¹ − 1. */
export const MAX_SEED = 2 ** 31 - 1;

/**
 * Requests a run: builds the scenario from the scheme's data, stores it as the run's input
 * snapshot, and queues the job — run row, job and audit event in one transaction.
 */
export async function requestRun(ctx: AppContext, req: Request, body: RunRequest) {
  const schemeId = req.scheme!.id;
  const seed = body.seed ?? randomInt(0, MAX_SEED);
  // Start the queue client before taking a connection for the transaction (it needs its own).
  await producerFor(ctx.pool);
  return ctx.db.transaction(async (tx) => {
    const snapshot = await buildScenario(tx, schemeId, { ...body, seed });
    // The baseline is the option marked as the scheme's current default when the run is asked for.
    const baselineOptionId = (await settingsOf(tx, schemeId)).currentDefaultOptionId;
    return insertAndQueue(ctx, tx, req, snapshot, { seed, paths: body.paths, riskAversion: body.riskAversion, rerunOf: null, baselineOptionId });
  });
}

/** Runs a finished run again from its stored snapshot; the worker compares the two results. */
export async function rerun(ctx: AppContext, req: Request, runId: string) {
  await producerFor(ctx.pool);
  return ctx.db.transaction(async (tx) => {
    const [orig] = await tx.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, req.scheme!.id)));
    if (!orig) throw notFound('No such run in this scheme.');
    if (orig.status !== 'done') throw conflict('Only a finished run can be run again for comparison.');
    return insertAndQueue(ctx, tx, req, orig.input as ScenarioSnapshot, { seed: orig.seed, paths: orig.paths, riskAversion: orig.riskAversion, rerunOf: orig.id, baselineOptionId: orig.baselineOptionId });
  });
}

async function insertAndQueue(
  ctx: AppContext,
  tx: Parameters<Parameters<AppContext['db']['transaction']>[0]>[0],
  req: Request,
  snapshot: ScenarioSnapshot,
  run: { seed: number; paths: number; riskAversion: number; rerunOf: string | null; baselineOptionId: string | null },
) {
  const [row] = await tx
    .insert(projectionRuns)
    .values({
      schemeId: req.scheme!.id,
      status: 'queued',
      assumptionSetId: snapshot.assumptionSet.id,
      assumptionsDraft: snapshot.assumptionSet.status !== 'approved',
      seed: run.seed,
      paths: run.paths,
      riskAversion: run.riskAversion,
      input: snapshot,
      rerunOf: run.rerunOf,
      baselineOptionId: run.baselineOptionId,
      requestedBy: req.user!.id,
    })
    .returning();
  // The versions run, queryable beside the snapshot (a rerun of a run made before versioning has none).
  const versioned = snapshot.options.flatMap((o, position) => (o.versionId ? [{ runId: row.id, position, optionId: o.id, optionVersionId: o.versionId }] : []));
  if (versioned.length) await tx.insert(runOptionVersions).values(versioned);
  await enqueueRun(ctx.pool, tx, row.id);
  await audit(tx, contextOf(req), {
    action: run.rerunOf ? 'run.repeated' : 'run.requested',
    entity: 'projection_run',
    entityId: row.id,
    after: {
      assumptionSet: snapshot.assumptionSet.version,
      draft: row.assumptionsDraft,
      options: snapshot.options.map((o) => (o.version ? `${o.name} v${o.version}${o.status === 'draft' ? ' (draft)' : ''}` : o.name)),
      members: snapshot.members.map((m) => m.label),
      seed: run.seed,
      paths: run.paths,
      riskAversion: run.riskAversion,
      stress: snapshot.stress,
      rerunOf: run.rerunOf,
    },
  });
  return summary(row);
}

type RunRow = typeof projectionRuns.$inferSelect;

/** Every column but the result (hundreds of KiB per run), for lists. */
const { result: _result, ...summaryColumns } = getTableColumns(projectionRuns);

/** A run without its result: for lists and progress polling. */
export function summary(r: Omit<RunRow, 'result'>) {
  const input = r.input as ScenarioSnapshot;
  return {
    id: r.id,
    status: r.status,
    progress: r.progress,
    error: r.error,
    seed: r.seed,
    paths: r.paths,
    riskAversion: r.riskAversion,
    assumptionsDraft: r.assumptionsDraft,
    assumptionSet: input.assumptionSet,
    options: input.options.map((o) => ({ id: o.id, name: o.name, versionId: o.versionId ?? null, version: o.version ?? null, status: o.status ?? null })),
    /** The scheme's current default when the run was made: the comparison pins it first. */
    baselineOptionId: r.baselineOptionId,
    members: input.members.map((m) => ({ id: m.id, label: m.label })),
    stress: input.stress,
    targetReplacementRatio: input.scenario.targetReplacementRatio,
    engineVersion: r.engineVersion,
    rerunOf: r.rerunOf,
    createdAt: r.createdAt,
    startedAt: r.startedAt,
    finishedAt: r.finishedAt,
    heartbeatAt: r.heartbeatAt,
    /** Running, but its worker has gone quiet: it is handed back to the queue shortly. */
    stalled: r.status === 'running' && (!r.heartbeatAt || Date.now() - r.heartbeatAt.getTime() > queueSettings().stallSeconds * 1000),
  };
}

export async function listRuns(ctx: AppContext, schemeId: string, limit: number) {
  const rows = await ctx.db.select(summaryColumns).from(projectionRuns).where(eq(projectionRuns.schemeId, schemeId)).orderBy(desc(projectionRuns.createdAt)).limit(limit);
  return rows.map(summary);
}

export async function getRun(ctx: AppContext, schemeId: string, runId: string) {
  const [r] = await ctx.db.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, schemeId)));
  if (!r) throw notFound('No such run in this scheme.');
  return { ...summary(r), input: r.input as ScenarioSnapshot, result: r.status === 'done' ? r.result : null };
}

/** What a run can be made of: the scheme's assumption sets, options, members and funds. */
export async function runChoices(ctx: AppContext, schemeId: string) {
  const sets = await ctx.db
    .select({ id: assumptionSets.id, version: assumptionSets.version, status: assumptionSets.status, setAt: assumptionSets.setAt, fundOrder: assumptionSets.fundOrder })
    .from(assumptionSets)
    .where(eq(assumptionSets.schemeId, schemeId))
    .orderBy(desc(assumptionSets.version));
  // Each active option as a run would use it (newest approved version), with a newer draft offered beside it.
  const options = (await listOptions(ctx.db, schemeId, false)).map((o) => ({
    id: o.id,
    name: o.approved?.name ?? o.name,
    description: o.description,
    version: o.approved ?? o.latest,
    draft: o.latest.status === 'draft' ? o.latest : null,
    isCurrentDefault: o.isCurrentDefault,
  }));
  const members = await ctx.db
    .select({ id: illustrativeMembers.id, label: illustrativeMembers.label, age: illustrativeMembers.age, retirementAge: illustrativeMembers.retirementAge })
    .from(illustrativeMembers)
    .where(eq(illustrativeMembers.schemeId, schemeId))
    .orderBy(illustrativeMembers.age);
  const fundRows = await ctx.db.select({ id: funds.id, name: funds.name }).from(funds).where(eq(funds.schemeId, schemeId)).orderBy(funds.name);
  return { assumptionSets: sets, options, members, funds: fundRows };
}
