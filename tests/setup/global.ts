import type { TestProject } from 'vitest/node';
import { runMigrations } from '../../db/migrate';
import { adminQuery, clusterUrl, withDatabase } from '../helpers/database';

/**
 * Prepares one migrated template database per test run; each test file then
 * copies it into a database of its own (tests/helpers/database.ts).
 */
export default async function setup(_project: TestProject) {
  const template = `keelson_tmpl_${process.pid}`;
  await adminQuery(`DROP DATABASE IF EXISTS "${template}" WITH (FORCE)`);
  await adminQuery(`CREATE DATABASE "${template}"`);
  await runMigrations(withDatabase(clusterUrl(), template));
  process.env.KEELSON_TEST_TEMPLATE = template;
  return async () => {
    await adminQuery(`DROP DATABASE IF EXISTS "${template}" WITH (FORCE)`);
  };
}
