import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { Pool } from 'pg';
import * as schema from './schema';

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle or the database itself: services accept either. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

export const DEFAULT_DATABASE_URL = 'postgres://keelson@127.0.0.1:54329/keelson';

export function databaseUrl(): string {
  return process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
}

/** Called with the error when an idle pooled connection breaks (the database stopped or restarted). */
export type PoolErrorListener = (err: Error) => void;

/**
 * A pool and its Drizzle handle. The pool answers `error` events (an idle connection lost
 * because PostgreSQL stopped or terminated it): without a listener Node would end the
 * process. The broken connection is dropped and the next query opens a new one, so the
 * process rides out a database restart. Connecting gives up after 5 s rather than hanging.
 */
export function createDb(url: string = databaseUrl(), max = 10, onError?: PoolErrorListener): { db: Db; pool: Pool } {
  const pool = new Pool({ connectionString: url, max, connectionTimeoutMillis: 5_000, idleTimeoutMillis: 30_000 });
  pool.on('error', (err) => (onError ? onError(err) : undefined));
  const db = drizzle(pool, { schema });
  return { db, pool };
}

/**
 * Whether an error means the database could not be reached (refused, reset, shut down,
 * timed out, too many connections) rather than a fault in the query.
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e = err as { code?: unknown; message?: unknown; cause?: unknown } | undefined, depth = 0; e && depth < 4; e = e.cause as typeof e, depth++) {
    const code = typeof e.code === 'string' ? e.code : '';
    if (['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EHOSTUNREACH', 'EAI_AGAIN'].includes(code)) return true;
    // 08xxx connection exceptions, 57P01-03 shutdown / cannot connect now, 53300 too many connections.
    if (/^08/.test(code) || ['57P01', '57P02', '57P03', '53300'].includes(code)) return true;
    const msg = typeof e.message === 'string' ? e.message : '';
    if (/Connection terminated|connection timeout|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down)/i.test(msg)) return true;
  }
  return false;
}
