import type { DbOrTx } from '../../db/client';
import { auditEvents } from '../../db/schema';
import type { ServiceContext } from './context';

export type AuditEntry = {
  action: string;
  schemeId?: string | null;
  entity?: string;
  entityId?: string;
  before?: unknown;
  after?: unknown;
  userId?: string | null;
  actorEmail?: string | null;
};

const SECRET_KEYS = /password|token|hash/i;

/** Drops secrets from before/after values: they are never written to the trail. */
function scrub(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(scrub);
  if (v && typeof v === 'object' && !(v instanceof Date)) {
    return Object.fromEntries(Object.entries(v).filter(([k]) => !SECRET_KEYS.test(k)).map(([k, x]) => [k, scrub(x)]));
  }
  return v;
}

/** Records one audit event. Pass the transaction of the write it describes, so both commit or neither. */
export async function audit(db: DbOrTx, ctx: ServiceContext | null, e: AuditEntry): Promise<void> {
  await db.insert(auditEvents).values({
    action: e.action,
    schemeId: e.schemeId ?? ctx?.schemeId ?? null,
    entity: e.entity,
    entityId: e.entityId,
    before: e.before === undefined ? null : scrub(e.before),
    after: e.after === undefined ? null : scrub(e.after),
    userId: e.userId !== undefined ? e.userId : (ctx?.actor?.id ?? null),
    actorEmail: e.actorEmail !== undefined ? e.actorEmail : (ctx?.actor?.email ?? null),
    ip: ctx?.ip ?? null,
  });
}
