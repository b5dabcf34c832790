import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createDb } from '../../db/client';
import { MIGRATIONS_FOLDER, runMigrations } from '../../db/migrate';
import { hashPassword } from '../../server/auth/password';
import { storeVariant, type StoredResult } from '../../server/jobs/result';
import { startRunWorker, type RunWorker } from '../../server/jobs';
import { ENGINE_VERSION, runScenario, type ScenarioInput } from '../../simulation';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { adminQuery, clusterUrl, withDatabase } from '../helpers/database';
import { waitForRun } from './reports-helpers';

process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';

/**
 * A database as it stood before options were versioned (migrations up to 0001), with an option
 * edited in place and a finished run of it, then migrated to today's schema: the run still
 * opens, runs again with identical results, and the option reads as its approved version 1.
 */
const BEFORE_VERSIONING = '0001_reports_mail_statements';

let s: TestServer;
let worker: RunWorker;
const ids = { scheme: '', option: '', run: '', set: '', member: '', fundA: '', fundB: '' };

async function migrateUpTo(url: string, lastTag: string) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'keelson-migrations-'));
  fs.cpSync(MIGRATIONS_FOLDER, dir, { recursive: true });
  const journalPath = path.join(dir, 'meta', '_journal.json');
  const journal = JSON.parse(fs.readFileSync(journalPath, 'utf8')) as { entries: { idx: number; tag: string }[] };
  const upTo = journal.entries.findIndex((e) => e.tag === lastTag);
  expect(upTo, `migration ${lastTag} exists`).toBeGreaterThanOrEqual(0);
  journal.entries = journal.entries.slice(0, upTo + 1);
  fs.writeFileSync(journalPath, JSON.stringify(journal));
  const { db, pool } = createDb(url, 1);
  try {
    await migrate(db, { migrationsFolder: dir });
  } finally {
    await pool.end();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

beforeAll(async () => {
  const name = `keelson_t_${randomBytes(6).toString('hex')}`;
  await adminQuery(`CREATE DATABASE "${name}"`);
  const url = withDatabase(clusterUrl(), name);
  await migrateUpTo(url, BEFORE_VERSIONING);

  // Rows written by the earlier schema, in its own columns.
  const { pool } = createDb(url, 1);
  try {
    const one = async (text: string, values: unknown[] = []) => (await pool.query(text, values)).rows[0] as Record<string, string>;
    ids.scheme = (await one(`insert into schemes (name) values ('Oldfield Staff Plan') returning id`)).id;
    const user = (await one(`insert into users (email, display_name, password_hash) values ('old.trustee@oldfield.example', 'Perrin Ashdown', $1) returning id`, [await hashPassword('an-old-password-2025')])).id;
    await pool.query(`insert into scheme_roles (user_id, scheme_id, role) values ($1, $2, 'trustee')`, [user, ids.scheme]);
    ids.fundA = (await one(`insert into funds (scheme_id, name) values ($1, 'Oldfield Equity') returning id`, [ids.scheme])).id;
    ids.fundB = (await one(`insert into funds (scheme_id, name) values ($1, 'Oldfield Gilts') returning id`, [ids.scheme])).id;
    ids.set = (
      await one(
        `insert into assumption_sets (scheme_id, version, status, set_at, inflation, salary_growth, annuity_real_rate, annuity_years, fund_order, correlations, created_by, approved_by, approved_at)
         values ($1, 1, 'approved', '2025-12-31', 0.025, 0.03, 0.01, 25, $2, '[[1,0.2],[0.2,1]]', $3, $3, '2026-01-05') returning id`,
        [ids.scheme, JSON.stringify([ids.fundA, ids.fundB]), user],
      )
    ).id;
    await pool.query(`insert into fund_assumptions values ($1, $2, 0.065, 0.15, 0.002), ($1, $3, 0.035, 0.07, 0.001)`, [ids.set, ids.fundA, ids.fundB]);
    const glide = [{ yearsToRetirement: 10, weights: { [ids.fundA]: 1 } }, { yearsToRetirement: 0, weights: { [ids.fundA]: 0.3, [ids.fundB]: 0.7 } }];
    ids.option = (await one(`insert into default_options (scheme_id, name, description, glide_path) values ($1, 'Oldfield lifecycle', 'Made before versions', $2) returning id`, [ids.scheme, JSON.stringify(glide)])).id;
    ids.member = (await one(`insert into illustrative_members (scheme_id, label, age, retirement_age, salary, contribution_rate, pot) values ($1, 'Saver', 52, 65, 38000, 0.1, 60000) returning id`, [ids.scheme])).id;

    const scenario: ScenarioInput = {
      version: 1,
      seed: 2025,
      paths: 300,
      antithetic: false,
      inflation: 0.025,
      funds: [
        { id: ids.fundA, name: 'Oldfield Equity', expectedReturn: 0.065, volatility: 0.15, annualCharge: 0.002 },
        { id: ids.fundB, name: 'Oldfield Gilts', expectedReturn: 0.035, volatility: 0.07, annualCharge: 0.001 },
      ],
      correlations: [
        [1, 0.2],
        [0.2, 1],
      ],
      options: [{ id: ids.option, name: 'Oldfield lifecycle', glidePath: glide }],
      members: [{ id: ids.member, age: 52, retirementAge: 65, salary: 38000, salaryGrowth: 0.03, contributionRate: 0.1, pot: 60000 }],
      riskAversion: 2,
      targetReplacementRatio: 0.5,
      annuity: { realRate: 0.01, years: 25 },
    };
    // The snapshot as runs stored it then: options without versions.
    const input = {
      assumptionSet: { id: ids.set, version: 1, status: 'approved', setAt: '2025-12-31', approvedAt: '2026-01-05T00:00:00.000Z' },
      funds: [
        { id: ids.fundA, name: 'Oldfield Equity' },
        { id: ids.fundB, name: 'Oldfield Gilts' },
      ],
      options: [{ id: ids.option, name: 'Oldfield lifecycle', description: 'Made before versions' }],
      members: [{ id: ids.member, label: 'Saver', age: 52, retirementAge: 65, salary: 38000, pot: 60000, contributionRate: 0.1 }],
      scenario,
      stress: null,
    };
    const { variant, sampleKind } = storeVariant(runScenario(scenario));
    const result: StoredResult = { kind: 'keelson-run-result', engineVersion: ENGINE_VERSION, sample: { kind: sampleKind, size: variant.samples[0].realPots.length }, base: variant, stressed: null };
    ids.run = (
      await one(
        `insert into projection_runs (scheme_id, status, progress, assumption_set_id, assumptions_draft, seed, paths, risk_aversion, input, result, engine_version, requested_by, finished_at)
         values ($1, 'done', 1, $2, false, 2025, 300, 2, $3, $4, $5, $6, now()) returning id`,
        [ids.scheme, ids.set, JSON.stringify(input), JSON.stringify(result), ENGINE_VERSION, user],
      )
    ).id;
    // The option was edited in place after the run (as options were then): the run's snapshot keeps what it ran.
    await pool.query(`update default_options set description = 'Edited after the run', glide_path = $2 where id = $1`, [ids.option, JSON.stringify([{ yearsToRetirement: 0, weights: { [ids.fundB]: 1 } }])]);
  } finally {
    await pool.end();
  }

  await runMigrations(url);
  s = await startTestServer({ seed: false, database: { url, drop: () => adminQuery(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`) } });
  worker = await startRunWorker({ databaseUrl: url, threads: 1, log: () => {} });
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await s?.close();
});

describe('runs made before options were versioned', () => {
  it('turns each existing option into its approved version 1, as it stood at migration', async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('old.trustee@oldfield.example', 'an-old-password-2025');
    const o = await c.get(`/schemes/${ids.scheme}/options/${ids.option}`);
    expect(o.status).toBe(200);
    expect(o.body.versions).toEqual([expect.objectContaining({ version: 1, status: 'approved', name: 'Oldfield lifecycle' })]);
    expect(o.body.description).toBe('Edited after the run');
    const set = await c.get(`/schemes/${ids.scheme}/assumption-sets/${ids.set}`);
    expect(set.body.approvals).toEqual([expect.objectContaining({ name: 'Perrin Ashdown' })]);
  });

  it('still opens, with its options as they ran, and reproduces exactly when run again', { timeout: 90_000 }, async () => {
    const c = new Client(s.baseUrl);
    await c.signIn('old.trustee@oldfield.example', 'an-old-password-2025');
    const run = await c.get(`/schemes/${ids.scheme}/runs/${ids.run}`);
    expect(run.status).toBe(200);
    expect(run.body.options).toEqual([{ id: ids.option, name: 'Oldfield lifecycle', versionId: null, version: null, status: null }]);
    expect(run.body.baselineOptionId).toBeNull();
    expect(run.body.result.base.result.results).toHaveLength(1);
    expect(run.body.input.scenario.options[0].glidePath[1].weights[ids.fundB]).toBe(0.7);

    const again = await c.post(`/schemes/${ids.scheme}/runs/${ids.run}/rerun`);
    expect(again.status, JSON.stringify(again.body)).toBe(201);
    const done = await waitForRun(c, ids.scheme, again.body.id);
    expect(done.status).toBe('done');
    expect(done.result.reproduction).toMatchObject({ matches: true });
    expect(done.result.base.result.results[0].atRetirement).toEqual(run.body.result.base.result.results[0].atRetirement);
  });
});
