import { schemeOf, type ServiceContext } from './context';
import type { Pool } from 'pg';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { assumptionSets, projectionRuns, schemeMembers, schemes, statementExports } from '../../db/schema';
import type { ScenarioInput } from '../../simulation';
import { ComputePool, runScenarioThreaded } from '../compute/threads';
import { badRequest, conflict, HttpError, notFound } from '../errors';
import type { StoredResult } from '../jobs/result';
import type { ScenarioSnapshot } from './scenario';
import { audit } from './audit';
import { backgroundProducer, enqueue, EXPORT_QUEUE } from '../jobs/background';
import { STATEMENT_MAX_PATHS, STATEMENT_PERCENTILES, WHAT_IF, statementText, type StatementFigures } from '../../figures';
import { renderStatements, statementCsv } from '../reports/statementPdf';

type RunRow = typeof projectionRuns.$inferSelect;
type EngineMember = ScenarioInput['members'][number];

/** A finished run of this scheme, or 404 (another scheme's id) / 409 (not finished). */
export async function loadFinishedRun(db: Db, schemeId: string, runId: string): Promise<RunRow & { input: ScenarioSnapshot; result: StoredResult }> {
  const [run] = await db.select().from(projectionRuns).where(and(eq(projectionRuns.id, runId), eq(projectionRuns.schemeId, schemeId)));
  if (!run) throw notFound('No such run in this scheme.');
  if (run.status !== 'done' || !run.result) throw conflict('That run has not finished; statements and reports need a finished run.');
  if (run.result.kind !== 'keelson-run-result' || !run.result.base?.result?.results) throw conflict('That run has no stored result in a form Keelson can read.');
  return { ...run, result: run.result };
}

function optionOf(run: { input: ScenarioSnapshot }, optionId: string) {
  const o = run.input.options.find((x) => x.id === optionId);
  if (!o) throw badRequest('Some fields are not valid.', [{ path: 'optionId', message: 'is not an option of that run' }]);
  return o;
}

/** Finished runs a statement can come from, newest first, with their options and members. */
export async function statementSources(db: Db, schemeId: string) {
  const rows = await db
    .select({ id: projectionRuns.id, finishedAt: projectionRuns.finishedAt, input: projectionRuns.input, draft: projectionRuns.assumptionsDraft, paths: projectionRuns.paths })
    .from(projectionRuns)
    .where(and(eq(projectionRuns.schemeId, schemeId), eq(projectionRuns.status, 'done')))
    .orderBy(desc(projectionRuns.finishedAt))
    .limit(50);
  const [{ count }] = await db.select({ count: sql<number>`count(*)::int` }).from(schemeMembers).where(eq(schemeMembers.schemeId, schemeId));
  return {
    membershipCount: count,
    runs: rows.map((r) => {
      const s = r.input;
      return {
        id: r.id,
        finishedAt: r.finishedAt,
        draft: r.draft,
        paths: r.paths,
        assumptionSetVersion: s.assumptionSet.version,
        options: s.options.map((o) => ({ id: o.id, name: o.name })),
        members: s.members.map((m) => ({ id: m.id, label: m.label, age: m.age, retirementAge: m.retirementAge })),
      };
    }),
  };
}

const key = (p: number) => `p${p}`;

/**
 * Projects members with one option under the run's snapshot assumptions and seed. Each member
 * is run three times — as is, paying WHAT_IF.extraContribution more, and retiring
 * WHAT_IF.laterYears later — on the same market paths, so the differences show the change
 * alone. Returns per member: p10/p50/p90 real pots and incomes, and the two differences in the median.
 */
export async function projectMembers(snapshot: ScenarioSnapshot, optionId: string, members: EngineMember[], paths: number, pool?: ComputePool) {
  const sc = snapshot.scenario;
  const option = sc.options.find((o) => o.id === optionId)!;
  const P = STATEMENT_PERCENTILES;
  const engineMembers: EngineMember[] = members.flatMap((m) => [
    m,
    // Capped at the whole salary: a member already paying 99% can pay at most 100%.
    { ...m, id: `${m.id}~more`, contributionRate: Math.min(1, m.contributionRate + WHAT_IF.extraContribution) },
    { ...m, id: `${m.id}~later`, retirementAge: m.retirementAge + WHAT_IF.laterYears },
  ]);
  // On a worker thread, never on the calling event loop (a preview is asked for by a request).
  const result = await runScenarioThreaded({ ...sc, paths, options: [option], members: engineMembers, percentiles: [P.weak, P.typical, P.strong] }, pool ? { pool } : { threads: 1 });
  return members.map((m, i) => {
    const [base, more, later] = [result.results[3 * i], result.results[3 * i + 1], result.results[3 * i + 2]];
    const pr = base.atRetirement.percentiles.real;
    const inc = base.atRetirement.realIncome;
    return {
      memberId: m.id,
      pots: { weak: pr[key(P.weak)], typical: pr[key(P.typical)], strong: pr[key(P.strong)] },
      incomes: { weak: inc[key(P.weak)], typical: inc[key(P.typical)], strong: inc[key(P.strong)] },
      whatIf: {
        extraContribution: more.atRetirement.percentiles.real[key(P.typical)] - pr[key(P.typical)],
        laterRetirement: later.atRetirement.percentiles.real[key(P.typical)] - pr[key(P.typical)],
        paths,
      },
    };
  });
}

/**
 * The statement for an illustrative member of a finished run. Weak, typical and strong pots
 * and incomes are the run's own stored percentiles (so they match the run exactly, before
 * rounding); the what-if differences are projected again from the run's snapshot.
 */
export async function illustrativeStatement(db: Db, schemeId: string, q: { runId: string; optionId: string; memberId: string }) {
  const run = await loadFinishedRun(db, schemeId, q.runId);
  const [scheme] = await db.select({ currency: schemes.currency }).from(schemes).where(eq(schemes.id, schemeId));
  return await statementFromRun(run, scheme.currency, q.optionId, q.memberId);
}

export async function statementFromRun(run: { input: ScenarioSnapshot; result: StoredResult; assumptionsDraft: boolean; paths: number }, currency: string, optionId: string, memberId: string) {
  const option = optionOf(run, optionId);
  const member = run.input.members.find((m) => m.id === memberId);
  if (!member) throw badRequest('Some fields are not valid.', [{ path: 'memberId', message: 'is not an illustrative member of that run' }]);
  const pair = run.result.base.result.results.find((r) => r.optionId === optionId && r.memberId === memberId)!;
  const P = STATEMENT_PERCENTILES;
  const pr = pair.atRetirement.percentiles.real;
  const inc = pair.atRetirement.realIncome;
  for (const p of [P.weak, P.typical, P.strong]) {
    if (pr[key(p)] === undefined) throw conflict(`That run did not report the ${p}th percentile, which statements need.`);
  }
  const engineMember = run.input.scenario.members.find((m) => m.id === memberId)!;
  const paths = Math.min(run.paths, STATEMENT_MAX_PATHS);
  const [w] = await projectMembers(run.input, optionId, [engineMember], paths);
  const figures: StatementFigures = {
    memberLabel: member.label,
    age: member.age,
    retirementAge: member.retirementAge,
    currency,
    optionName: option.name,
    pots: { weak: pr[key(P.weak)], typical: pr[key(P.typical)], strong: pr[key(P.strong)] },
    incomes: { weak: inc[key(P.weak)], typical: inc[key(P.typical)], strong: inc[key(P.strong)] },
    annuityYears: run.input.scenario.annuity.years,
    paths: run.paths,
    whatIf: w.whatIf,
    draft: run.assumptionsDraft,
  };
  return { figures, text: statementText(figures) };
}

export async function statementFile(db: Db, schemeId: string, q: { runId: string; optionId: string; memberId: string; format: 'pdf' | 'csv' }) {
  const s = await illustrativeStatement(db, schemeId, q);
  const base = `statement-${slug(s.figures.memberLabel)}-${slug(s.figures.optionName)}`;
  if (q.format === 'csv') return { filename: `${base}.csv`, contentType: 'text/csv; charset=utf-8', body: Buffer.from(statementCsv([s.figures]), 'utf8') };
  return { filename: `${base}.pdf`, contentType: 'application/pdf', body: await renderStatements([s.figures]) };
}

export function slug(s: string): string {
  return s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'file';
}

// ---- Background exports -------------------------------------------------------------

export type ExportRequest = { runId: string; optionId: string; scope: 'illustrative' | 'membership'; format: 'pdf' | 'csv' };

/** Creates an export and queues its job: row, job and audit event in one transaction. */
export async function requestExport(db: Db, pool: Pool, ctx: ServiceContext, body: ExportRequest) {
  const schemeId = schemeOf(ctx);
  const run = await loadFinishedRun(db, schemeId, body.runId);
  optionOf(run, body.optionId);
  let memberCount = run.input.members.length;
  if (body.scope === 'membership') {
    const [{ count }] = await db.select({ count: sql<number>`count(*)::int` }).from(schemeMembers).where(eq(schemeMembers.schemeId, schemeId));
    if (!count) throw badRequest('Some fields are not valid.', [{ path: 'scope', message: 'this scheme has no uploaded membership' }]);
    memberCount = count;
  }
  await backgroundProducer(pool);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(statementExports).values({ schemeId, runId: run.id, optionId: body.optionId, scope: body.scope, format: body.format, memberCount, createdBy: ctx.actor?.id ?? null }).returning();
    await enqueue(pool, tx, EXPORT_QUEUE, { id: row.id });
    await audit(tx, ctx, { action: 'statements.export-requested', entity: 'statement_export', entityId: row.id, after: { runId: run.id, optionId: body.optionId, scope: body.scope, format: body.format, memberCount } });
    return exportSummary(row);
  });
}

type ExportRow = typeof statementExports.$inferSelect;
export function exportSummary(r: ExportRow) {
  return {
    id: r.id,
    runId: r.runId,
    optionId: r.optionId,
    scope: r.scope,
    format: r.format,
    status: r.status,
    progress: r.progress,
    memberCount: r.memberCount,
    error: r.error,
    filename: r.filename,
    createdAt: r.createdAt,
    finishedAt: r.finishedAt,
  };
}

export async function listExports(db: Db, schemeId: string) {
  const rows = await db
    .select({
      id: statementExports.id,
      runId: statementExports.runId,
      optionId: statementExports.optionId,
      scope: statementExports.scope,
      format: statementExports.format,
      status: statementExports.status,
      progress: statementExports.progress,
      memberCount: statementExports.memberCount,
      error: statementExports.error,
      filename: statementExports.filename,
      createdAt: statementExports.createdAt,
      finishedAt: statementExports.finishedAt,
    })
    .from(statementExports)
    .where(eq(statementExports.schemeId, schemeId))
    .orderBy(desc(statementExports.createdAt))
    .limit(50);
  return rows;
}

export async function getExport(db: Db, schemeId: string, id: string) {
  const [r] = await db.select().from(statementExports).where(and(eq(statementExports.id, id), eq(statementExports.schemeId, schemeId)));
  if (!r) throw notFound('No such statement export in this scheme.');
  return r;
}

/** Members projected per engine call, so progress moves and the event loop breathes. */
const CHUNK = 20;

/**
 * Runs one export: projects every member (illustrative members from the run's stored
 * percentiles; the uploaded membership by projecting each member under the run's snapshot),
 * writes the file and marks the export done. Idempotent: a finished export is skipped.
 */
export async function processStatementExport(db: Db, exportId: string, opts: { lastAttempt: boolean }): Promise<'done' | 'failed' | 'skipped'> {
  const [exp] = await db
    .update(statementExports)
    .set({ status: 'running', progress: 0, error: null })
    .where(and(eq(statementExports.id, exportId), inArray(statementExports.status, ['queued', 'running'])))
    .returning();
  if (!exp) return 'skipped';
  try {
    const run = await loadFinishedRun(db, exp.schemeId, exp.runId);
    const [scheme] = await db.select({ currency: schemes.currency }).from(schemes).where(eq(schemes.id, exp.schemeId));
    const option = optionOf(run, exp.optionId);
    const figures: StatementFigures[] = [];
    if (exp.scope === 'illustrative') {
      for (const m of run.input.members) figures.push((await statementFromRun(run, scheme.currency, exp.optionId, m.id)).figures);
    } else {
      const [set] = run.assumptionSetId ? await db.select({ salaryGrowth: assumptionSets.salaryGrowth }).from(assumptionSets).where(eq(assumptionSets.id, run.assumptionSetId)) : [];
      if (!set) throw new HttpError(409, 'The run’s assumption set no longer exists, so its salary growth is unknown.');
      const members = await db.select().from(schemeMembers).where(eq(schemeMembers.schemeId, exp.schemeId)).orderBy(asc(schemeMembers.reference));
      const paths = Math.min(run.paths, STATEMENT_MAX_PATHS);
      // One warm thread for the whole export rather than one started per chunk.
      const pool = new ComputePool(1);
      try {
        for (let i = 0; i < members.length; i += CHUNK) {
          const chunk = members.slice(i, i + CHUNK);
          const projected = await projectMembers(
            run.input,
            exp.optionId,
            chunk.map((m) => ({ id: `member-${m.id}`, age: m.age, retirementAge: m.retirementAge, salary: m.salary, salaryGrowth: set.salaryGrowth, contributionRate: m.contributionRate, pot: m.pot })),
            paths,
            pool,
          );
          projected.forEach((p, k) => {
            const m = chunk[k];
            figures.push({
              memberLabel: `Member ${m.reference}`,
              age: m.age,
              retirementAge: m.retirementAge,
              currency: scheme.currency,
              optionName: option.name,
              pots: p.pots,
              incomes: p.incomes,
              annuityYears: run.input.scenario.annuity.years,
              paths,
              whatIf: p.whatIf,
              draft: run.assumptionsDraft,
            });
          });
          await db.update(statementExports).set({ progress: Math.min(0.95, (i + chunk.length) / members.length) }).where(eq(statementExports.id, exportId));
          await new Promise((r) => setImmediate(r));
        }
      } finally {
        await pool.close();
      }
    }
    const body = exp.format === 'csv' ? Buffer.from(statementCsv(figures), 'utf8') : await renderStatements(figures);
    const filename = `statements-${exp.scope}-${slug(option.name)}-${exp.id.slice(0, 8)}.${exp.format}`;
    await db.transaction(async (tx) => {
      await tx.update(statementExports).set({ status: 'done', progress: 1, file: body, filename, memberCount: figures.length, finishedAt: new Date() }).where(eq(statementExports.id, exportId));
      await audit(tx, null, { action: 'statements.exported', schemeId: exp.schemeId, entity: 'statement_export', entityId: exportId, after: { members: figures.length, bytes: body.length }, userId: null, actorEmail: null });
    });
    return 'done';
  } catch (err) {
    const permanent = err instanceof HttpError || err instanceof RangeError || err instanceof TypeError;
    if (!permanent && !opts.lastAttempt) throw err;
    const reason = err instanceof Error ? err.message : String(err);
    await db.transaction(async (tx) => {
      await tx.update(statementExports).set({ status: 'failed', error: reason.slice(0, 2000), finishedAt: new Date() }).where(eq(statementExports.id, exportId));
      await audit(tx, null, { action: 'statements.export-failed', schemeId: exp.schemeId, entity: 'statement_export', entityId: exportId, after: { reason }, userId: null, actorEmail: null });
    });
    return 'failed';
  }
}
