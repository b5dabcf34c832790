import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';

/**
 * Ends a person's sessions — all of them, or all but `exceptSid` (the one in use, after a
 * password change). Sessions are rows of the session table keyed by passport's user id.
 */
export async function endSessions(db: DbOrTx, userId: string, exceptSid?: string): Promise<number> {
  const res = await db.execute(
    sql`delete from session where sess->'passport'->>'user' = ${userId} ${exceptSid ? sql`and sid <> ${exceptSid}` : sql``}`,
  );
  return res.rowCount ?? 0;
}
