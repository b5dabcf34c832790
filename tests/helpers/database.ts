import { randomBytes } from 'node:crypto';
import { Client } from 'pg';
import { DEFAULT_DATABASE_URL } from '../../db/client';

/** The cluster tests use: DATABASE_URL, or the private cluster scripts/db.sh starts. */
export function clusterUrl(): string {
  return process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;
}

export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

export async function adminQuery(sql: string): Promise<void> {
  const c = new Client({ connectionString: withDatabase(clusterUrl(), 'postgres') });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

/**
 * A fresh database for one test file, copied from the migrated template that
 * the global setup prepared: test files never see each other's rows.
 */
export async function createTestDatabase(): Promise<{ url: string; drop: () => Promise<void> }> {
  const template = process.env.KEELSON_TEST_TEMPLATE;
  if (!template) throw new Error('KEELSON_TEST_TEMPLATE is not set: run tests through vitest (global setup)');
  const name = `keelson_t_${randomBytes(6).toString('hex')}`;
  // CREATE DATABASE … TEMPLATE fails if another session is copying the same template at that instant; retry briefly.
  for (let attempt = 0; ; attempt++) {
    try {
      await adminQuery(`CREATE DATABASE "${name}" TEMPLATE "${template}"`);
      break;
    } catch (e) {
      if (attempt >= 20 || !/being accessed by other users/.test(String(e))) throw e;
      await new Promise((r) => setTimeout(r, 100 + Math.random() * 200));
    }
  }
  return {
    url: withDatabase(clusterUrl(), name),
    drop: () => adminQuery(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`),
  };
}
