import { randomInt } from 'node:crypto';
import { contextOf } from './context';
import type { Request } from 'express';
import { and, desc, eq, getTableColumns } from 'drizzle-orm';
import type { AppContext } from '../context';
import { assumptionSets, defaultOptions, funds, illustrativeMembers, projectionRuns } from '../../db/schema';
import { badRequest, conflict, notFound } from '../errors';
import { enqueueRun, producerFor } from '../jobs/queue';
import { audit } from './audit';
import { buildScenario, type ScenarioChoice, type ScenarioSnapshot } from './scenario';
import { comparisonAtLambda, parseScenario, prepareScenario, type ComparisonAtLambda } from '../../simulation';
import type { StoredResult } from '../jobs/result';
import { loadPots, potKey } from './runPots';

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
    return insertAndQueue(ctx, tx, req, snapshot, { seed, paths: body.paths, riskAversion: body.riskAversion, rerunOf: null });
  });
}

/** Runs a finished run again from its stored snapshot; the worker compares the two results. */
export async function rerun(ctx: AppContext, req: Request, runId: string) {
  await producerFor(ctx.pool);
  return ctx.db.transaction(async (tx) => {
    const [orig] = await tx.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, req.scheme!.id)));
    if (!orig) throw notFound('No such run in this scheme.');
    if (orig.status !== 'done') throw conflict('Only a finished run can be run again for comparison.');
    return insertAndQueue(ctx, tx, req, orig.input as ScenarioSnapshot, { seed: orig.seed, paths: orig.paths, riskAversion: orig.riskAversion, rerunOf: orig.id });
  });
}

async function insertAndQueue(
  ctx: AppContext,
  tx: Parameters<Parameters<AppContext['db']['transaction']>[0]>[0],
  req: Request,
  snapshot: ScenarioSnapshot,
  run: { seed: number; paths: number; riskAversion: number; rerunOf: string | null },
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
      requestedBy: req.user!.id,
    })
    .returning();
  await enqueueRun(ctx.pool, tx, row.id);
  await audit(tx, contextOf(req), {
    action: run.rerunOf ? 'run.repeated' : 'run.requested',
    entity: 'projection_run',
    entityId: row.id,
    after: {
      assumptionSet: snapshot.assumptionSet.version,
      draft: row.assumptionsDraft,
      options: snapshot.options.map((o) => o.name),
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
    options: input.options.map((o) => ({ id: o.id, name: o.name })),
    members: input.members.map((m) => ({ id: m.id, label: m.label })),
    stress: input.stress,
    targetReplacementRatio: input.scenario.targetReplacementRatio,
    engineVersion: r.engineVersion,
    rerunOf: r.rerunOf,
    createdAt: r.createdAt,
    startedAt: r.startedAt,
    finishedAt: r.finishedAt,
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
  const options = await ctx.db
    .select({ id: defaultOptions.id, name: defaultOptions.name, description: defaultOptions.description })
    .from(defaultOptions)
    .where(and(eq(defaultOptions.schemeId, schemeId), eq(defaultOptions.archived, false)))
    .orderBy(defaultOptions.createdAt, defaultOptions.name);
  const members = await ctx.db
    .select({ id: illustrativeMembers.id, label: illustrativeMembers.label, age: illustrativeMembers.age, retirementAge: illustrativeMembers.retirementAge })
    .from(illustrativeMembers)
    .where(eq(illustrativeMembers.schemeId, schemeId))
    .orderBy(illustrativeMembers.age);
  const fundRows = await ctx.db.select({ id: funds.id, name: funds.name }).from(funds).where(eq(funds.schemeId, schemeId)).orderBy(funds.name);
  return { assumptionSets: sets, options, members, funds: fundRows };
}

/**
 * A finished run's options compared at any λ, exactly, from every stored terminal real pot:
 * each option × member's certainty-equivalent pot, CE real return and its standard error; every
 * paired difference between options (CE, median pot, chance of target) with standard errors and
 * whether it is too close to call; each member's ranking; and the break-even λs (they do not
 * depend on λ: stored with the run). Runs stored before pots were kept (engine 1) answer 409.
 */
export async function runComparison(ctx: AppContext, schemeId: string, runId: string, query: { lambda: number; variant: 'base' | 'stressed' }) {
  const [r] = await ctx.db.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, schemeId)));
  if (!r) throw notFound('No such run in this scheme.');
  if (r.status !== 'done' || !r.result) throw conflict('That run has not finished; comparisons need a finished run.');
  const snapshot = r.input as ScenarioSnapshot;
  const stored = r.result as StoredResult;
  const variant = query.variant === 'base' ? stored.base : stored.stressed;
  if (!variant) throw badRequest('Some fields are not valid.', [{ path: 'variant', message: 'this run has no stressed variant' }]);
  const pots = await loadPots(ctx.db, runId, query.variant);
  if (pots.size === 0) {
    throw conflict('This run was stored before every path’s pot was kept (engine before 2.0.0). Run it again to compare the options at any λ.');
  }
  const scenario = parseScenario(query.variant === 'stressed' ? { ...snapshot.scenario, stress: snapshot.stress } : snapshot.scenario);
  const prepared = prepareScenario(scenario);
  const potsOf = (o: number, m: number) => {
    const p = pots.get(potKey(scenario.options[o].id, scenario.members[m].id));
    if (!p) throw new Error(`run ${runId} has no stored pots for option ${o} × member ${m}`);
    return p;
  };
  // Member by member, giving the event loop a turn in between (large runs take a while).
  const parts: ComparisonAtLambda[] = [];
  for (let m = 0; m < scenario.members.length; m++) {
    parts.push(comparisonAtLambda(prepared, potsOf, query.lambda, [m]));
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  return {
    runId,
    variant: query.variant,
    lambda: query.lambda,
    paths: scenario.paths,
    antithetic: scenario.antithetic,
    engineVersion: r.engineVersion,
    scenarioVersion: scenario.version,
    conventions: { timing: scenario.timing, contributionBasis: scenario.contributionBasis },
    pairs: parts.flatMap((p) => p.pairs),
    differences: parts.flatMap((p) => p.differences),
    ranking: parts.flatMap((p) => p.ranking),
    breakEven: variant.result.breakEven.map(({ memberId, optionA, optionB, status, crossings }) => ({ memberId, optionA, optionB, status, crossings: crossings ?? [] })),
  };
}
