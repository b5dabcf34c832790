import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { accessTokens, schemeRoles, schemes, signInFailures, users } from '../../db/schema';
import type { Role } from '../../constants/permissions';
import { dummyPasswordHash, hashPassword, verifyPassword } from '../auth/password';
import { HttpError } from '../errors';

/** After this many failures in a row an address is locked for LOCK_MINUTES. */
export const MAX_FAILURES = 5;
export const LOCK_MINUTES = 15;
export const INVITATION_DAYS = 7;
export const RESET_HOURS = 2;

/** The one answer for any failed sign-in: unknown address, wrong password or locked alike. */
export const SIGN_IN_FAILED = 'That e-mail address and password do not match an account, or the account is temporarily locked after repeated failures. Try again later or reset your password.';

export const emailKey = (email: string) => email.trim().toLowerCase();
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export type SignInResult = { ok: true; user: { id: string; email: string; displayName: string } } | { ok: false };

/**
 * Checks a password. An unknown address still costs one scrypt verification
 * (against a dummy hash) and counts towards a lock-out, so neither the answer
 * nor its timing tells whether the address exists.
 */
export async function checkSignIn(db: Db, email: string, password: string): Promise<SignInResult> {
  const key = emailKey(email);
  const [lock] = await db.select().from(signInFailures).where(eq(signInFailures.emailKey, key));
  const locked = !!lock?.lockedUntil && lock.lockedUntil > new Date();
  const [user] = await db.select().from(users).where(sql`lower(${users.email}) = ${key}`);
  const ok = await verifyPassword(password, user?.passwordHash ?? (await dummyPasswordHash()));
  if (ok && user?.passwordHash && !locked) {
    await db.delete(signInFailures).where(eq(signInFailures.emailKey, key));
    return { ok: true, user: { id: user.id, email: user.email, displayName: user.displayName } };
  }
  if (!locked) {
    await db
      .insert(signInFailures)
      .values({ emailKey: key, failures: 1 })
      .onConflictDoUpdate({
        target: signInFailures.emailKey,
        set: {
          // A lock that has run out starts the count again.
          failures: sql`case when ${signInFailures.lockedUntil} is not null then 1 else ${signInFailures.failures} + 1 end`,
          lastFailureAt: sql`now()`,
          lockedUntil: sql`case when ${signInFailures.lockedUntil} is null and ${signInFailures.failures} + 1 >= ${MAX_FAILURES} then now() + make_interval(mins => ${LOCK_MINUTES}) else null end`,
        },
      });
  }
  return { ok: false };
}

export async function schemesOf(db: Db, userId: string) {
  return db
    .select({ id: schemes.id, name: schemes.name, currency: schemes.currency, role: schemeRoles.role })
    .from(schemeRoles)
    .innerJoin(schemes, eq(schemes.id, schemeRoles.schemeId))
    .where(eq(schemeRoles.userId, userId))
    .orderBy(schemes.name);
}

export async function getUser(db: Db, id: string) {
  const [u] = await db.select({ id: users.id, email: users.email, displayName: users.displayName }).from(users).where(eq(users.id, id));
  return u ?? null;
}

/** Creates a single-use link token; only its SHA-256 is stored. */
export async function createToken(
  db: Db,
  t: { kind: 'invitation' | 'password_reset'; email: string; schemeId?: string; role?: Role; createdBy?: string },
): Promise<{ token: string; expiresAt: Date }> {
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + (t.kind === 'invitation' ? INVITATION_DAYS * 86_400_000 : RESET_HOURS * 3_600_000));
  await db.insert(accessTokens).values({ kind: t.kind, tokenHash: hashToken(token), email: emailKey(t.email), schemeId: t.schemeId, role: t.role, createdBy: t.createdBy, expiresAt });
  return { token, expiresAt };
}

export async function findLiveToken(db: Db, token: string) {
  const [row] = await db
    .select({ t: accessTokens, schemeName: schemes.name })
    .from(accessTokens)
    .leftJoin(schemes, eq(schemes.id, accessTokens.schemeId))
    .where(and(eq(accessTokens.tokenHash, hashToken(token)), isNull(accessTokens.usedAt), gt(accessTokens.expiresAt, new Date())));
  return row ?? null;
}

/**
 * Uses a link: sets the password (creating the user for an invitation) and,
 * for an invitation, grants the role. One transaction; the token is consumed
 * by a conditional update so a second use finds nothing.
 */
export async function redeemToken(
  db: Db,
  token: string,
  password: string,
  displayName: string | undefined,
  afterWrite: (tx: DbOrTx, user: { id: string; email: string }, t: typeof accessTokens.$inferSelect) => Promise<void>,
) {
  const passwordHash = await hashPassword(password);
  return db.transaction(async (tx) => {
    const [t] = await tx
      .update(accessTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(accessTokens.tokenHash, hashToken(token)), isNull(accessTokens.usedAt), gt(accessTokens.expiresAt, new Date())))
      .returning();
    if (!t) throw new HttpError(410, 'This link has expired or has already been used. Ask for a new one.', undefined, 'link_expired');
    let [user] = await tx.select().from(users).where(sql`lower(${users.email}) = ${t.email}`);
    if (!user) {
      if (t.kind !== 'invitation') throw new HttpError(410, 'This link is no longer valid.', undefined, 'link_expired');
      [user] = await tx.insert(users).values({ email: t.email, displayName: displayName?.trim() || t.email, passwordHash }).returning();
    } else {
      [user] = await tx.update(users).set({ passwordHash, ...(displayName?.trim() ? { displayName: displayName.trim() } : {}) }).where(eq(users.id, user.id)).returning();
    }
    if (t.kind === 'invitation' && t.schemeId && t.role) {
      await tx
        .insert(schemeRoles)
        .values({ userId: user.id, schemeId: t.schemeId, role: t.role })
        .onConflictDoUpdate({ target: [schemeRoles.userId, schemeRoles.schemeId], set: { role: t.role } });
    }
    await tx.delete(signInFailures).where(eq(signInFailures.emailKey, t.email));
    await afterWrite(tx, user, t);
    return { user: { id: user.id, email: user.email, displayName: user.displayName }, kind: t.kind };
  });
}
