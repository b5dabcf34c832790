import { and, asc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { approvals, users } from '../../db/schema';
import { conflict, forbidden } from '../errors';
import type { ServiceContext } from './context';
import { settingsOf } from './governance';

/**
 * Four-eyes approval, shared by assumption sets and option versions: a trustee other than the
 * person who last edited the draft approves it; the scheme may require two such approvals;
 * every approval is kept with who and when; an edit withdraws the approvals a draft had.
 */
export type ApprovalTarget = {
  kind: 'assumption_set' | 'option_version';
  id: string;
  schemeId: string;
  /** How the object reads in messages: "assumption set v3", "Cautious glide v2". */
  label: string;
  lastEditorId: string | null;
};

export type Approval = { userId: string | null; name: string; at: Date };

const column = (kind: ApprovalTarget['kind']) => (kind === 'assumption_set' ? approvals.assumptionSetId : approvals.optionVersionId);

/** Every approval of the given objects, oldest first, by object id. */
export async function approvalsOf(db: DbOrTx, kind: ApprovalTarget['kind'], ids: string[]): Promise<Map<string, Approval[]>> {
  const out = new Map<string, Approval[]>(ids.map((id) => [id, []]));
  if (!ids.length) return out;
  const col = column(kind);
  const rows = await db
    .select({ target: col, userId: approvals.userId, name: approvals.approverName, at: approvals.at })
    .from(approvals)
    .where(inArray(col, ids))
    .orderBy(asc(approvals.at));
  for (const r of rows) out.get(r.target!)?.push({ userId: r.userId, name: r.name, at: r.at });
  return out;
}

async function actorName(db: DbOrTx, ctx: ServiceContext): Promise<string> {
  if (ctx.actor?.displayName) return ctx.actor.displayName;
  const [u] = await db.select({ name: users.displayName }).from(users).where(eq(users.id, ctx.actor!.id));
  return u?.name ?? ctx.actor!.email;
}

/**
 * Records the caller's approval of a draft the caller has locked. 403 when the caller last
 * edited it; 409 when they have approved it already. `complete` says whether the scheme's
 * required number of approvals is now reached (the caller then marks it approved).
 */
export async function recordApproval(tx: DbOrTx, ctx: ServiceContext, target: ApprovalTarget) {
  const actor = ctx.actor!;
  if (target.lastEditorId && target.lastEditorId === actor.id) {
    throw forbidden(`You made the last change to ${target.label}, so another trustee must approve it (four-eyes rule).`);
  }
  const existing = (await approvalsOf(tx, target.kind, [target.id])).get(target.id)!;
  if (existing.some((a) => a.userId === actor.id)) throw conflict(`You have already approved ${target.label}; it needs another trustee's approval.`);
  const { approvalsRequired } = await settingsOf(tx, target.schemeId);
  const name = await actorName(tx, ctx);
  const at = new Date();
  await tx.insert(approvals).values({
    schemeId: target.schemeId,
    assumptionSetId: target.kind === 'assumption_set' ? target.id : null,
    optionVersionId: target.kind === 'option_version' ? target.id : null,
    userId: actor.id,
    approverName: name,
    at,
  });
  const all = [...existing, { userId: actor.id, name, at }];
  return { complete: all.length >= approvalsRequired, count: all.length, required: approvalsRequired, at, approvals: all };
}

/** Withdraws every approval of a draft that has just been edited; returns how many there were. */
export async function withdrawApprovals(tx: DbOrTx, kind: ApprovalTarget['kind'], id: string): Promise<number> {
  const gone = await tx.delete(approvals).where(and(eq(column(kind), id))).returning({ id: approvals.id });
  return gone.length;
}
