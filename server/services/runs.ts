import { randomInt } from 'node:crypto';
import { schemeOf, type ServiceContext } from './context';
import { and, desc, eq, getTableColumns } from 'drizzle-orm';
import type { AppContext } from '../context';
import { assumptionSets, funds, illustrativeMembers, projectionRuns, runOptionVersions } from '../../db/schema';
import { badRequest, conflict, notFound } from '../errors';
import { enqueueRun, producerFor, queueSettings } from '../jobs/queue';
import { audit } from './audit';
import { settingsOf } from './governance';
import { listOptions } from './options';
import { MAX_SEED } from '../../schemas/runs';
import { buildScenario, type ScenarioChoice, type ScenarioSnapshot } from './scenario';
import { comparisonAtLambda, parseScenario, prepareScenario, type ComparisonAtLambda } from '../../simulation';
import type { StoredResult } from '../jobs/result';
import { loadPots, potKey } from './runPots';
import type { DbOrTx } from '../../db/client';
import { onlyOwnLambdaText, storedFigures, type ExactFigures } from '../../figures';

export type RunRequest = Omit<ScenarioChoice, 'seed'> & { seed?: number };


/**
 * Requests a run: builds the scenario from the scheme's data, stores it as the run's input
 * snapshot, and queues the job — run row, job and audit event in one transaction.
 */
export async function requestRun(app: AppContext, ctx: ServiceContext, body: RunRequest) {
  const schemeId = schemeOf(ctx);
  const seed = body.seed ?? randomInt(0, MAX_SEED);
  // Start the queue client before taking a connection for the transaction (it needs its own).
  await producerFor(app.pool);
  return app.db.transaction(async (tx) => {
    const snapshot = await buildScenario(tx, schemeId, { ...body, seed });
    // The baseline is the option marked as the scheme's current default when the run is asked for.
    const baselineOptionId = (await settingsOf(tx, schemeId)).currentDefaultOptionId;
    return insertAndQueue(app, tx, ctx, snapshot, { seed, paths: body.paths, riskAversion: body.riskAversion, rerunOf: null, baselineOptionId });
  });
}

/** Runs a finished run again from its stored snapshot; the worker compares the two results. */
export async function rerun(app: AppContext, ctx: ServiceContext, runId: string) {
  await producerFor(app.pool);
  return app.db.transaction(async (tx) => {
    const [orig] = await tx.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, schemeOf(ctx))));
    if (!orig) throw notFound('No such run in this scheme.');
    if (orig.status !== 'done') throw conflict('Only a finished run can be run again for comparison.');
    return insertAndQueue(app, tx, ctx, orig.input, { seed: orig.seed, paths: orig.paths, riskAversion: orig.riskAversion, rerunOf: orig.id, baselineOptionId: orig.baselineOptionId });
  });
}

async function insertAndQueue(
  app: AppContext,
  tx: Parameters<Parameters<AppContext['db']['transaction']>[0]>[0],
  ctx: ServiceContext,
  snapshot: ScenarioSnapshot,
  run: { seed: number; paths: number; riskAversion: number; rerunOf: string | null; baselineOptionId: string | null },
) {
  const [row] = await tx
    .insert(projectionRuns)
    .values({
      schemeId: schemeOf(ctx),
      status: 'queued',
      assumptionSetId: snapshot.assumptionSet.id,
      assumptionsDraft: snapshot.assumptionSet.status !== 'approved',
      seed: run.seed,
      paths: run.paths,
      riskAversion: run.riskAversion,
      input: snapshot,
      rerunOf: run.rerunOf,
      baselineOptionId: run.baselineOptionId,
      requestedBy: ctx.actor?.id ?? null,
    })
    .returning();
  // The versions run, queryable beside the snapshot (a rerun of a run made before versioning has none).
  const versioned = snapshot.options.flatMap((o, position) => (o.versionId ? [{ runId: row.id, position, optionId: o.id, optionVersionId: o.versionId }] : []));
  if (versioned.length) await tx.insert(runOptionVersions).values(versioned);
  await enqueueRun(app.pool, tx, row.id);
  await audit(tx, ctx, {
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
  return {
    id: r.id,
    status: r.status,
    progress: r.progress,
    error: r.error,
    seed: r.seed,
    paths: r.paths,
    riskAversion: r.riskAversion,
    assumptionsDraft: r.assumptionsDraft,
    assumptionSet: r.input.assumptionSet,
    options: r.input.options.map((o) => ({ id: o.id, name: o.name, versionId: o.versionId ?? null, version: o.version ?? null, status: o.status ?? null })),
    /** The scheme's current default when the run was made: the comparison pins it first. */
    baselineOptionId: r.baselineOptionId,
    members: r.input.members.map((m) => ({ id: m.id, label: m.label })),
    stress: r.input.stress,
    targetReplacementRatio: r.input.scenario.targetReplacementRatio,
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

export async function listRuns(app: AppContext, schemeId: string, limit: number) {
  const rows = await app.db.select(summaryColumns).from(projectionRuns).where(eq(projectionRuns.schemeId, schemeId)).orderBy(desc(projectionRuns.createdAt)).limit(limit);
  return rows.map(summary);
}

export async function getRun(app: AppContext, schemeId: string, runId: string) {
  const [r] = await app.db.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, schemeId)));
  if (!r) throw notFound('No such run in this scheme.');
  return { ...summary(r), input: r.input, result: r.status === 'done' ? r.result : null };
}

/** What a run can be made of: the scheme's assumption sets, options, members and funds. */
export async function runChoices(app: AppContext, schemeId: string) {
  const sets = await app.db
    .select({ id: assumptionSets.id, version: assumptionSets.version, status: assumptionSets.status, setAt: assumptionSets.setAt, fundOrder: assumptionSets.fundOrder })
    .from(assumptionSets)
    .where(eq(assumptionSets.schemeId, schemeId))
    .orderBy(desc(assumptionSets.version));
  // Each active option as a run would use it (newest approved version), with a newer draft offered beside it.
  const options = (await listOptions(app.db, schemeId, false)).map((o) => ({
    id: o.id,
    name: o.approved?.name ?? o.name,
    description: o.description,
    version: o.approved ?? o.latest,
    draft: o.latest.status === 'draft' ? o.latest : null,
    isCurrentDefault: o.isCurrentDefault,
  }));
  const members = await app.db
    .select({ id: illustrativeMembers.id, label: illustrativeMembers.label, age: illustrativeMembers.age, retirementAge: illustrativeMembers.retirementAge })
    .from(illustrativeMembers)
    .where(eq(illustrativeMembers.schemeId, schemeId))
    .orderBy(illustrativeMembers.age);
  const fundRows = await app.db.select({ id: funds.id, name: funds.name }).from(funds).where(eq(funds.schemeId, schemeId)).orderBy(funds.name);
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
  const exact = await exactComparison(ctx.db, r, query);
  if (!exact) throw conflict('This run was stored before every path’s pot was kept (engine before 2.0.0). Run it again to compare the options at any λ.');
  return exact;
}

type StoredRun = Pick<RunRow, 'id' | 'status' | 'input' | 'result' | 'engineVersion' | 'riskAversion'>;

/** The exact comparison of a stored run at λ (see runComparison); null when its pots were not kept. */
async function exactComparison(db: DbOrTx, r: StoredRun, query: { lambda: number; variant: 'base' | 'stressed' }) {
  if (r.status !== 'done' || !r.result) throw conflict('That run has not finished; comparisons need a finished run.');
  const runId = r.id;
  const snapshot = r.input as ScenarioSnapshot;
  const stored = r.result as StoredResult;
  const variant = query.variant === 'base' ? stored.base : stored.stressed;
  if (!variant) throw badRequest('Some fields are not valid.', [{ path: 'variant', message: 'this run has no stressed variant' }]);
  const pots = await loadPots(db, runId, query.variant);
  if (pots.size === 0) return null;
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

/**
 * The exact figures of a finished run at λ for its base and stressed variants, as reports and
 * decision records print them: from every path's pot, or — for a run stored before pots were
 * kept — the engine's own full-sample figures at the run's λ (409 at any other λ: nothing is
 * approximated).
 */
export async function exactFiguresAt(db: DbOrTx, r: StoredRun, lambda: number): Promise<{ base: ExactFigures; stressed: ExactFigures | null }> {
  const stored = r.result as StoredResult;
  const base = await exactComparison(db, r, { lambda, variant: 'base' });
  if (base) return { base, stressed: stored.stressed ? await exactComparison(db, r, { lambda, variant: 'stressed' }) : null };
  if (lambda !== r.riskAversion) throw conflict(onlyOwnLambdaText(r.riskAversion));
  return { base: storedFigures(stored.base), stressed: stored.stressed ? storedFigures(stored.stressed) : null };
}
