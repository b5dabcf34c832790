import { randomUUID } from 'node:crypto';
import { and, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { accessTokens, schemes } from '../../db/schema';
import type { Role } from '../../constants/permissions';
import { hashToken, tokenFor, type LinkSettings } from '../auth/links';
import { HttpError } from '../errors';

export const INVITATION_DAYS = 7;
export const RESET_HOURS = 2;
export const CONFIRMATION_MINUTES = 30;

export type TokenKind = (typeof accessTokens.$inferSelect)['kind'];
export type TokenRow = typeof accessTokens.$inferSelect;

export const emailKey = (email: string) => email.trim().toLowerCase();

const LIFETIME_MS: Record<TokenKind, number> = {
  invitation: INVITATION_DAYS * 86_400_000,
  password_reset: RESET_HOURS * 3_600_000,
  sign_in_confirmation: CONFIRMATION_MINUTES * 60_000,
};

export const linkExpired = () => new HttpError(410, 'This link has expired, was replaced by a newer one, or has already been used. Ask for a new one.', undefined, 'link_expired');

/** Live: not used, not withdrawn, not expired. */
const live = () => and(isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt), gt(accessTokens.expiresAt, sql`now()`));

/** Withdraws the live links of this kind for this person (and, for invitations, this scheme). */
export async function revokeLinks(tx: DbOrTx, kind: TokenKind, email: string, schemeId?: string | null, except?: string) {
  return tx
    .update(accessTokens)
    .set({ revokedAt: new Date() })
    .where(
      and(
        eq(accessTokens.kind, kind),
        eq(accessTokens.email, emailKey(email)),
        isNull(accessTokens.usedAt),
        isNull(accessTokens.revokedAt),
        kind === 'invitation' && schemeId ? eq(accessTokens.schemeId, schemeId) : undefined,
        except ? ne(accessTokens.id, except) : undefined,
      ),
    )
    .returning({ id: accessTokens.id });
}

/**
 * Issues a one-use link and returns its row (never the token: only the mail job computes it).
 * Any earlier link of the same kind for the same person (and scheme) is withdrawn, so at most
 * one is live — the database's partial unique indexes hold that too.
 */
export async function issueLink(
  tx: DbOrTx,
  links: LinkSettings,
  t: { kind: TokenKind; email: string; schemeId?: string | null; role?: Role | null; createdBy?: string | null },
): Promise<TokenRow> {
  // One issuer per person and kind at a time, so the withdrawal below sees the other's link.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`keelson-link:${t.kind}:${emailKey(t.email)}:${t.schemeId ?? ''}`}))`);
  await revokeLinks(tx, t.kind, t.email, t.schemeId);
  const id = randomUUID();
  const [row] = await tx
    .insert(accessTokens)
    .values({
      id,
      kind: t.kind,
      tokenHash: hashToken(tokenFor(links, id)),
      email: emailKey(t.email),
      schemeId: t.schemeId ?? null,
      role: t.role ?? null,
      createdBy: t.createdBy ?? null,
      expiresAt: new Date(Date.now() + LIFETIME_MS[t.kind]),
    })
    .returning();
  return row;
}

/** A live link by its token, with the scheme's name for invitations; null when not live. */
export async function findLiveLink(db: DbOrTx, token: string) {
  const [row] = await db
    .select({ t: accessTokens, schemeName: schemes.name })
    .from(accessTokens)
    .leftJoin(schemes, eq(schemes.id, accessTokens.schemeId))
    .where(and(eq(accessTokens.tokenHash, hashToken(token)), live()));
  return row ?? null;
}

/**
 * Uses a link inside the caller's transaction: a conditional update, so a second use (or a
 * concurrent one) finds nothing and gets 410. Using a personal link withdraws the person's
 * other links of that kind.
 */
export async function consumeLink(tx: DbOrTx, token: string, kinds: TokenKind[]): Promise<TokenRow> {
  const [t] = await tx
    .update(accessTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(accessTokens.tokenHash, hashToken(token)), live()))
    .returning();
  if (!t || !kinds.includes(t.kind)) throw linkExpired();
  if (t.kind !== 'invitation') await revokeLinks(tx, t.kind, t.email, null, t.id);
  return t;
}
