import { and, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { projectionRunPots } from '../../db/schema';
import { decodePots, type PotRow } from '../jobs/result';

/**
 * Every terminal real pot of a run, stored compressed per option × member and variant
 * (projection_run_pots; encoding in server/jobs/result.ts).
 */

/** Writes pot rows a few at a time (each can be a megabyte), inside the caller's transaction. */
export async function insertPots(db: DbOrTx, rows: PotRow[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 8) await db.insert(projectionRunPots).values(rows.slice(i, i + 8));
}

/** The decoded pots of one variant of a run, keyed `optionId|memberId`; empty when none were stored. */
export async function loadPots(db: DbOrTx, runId: string, variant: 'base' | 'stressed'): Promise<Map<string, Float64Array>> {
  const rows = await db
    .select()
    .from(projectionRunPots)
    .where(and(eq(projectionRunPots.runId, runId), eq(projectionRunPots.variant, variant)));
  return new Map(rows.map((r) => [potKey(r.optionId, r.memberId), decodePots(r.data, r.paths, r.encoding)]));
}

export const potKey = (optionId: string, memberId: string) => `${optionId}|${memberId}`;
