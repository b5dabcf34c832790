import type PgBoss from 'pg-boss';
import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { log } from '../log';
import { markFailed } from './handler';
import { BOSS_SCHEMA, RUN_QUEUE } from './queue';

/**
 * Runs whose worker was lost (killed, machine gone): "running" with a heartbeat older than
 * `stallSeconds`. Their job is failed in the queue at once — pg-boss then offers it again
 * after the retry delay, or, when the attempts are used up, the run is marked failed — rather
 * than waiting for the job's half-hour expiry. Returns the run ids it handled.
 */
export async function recoverStalledRuns(db: Db, boss: PgBoss, stallSeconds: number): Promise<string[]> {
  const stalled = await db.execute(sql`
    select r.id, r.scheme_id from projection_runs r
    join ${sql.identifier(BOSS_SCHEMA)}.job j on j.name = ${RUN_QUEUE} and j.id = r.id and j.state = 'active'
    where r.status = 'running' and (r.heartbeat_at is null or r.heartbeat_at < now() - make_interval(secs => ${stallSeconds}))`);
  const handled: string[] = [];
  for (const row of stalled.rows as { id: string; scheme_id: string }[]) {
    await boss.fail(RUN_QUEUE, row.id, { message: `worker lost: no heartbeat for ${stallSeconds} s` });
    const [job] = (await db.execute(sql`select state from ${sql.identifier(BOSS_SCHEMA)}.job where name = ${RUN_QUEUE} and id = ${row.id}`)).rows as { state: string }[];
    if (job?.state === 'failed') {
      await markFailed(db, row.scheme_id, row.id, 'The worker running this projection was lost on every attempt.');
    } else {
      await db.execute(sql`update projection_runs set status = 'queued', progress = 0 where id = ${row.id} and status = 'running'`);
    }
    log.warn({ runId: row.id, schemeId: row.scheme_id, jobState: job?.state }, 'stalled run handed back to the queue');
    handled.push(row.id);
  }
  return handled;
}
