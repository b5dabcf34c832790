import { availableParallelism } from 'node:os';
import { and, eq, inArray, ne, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { projectionRuns } from '../../db/schema';
import { ENGINE_VERSION, ScenarioValidationError, type ScenarioInput } from '../../simulation';
import type { Logger } from 'pino';
import { runScenarioThreaded } from '../compute/threads';
import { log as rootLog } from '../log';
import { audit } from '../services/audit';
import { insertPots } from '../services/runPots';
import { queueSettings } from './queue';
import { compareResults, potRows, storeVariant, type PotRow, type StoredResult } from './result';

export type HandlerOptions = {
  /** Worker threads per run (default KEELSON_RUN_THREADS, else the machine's parallelism). */
  threads?: number;
  /** Least time between two progress writes. */
  progressIntervalMs?: number;
};

/** `deferred`: the scheme already has its share of runs running; the job waits its turn. */
export type RunOutcome = 'done' | 'failed' | 'skipped' | 'deferred';

/** An error that running again would not cure (bad stored input): the run fails at once. */
function isPermanent(err: unknown): boolean {
  return err instanceof ScenarioValidationError || err instanceof RangeError || err instanceof TypeError;
}

function defaultThreads(): number {
  const env = Number(process.env.KEELSON_RUN_THREADS);
  return Number.isInteger(env) && env >= 1 ? env : Math.max(1, availableParallelism());
}

/**
 * Runs one queued projection and stores its result.
 *
 * Idempotent by run id: a run already done is skipped, and the result is written with a
 * conditional update (status <> 'done'), so a job delivered twice (a retry after a lost
 * worker, an expiry while still running) stores one result set. The stress variant, when
 * asked for, runs in the same job with the same seed, so both see the same draws.
 *
 * Errors that would recur (invalid stored input) mark the run failed with the reason; any
 * other error is thrown for the queue to retry, and `lastAttempt` marks the run failed instead.
 */
export async function processRun(db: Db, runId: string, opts: HandlerOptions & { lastAttempt?: boolean } = {}): Promise<RunOutcome> {
  const settings = queueSettings();
  // Claim the run — unless its scheme already has schemeMaxRunning runs with a live heartbeat.
  const [run] = await db
    .update(projectionRuns)
    .set({ status: 'running', progress: 0, startedAt: new Date(), heartbeatAt: new Date(), error: null })
    .where(
      and(
        eq(projectionRuns.id, runId),
        inArray(projectionRuns.status, ['queued', 'running']),
        sql`(select count(*) from projection_runs o
              where o.scheme_id = ${projectionRuns.schemeId} and o.id <> ${projectionRuns.id} and o.status = 'running'
                and o.heartbeat_at > now() - make_interval(secs => ${settings.stallSeconds})) < ${settings.schemeMaxRunning}`,
      ),
    )
    .returning();
  if (!run) {
    const [still] = await db.select({ status: projectionRuns.status }).from(projectionRuns).where(eq(projectionRuns.id, runId));
    return still && (still.status === 'queued' || still.status === 'running') ? 'deferred' : 'skipped';
  }
  const log = rootLog.child({ runId, schemeId: run.schemeId });
  log.info({ paths: run.paths }, 'run started');
  // The heartbeat says this worker is alive; the main thread is free while the threads compute.
  const beat = setInterval(() => {
    db.update(projectionRuns)
      .set({ heartbeatAt: new Date() })
      .where(and(eq(projectionRuns.id, runId), eq(projectionRuns.status, 'running')))
      .catch((err) => log.warn({ err: { message: err.message } }, 'heartbeat not written'));
  }, settings.heartbeatSeconds * 1000);
  beat.unref();
  try {
    return await computeAndStore(db, run, variantsOf(run), opts, log);
  } finally {
    clearInterval(beat);
  }
}

type RunRow = typeof projectionRuns.$inferSelect;

function variantsOf(run: RunRow): ScenarioInput[] {
  const snapshot = run.input;
  const variants: ScenarioInput[] = [snapshot.scenario];
  if (snapshot.stress) variants.push({ ...snapshot.scenario, stress: snapshot.stress });
  return variants;
}

async function computeAndStore(db: Db, run: RunRow, variants: ScenarioInput[], opts: HandlerOptions & { lastAttempt?: boolean }, log: Logger): Promise<RunOutcome> {
  const runId = run.id;
  let lastWrite = 0;
  let lastValue = 0;
  let writing: Promise<unknown> = Promise.resolve();
  const interval = opts.progressIntervalMs ?? 400;
  const report = (fraction: number) => {
    const now = Date.now();
    if (now - lastWrite < interval || fraction - lastValue < 0.01) return;
    lastWrite = now;
    lastValue = fraction;
    const value = Math.min(0.99, fraction);
    // Progress is advisory: one write at a time, never over a finished run.
    writing = writing.then(() =>
      db
        .update(projectionRuns)
        .set({ progress: value })
        .where(and(eq(projectionRuns.id, runId), eq(projectionRuns.status, 'running')))
        .catch(() => undefined),
    );
  };

  let stored: StoredResult;
  const pots: PotRow[] = [];
  try {
    const threads = opts.threads ?? defaultThreads();
    let sampleKind: 'all' | 'quantiles' = 'all';
    const out = [];
    for (let v = 0; v < variants.length; v++) {
      const result = await runScenarioThreaded(variants[v], { threads, onProgress: (f) => report((v + f) / variants.length) });
      pots.push(...(await potRows(runId, v === 0 ? 'base' : 'stressed', result)));
      const s = storeVariant(result);
      sampleKind = s.sampleKind;
      out.push(s.variant);
    }
    stored = {
      kind: 'keelson-run-result',
      engineVersion: ENGINE_VERSION,
      sample: { kind: sampleKind, size: out[0].samples[0]?.realPots.length ?? 0 },
      base: out[0],
      stressed: out[1] ?? null,
    };
  } catch (err) {
    await writing;
    if (!isPermanent(err) && !opts.lastAttempt) throw err;
    const reason = err instanceof Error ? err.message : String(err);
    log.warn({ reason }, 'run failed');
    await markFailed(db, run.schemeId, runId, reason);
    return 'failed';
  }
  await writing;

  if (run.rerunOf) {
    const [original] = await db.select({ result: projectionRuns.result }).from(projectionRuns).where(eq(projectionRuns.id, run.rerunOf));
    const before = original?.result ?? null;
    const diff = before ? compareResults(before, stored) : { path: '(result)', original: 'not available', rerun: 'computed' };
    stored.reproduction = { of: run.rerunOf, matches: diff === null, firstDifference: diff, checkedAt: new Date().toISOString() };
  }

  return db.transaction(async (tx) => {
    const [updated] = await tx
      .update(projectionRuns)
      .set({ status: 'done', progress: 1, result: stored, engineVersion: ENGINE_VERSION, finishedAt: new Date(), error: null })
      .where(and(eq(projectionRuns.id, runId), ne(projectionRuns.status, 'done')))
      .returning({ id: projectionRuns.id });
    if (!updated) return 'skipped' as const;
    await insertPots(tx, pots);
    await audit(tx, null, {
      action: 'run.completed',
      schemeId: run.schemeId,
      entity: 'projection_run',
      entityId: runId,
      after: { engineVersion: ENGINE_VERSION, reproduced: stored.reproduction ? stored.reproduction.matches : undefined },
      userId: null,
      actorEmail: null,
    });
    return 'done' as const;
  });
}

export async function markFailed(db: Db, schemeId: string, runId: string, reason: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [updated] = await tx
      .update(projectionRuns)
      .set({ status: 'failed', error: reason.slice(0, 2000), finishedAt: new Date() })
      .where(and(eq(projectionRuns.id, runId), inArray(projectionRuns.status, ['queued', 'running'])))
      .returning({ id: projectionRuns.id });
    if (updated) await audit(tx, null, { action: 'run.failed', schemeId, entity: 'projection_run', entityId: runId, after: { reason }, userId: null, actorEmail: null });
  });
}

/**
 * Runs whose job went back to the queue (its worker was lost and the job expired) show as
 * queued again rather than running with stale progress.
 */
export async function requeueAbandoned(db: Db, schema: string, queue: string): Promise<number> {
  const res = await db.execute(sql`
    update projection_runs r set status = 'queued', progress = 0
    where r.status = 'running'
      and exists (select 1 from ${sql.identifier(schema)}.job j
                  where j.name = ${queue} and j.id = r.id and j.state in ('retry', 'created'))`);
  return res.rowCount ?? 0;
}
