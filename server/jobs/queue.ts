import PgBoss from 'pg-boss';
import { sql } from 'drizzle-orm';
import type { Pool } from 'pg';
import type { DbOrTx } from '../../db/client';
import { HttpError } from '../errors';
import { log } from '../log';

/**
 * The projection queue: pg-boss 10 in its own schema (`pgboss`) of Keelson's database.
 * A job carries only the run id; the run row holds every input. The queue's retry and
 * expiry settings are what bring a run back after a worker dies mid-run: an active job
 * whose worker stopped is expired by the next maintenance pass and offered again.
 */
export const RUN_QUEUE = 'projection-run';
export const BOSS_SCHEMA = 'pgboss';

export type QueueSettings = {
  /** A job active this long is taken to be lost and is retried. Longer than the longest run. */
  expireInSeconds: number;
  /** Attempts after the first. */
  retryLimit: number;
  retryDelaySeconds: number;
  /** How often a worker looks for expired jobs. */
  maintenanceIntervalSeconds: number;
  /** How often an idle worker polls for new jobs. */
  pollingIntervalSeconds: number;
  /** How often the worker running a run writes its heartbeat. */
  heartbeatSeconds: number;
  /** A running run whose heartbeat is older than this is stalled: its worker was lost. */
  stallSeconds: number;
  /** Runs of one scheme waiting or running at once; a request beyond it is refused (429). */
  schemeMaxWaiting: number;
  /** Runs of one scheme running at once across all workers; the next waits its turn. */
  schemeMaxRunning: number;
};

/** A numeric setting from the environment: the fallback when unset, a clear error when not a number ≥ min. */
export function envNumber(env: Record<string, string | undefined>, name: string, fallback: number, min: number): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const v = Number(raw);
  if (!Number.isFinite(v) || v < min) throw new Error(`${name} must be a number of at least ${min} (got "${raw}")`);
  return v;
}

/**
 * Settings from the environment, with production defaults. A run may take minutes: the job's
 * expiry (half an hour) is only the last resort — a lost worker is noticed by its missing
 * heartbeat within stallSeconds (see stall.ts).
 */
export function queueSettings(env: Record<string, string | undefined> = process.env): QueueSettings {
  return {
    expireInSeconds: envNumber(env, 'KEELSON_RUN_EXPIRE_SECONDS', 30 * 60, 1),
    retryLimit: envNumber(env, 'KEELSON_RUN_RETRY_LIMIT', 3, 0),
    retryDelaySeconds: envNumber(env, 'KEELSON_RUN_RETRY_DELAY_SECONDS', 2, 0),
    maintenanceIntervalSeconds: envNumber(env, 'KEELSON_QUEUE_MAINTENANCE_SECONDS', 30, 1),
    pollingIntervalSeconds: envNumber(env, 'KEELSON_QUEUE_POLL_SECONDS', 1, 0.5),
    heartbeatSeconds: envNumber(env, 'KEELSON_RUN_HEARTBEAT_SECONDS', 5, 0.2),
    stallSeconds: envNumber(env, 'KEELSON_RUN_STALL_SECONDS', 20, 1),
    schemeMaxWaiting: envNumber(env, 'KEELSON_SCHEME_MAX_RUNS', 6, 1),
    schemeMaxRunning: envNumber(env, 'KEELSON_SCHEME_MAX_RUNNING', 1, 1),
  };
}

/** pg-boss speaks to PostgreSQL through this executor, so it shares Keelson's pool. */
export function poolExecutor(pool: Pool): PgBoss.Db {
  return { executeSql: async (text, values) => ({ rows: (await pool.query(text, values)).rows }) };
}

/**
 * Runs pg-boss's parameterised statements inside a Drizzle transaction, so that queueing a
 * run commits or rolls back with the run row and its audit event. `$n` placeholders become
 * bound parameters (a placeholder used twice is bound twice, which is equivalent).
 */
export function transactionExecutor(tx: DbOrTx): PgBoss.Db {
  return {
    executeSql: async (text, values) => {
      const parts = text.split(/\$(\d+)/);
      const chunks = parts.map((part, i) => (i % 2 === 0 ? sql.raw(part) : sql.param(values[Number(part) - 1])));
      const res = await tx.execute(sql.join(chunks, sql.raw('')));
      return { rows: res.rows as unknown[] as Record<string, unknown>[] };
    },
  };
}

export function createBoss(pool: Pool, role: 'producer' | 'worker', settings = queueSettings()): PgBoss {
  const boss = new PgBoss({
    db: poolExecutor(pool),
    schema: BOSS_SCHEMA,
    // Producers only insert jobs; workers also expire lost jobs and archive old ones.
    supervise: role === 'worker',
    schedule: false,
    migrate: true,
    maintenanceIntervalSeconds: settings.maintenanceIntervalSeconds,
  });
  // Errors while the database is away are reported here, and the queue carries on polling.
  boss.on('error', (err) => log.warn({ err: { message: err.message, code: (err as { code?: string }).code } }, `queue (${role}) error`));
  return boss;
}

/** Creates a queue if missing and keeps its retry and expiry settings current. */
export async function ensureQueue(boss: PgBoss, options: PgBoss.Queue): Promise<void> {
  if (await boss.getQueue(options.name)) await boss.updateQueue(options.name, options);
  else {
    try {
      await boss.createQueue(options.name, options);
    } catch (e) {
      // Another process created it at the same moment.
      if (!(await boss.getQueue(options.name))) throw e;
    }
  }
}

/** The projection queue, with the settings from the environment. */
export function ensureRunQueue(boss: PgBoss, settings = queueSettings()): Promise<void> {
  return ensureQueue(boss, {
    name: RUN_QUEUE,
    policy: 'standard',
    retryLimit: settings.retryLimit,
    retryDelay: settings.retryDelaySeconds,
    retryBackoff: false,
    expireInSeconds: settings.expireInSeconds,
  });
}

const producers = new WeakMap<Pool, Promise<PgBoss>>();

/** One started producer per pool (created on first use: the app needs no start-up step). */
export function producerFor(pool: Pool): Promise<PgBoss> {
  let p = producers.get(pool);
  if (!p) {
    p = (async () => {
      const boss = createBoss(pool, 'producer');
      await boss.start();
      await ensureRunQueue(boss);
      return boss;
    })();
    p.catch(() => producers.delete(pool));
    producers.set(pool, p);
  }
  return p;
}

export type RunJob = { runId: string };

/**
 * Queues a run inside the caller's transaction. The job id is the run id, so a run is queued
 * at most once. Fair between schemes: a run's priority is minus the number of runs its scheme
 * already has waiting or running, so one scheme's fifth run queues behind another scheme's
 * first. A scheme with schemeMaxWaiting runs in flight is refused (429) until one finishes.
 */
export async function enqueueRun(pool: Pool, tx: DbOrTx, runId: string): Promise<void> {
  const boss = await producerFor(pool);
  const settings = queueSettings();
  // One request per scheme at a time past this point, so two cannot both take the last place.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext('keelson-runs:' || scheme_id::text)) from projection_runs where id = ${runId}`);
  const res = await tx.execute(sql`
    select r.scheme_id,
           (select count(*)::int from projection_runs o
             where o.scheme_id = r.scheme_id and o.id <> r.id and o.status in ('queued', 'running')) as in_flight
    from projection_runs r where r.id = ${runId}`);
  const row = res.rows[0] as { scheme_id: string; in_flight: number } | undefined;
  const inFlight = Number(row?.in_flight ?? 0);
  if (inFlight >= settings.schemeMaxWaiting) {
    throw new HttpError(429, `This scheme already has ${inFlight} projection runs waiting or running. Wait for one to finish, then start this one.`, undefined, 'too_many_runs');
  }
  await boss.send(RUN_QUEUE, { runId } satisfies RunJob, {
    id: runId,
    priority: -inFlight,
    retryLimit: settings.retryLimit,
    retryDelay: settings.retryDelaySeconds,
    expireInSeconds: settings.expireInSeconds,
    db: transactionExecutor(tx),
  });
}
