import { inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { auditEvents, users } from '../../db/schema';
import { describeEvent, type ActivityWords } from './activityText';

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
