import { and, desc, eq, isNull, lt, or, sql } from 'drizzle-orm';
import { auditEvents } from '../../db/schema';
import type { AppContext } from '../context';
import type { ServiceContext } from './context';

/** The scheme's audit trail, newest first: its own events plus sign-ins (which belong to no scheme) of the people on it. */
export async function activity(app: AppContext, sc: ServiceContext, q: { limit: number; before?: number }) {
  const schemeId = sc.schemeId!;
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
  return { events: rows, next: rows.length === q.limit ? rows[rows.length - 1].id : null };
}
