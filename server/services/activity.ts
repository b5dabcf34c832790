import { and, desc, eq, inArray, isNull, lt, or, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { auditEvents, users } from '../../db/schema';
import type { AppContext } from '../context';
import { describeEvent, type ActivityWords } from './activityText';
import { schemeOf, type ServiceContext } from './context';

type AuditRow = typeof auditEvents.$inferSelect;

/**
 * Audit rows as the activity screen reads them: who (by display name), what in words, when,
 * and a link — beside the recorded values, which the API keeps for auditors and exports.
 */
export async function describeActivity(db: DbOrTx, rows: AuditRow[]): Promise<(AuditRow & ActivityWords)[]> {
  const ids = [...new Set(rows.map((r) => r.userId).filter((x): x is string => !!x))];
  const names = new Map(ids.length ? (await db.select({ id: users.id, name: users.displayName }).from(users).where(inArray(users.id, ids))).map((u) => [u.id, u.name]) : []);
  return rows.map((r) => ({
    ...r,
    ...describeEvent({ action: r.action, entity: r.entity, entityId: r.entityId, before: r.before, after: r.after, actorName: r.userId ? (names.get(r.userId) ?? null) : null, actorEmail: r.actorEmail }),
  }));
}

/** The scheme's audit trail, newest first: its own events plus sign-ins (which belong to no scheme) of the people on it. */
export async function activity(app: AppContext, sc: ServiceContext, q: { limit: number; before?: number }) {
  const schemeId = schemeOf(sc);
  const rows = await app.db
    .select()
    .from(auditEvents)
    .where(
      and(
        or(
          eq(auditEvents.schemeId, schemeId),
          and(
            isNull(auditEvents.schemeId),
            sql`lower(${auditEvents.actorEmail}) in (select lower(u.email) from users u join scheme_roles sr on sr.user_id = u.id where sr.scheme_id = ${schemeId})`,
          ),
        ),
        q.before ? lt(auditEvents.id, q.before) : undefined,
      ),
    )
    .orderBy(desc(auditEvents.id))
    .limit(q.limit);
  return { events: await describeActivity(app.db, rows), next: rows.length === q.limit ? rows[rows.length - 1].id : null };
}
