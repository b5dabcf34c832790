import { and, count, desc, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { defaultOptions, funds, illustrativeMembers, projectionRuns, reports, schemeMembers } from '../../db/schema';
import { can, type Role } from '../../constants/permissions';
import { listSets } from './assumptions';
import { governanceSummary } from './governance';

/**
 * What a person opening the scheme needs first: where the assumptions stand,
 * what is defined, the latest projections and reports — each part only when
 * the role may read it.
 */
export async function schemeOverview(db: DbOrTx, scheme: { id: string; name: string; currency: string; role: Role }) {
  const n = async (table: typeof funds | typeof illustrativeMembers | typeof schemeMembers, where = eq(table.schemeId, scheme.id)) =>
    Number((await db.select({ n: count() }).from(table).where(where))[0].n);
  const counts = {
    funds: await n(funds),
    options: Number((await db.select({ n: count() }).from(defaultOptions).where(and(eq(defaultOptions.schemeId, scheme.id), eq(defaultOptions.archived, false))))[0].n),
    illustrativeMembers: can(scheme.role, 'members:read') ? await n(illustrativeMembers) : null,
    schemeMembers: can(scheme.role, 'members:read') ? await n(schemeMembers) : null,
  };
  let assumptions = null;
  if (can(scheme.role, 'assumptions:read')) {
    const sets = await listSets(db, scheme.id);
    const approved = sets.find((s) => s.status === 'approved') ?? null;
    assumptions = {
      latestApproved: approved && { id: approved.id, version: approved.version, setAt: approved.setAt, approvedBy: approved.approvedBy, approvedAt: approved.approvedAt },
      drafts: sets.filter((s) => s.status === 'draft').map((s) => ({ id: s.id, version: s.version, updatedAt: s.updatedAt, createdBy: s.createdBy })),
    };
  }
  const runs = can(scheme.role, 'runs:read')
    ? await db
        .select({
          id: projectionRuns.id,
          status: projectionRuns.status,
          progress: projectionRuns.progress,
          paths: projectionRuns.paths,
          assumptionsDraft: projectionRuns.assumptionsDraft,
          createdAt: projectionRuns.createdAt,
        })
        .from(projectionRuns)
        .where(eq(projectionRuns.schemeId, scheme.id))
        .orderBy(desc(projectionRuns.createdAt))
        .limit(5)
    : null;
  const latestReports = can(scheme.role, 'reports:read')
    ? await db
        .select({ id: reports.id, title: reports.title, draft: reports.draft, createdAt: reports.createdAt })
        .from(reports)
        .where(eq(reports.schemeId, scheme.id))
        .orderBy(desc(reports.createdAt))
        .limit(3)
    : null;
  return { scheme, counts, assumptions, runs, reports: latestReports, governance: await governanceSummary(db, scheme.id) };
}
