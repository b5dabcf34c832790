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

export function createDb(url: string = databaseUrl(), max = 10): { db: Db; pool: Pool } {
  const pool = new Pool({ connectionString: url, max });
  const db = drizzle(pool, { schema });
  return { db, pool };
}
