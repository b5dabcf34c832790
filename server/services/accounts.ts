import { and, eq, gt, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { accessTokens, schemeRoles, schemes, signInThrottles, users } from '../../db/schema';
import { hashPassword, verifyPassword } from '../auth/password';
import { checkPassword } from '../auth/passwordPolicy';
import { linkSettings, LINK_PLACEHOLDER } from '../auth/links';
import { endSessions } from '../auth/sessions';
import type { AppContext } from '../context';
import { sendMail } from '../email/outbox';
import { HttpError } from '../errors';
import { log } from '../log';
import { audit } from './audit';
import type { ServiceContext } from './context';
import { addressKey, rememberAddress } from './signIn';
import { consumeLink, emailKey, findLiveLink, issueLink, linkExpired, RESET_HOURS } from './tokens';

export { emailKey } from './tokens';

/** Least time between two reset mails to one person. */
export const RESET_RESEND_SECONDS = 60;

/**
 * Account operations: who is signed in, password changes, resets, one-use links. Every
 * function takes the app's database and configuration and a plain ServiceContext (who acts,
 * from where), never an Express request.
 */

export async function schemesOf(db: DbOrTx, userId: string) {
  return db
    .select({ id: schemes.id, name: schemes.name, currency: schemes.currency, role: schemeRoles.role })
    .from(schemeRoles)
    .innerJoin(schemes, eq(schemes.id, schemeRoles.schemeId))
    .where(eq(schemeRoles.userId, userId))
    .orderBy(schemes.name);
}

export async function getUser(db: DbOrTx, id: string) {
  const [u] = await db.select({ id: users.id, email: users.email, displayName: users.displayName }).from(users).where(eq(users.id, id));
  return u ?? null;
}

export async function userByEmail(db: DbOrTx, email: string) {
  const [u] = await db.select().from(users).where(sql`lower(${users.email}) = ${emailKey(email)}`);
  return u ?? null;
}

/** The signed-in person and the schemes they have a role on. */
export async function me(db: DbOrTx, userId: string) {
  return { user: await getUser(db, userId), schemes: await schemesOf(db, userId) };
}

/**
 * Changes the actor's password after checking the current one. Every other session of theirs
 * ends (ASVS 3.3.3); the one in use (`keepSid`) stays. The person is told by e-mail.
 */
export async function changePassword(app: AppContext, sc: ServiceContext, body: { currentPassword: string; newPassword: string }, keepSid: string) {
  const actor = sc.actor!;
  const u = await userByEmail(app.db, actor.email);
  if (!u?.passwordHash || u.id !== actor.id || !(await verifyPassword(body.currentPassword, u.passwordHash))) {
    throw new HttpError(400, 'The current password is not right.', [{ path: 'currentPassword', message: 'is not right' }], 'invalid_input');
  }
  checkPassword(body.newPassword, u.email, 'newPassword');
  const passwordHash = await hashPassword(body.newPassword);
  const ended = await app.db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, u.id));
    const n = await endSessions(tx, u.id, keepSid);
    await audit(tx, sc, { action: 'password.changed', entity: 'user', entityId: u.id, after: { otherSessionsEnded: n } });
    return n;
  });
  await sendMail(app, sc, {
    to: u.email,
    kind: 'password-changed',
    subject: 'Your Keelson password was changed',
    text: `Hello ${u.displayName},\n\nThe password of your Keelson account was changed just now, and every other session of yours was signed out.\nIf you did not do this, reset your password at once and tell your scheme administrator.`,
  });
  return { ok: true as const, otherSessionsEnded: ended };
}

/**
 * A password-reset request for an address. Called after the answer has gone out (see the
 * route), so known and unknown addresses look the same from outside. For a known address it
 * issues a link (withdrawing any earlier one) and e-mails it; otherwise it does nothing.
 */
export async function requestPasswordReset(app: AppContext, sc: ServiceContext, email: string): Promise<boolean> {
  const u = await userByEmail(app.db, email);
  if (!u) return false;
  // One reset mail per person per RESET_RESEND_SECONDS, however many addresses ask: no mail-bombing.
  const [recent] = await app.db
    .select({ id: accessTokens.id })
    .from(accessTokens)
    .where(and(eq(accessTokens.kind, 'password_reset'), eq(accessTokens.email, emailKey(u.email)), gt(accessTokens.createdAt, sql`now() - make_interval(secs => ${RESET_RESEND_SECONDS})`)));
  if (recent) return false;
  const links = linkSettings(app.config);
  const t = await app.db.transaction(async (tx) => {
    const row = await issueLink(tx, links, { kind: 'password_reset', email: u.email });
    await audit(tx, sc, { action: 'password-reset.requested', userId: u.id, actorEmail: u.email, entity: 'user', entityId: u.id });
    return row;
  });
  await sendMail(app, sc, {
    to: u.email,
    kind: 'password-reset',
    linkTokenId: t.id,
    subject: 'Reset your Keelson password',
    text: `Hello ${u.displayName},\n\nUse this link within ${RESET_HOURS} hours to set a new password (it works once; any earlier reset link no longer works):\n${LINK_PLACEHOLDER}\n\nIf you did not ask for this, ignore this message: your password stays as it is.`,
  });
  return true;
}

/** Runs `work` after the caller has answered; failures are logged, never thrown. */
export function afterAnswer(work: () => Promise<unknown>): void {
  setImmediate(() => {
    work().catch((err) => log.error({ err }, 'deferred account work failed'));
  });
}

/** What a link is for, for the screen that opens it. Says nothing about whether the address has an account. */
export async function linkInfo(db: Db, token: string) {
  const row = await findLiveLink(db, token);
  if (!row) throw linkExpired();
  return { kind: row.t.kind, email: row.t.email, schemeName: row.schemeName, role: row.t.role, expiresAt: row.t.expiresAt };
}

/**
 * Uses a password-reset link, or an invitation link for a new account, signed out.
 * - Reset: sets the password, ends every session of the person, withdraws their other links.
 * - Invitation: creates the account with this password and grants the role. An invitation to
 *   an address that already has an account never sets a password here: the person signs in with
 *   their own password and accepts it (acceptInvitation).
 */
export async function redeemLink(app: AppContext, sc: ServiceContext, token: string, body: { password: string; displayName?: string }) {
  const found = await findLiveLink(app.db, token);
  if (!found || found.t.kind === 'sign_in_confirmation') throw linkExpired();
  checkPassword(body.password, found.t.email, 'password');
  const passwordHash = await hashPassword(body.password);
  return app.db.transaction(async (tx) => {
    const t = await consumeLink(tx, token, ['invitation', 'password_reset']);
    const existing = await userByEmail(tx, t.email);
    let user: { id: string; email: string; displayName: string };
    if (t.kind === 'invitation') {
      if (existing) {
        throw new HttpError(409, 'This address already has a Keelson account. Sign in with your own password, then accept the invitation.', undefined, 'account_exists');
      }
      [user] = await tx.insert(users).values({ email: t.email, displayName: body.displayName?.trim() || t.email, passwordHash }).returning();
      if (t.schemeId && t.role) await tx.insert(schemeRoles).values({ userId: user.id, schemeId: t.schemeId, role: t.role }).onConflictDoNothing();
    } else {
      if (!existing) throw linkExpired();
      [user] = await tx.update(users).set({ passwordHash }).where(eq(users.id, existing.id)).returning();
      await endSessions(tx, user.id);
    }
    await tx.delete(signInThrottles).where(eq(signInThrottles.key, `account:${t.email}`));
    await audit(tx, sc, {
      action: t.kind === 'invitation' ? 'invitation.accepted' : 'password.reset',
      schemeId: t.schemeId,
      entity: 'user',
      entityId: user.id,
      userId: user.id,
      actorEmail: user.email,
      after: t.kind === 'invitation' ? { role: t.role, newAccount: true } : { sessionsEnded: true },
    });
    return { ok: true as const, kind: t.kind, email: user.email };
  });
}

/** Accepts an invitation as the signed-in person it was sent to: adds the role, sets nothing else. */
export async function acceptInvitation(app: AppContext, sc: ServiceContext, token: string) {
  const actor = sc.actor!;
  return app.db.transaction(async (tx) => {
    const found = await findLiveLink(tx, token);
    if (!found || found.t.kind !== 'invitation') throw linkExpired();
    if (found.t.email !== emailKey(actor.email)) {
      throw new HttpError(403, `This invitation was sent to ${found.t.email}; you are signed in as ${actor.email}. Sign out and sign in as ${found.t.email} to accept it.`, undefined, 'wrong_account');
    }
    const t = await consumeLink(tx, token, ['invitation']);
    await tx
      .insert(schemeRoles)
      .values({ userId: actor.id, schemeId: t.schemeId!, role: t.role! })
      .onConflictDoUpdate({ target: [schemeRoles.userId, schemeRoles.schemeId], set: { role: t.role! } });
    await audit(tx, sc, { action: 'invitation.accepted', schemeId: t.schemeId, entity: 'user', entityId: actor.id, after: { role: t.role, newAccount: false } });
    return { ok: true as const, schemeId: t.schemeId!, role: t.role! };
  });
}

/**
 * Uses an e-mailed sign-in confirmation: returns the person to sign in, and remembers the
 * address it is opened from as theirs.
 */
export async function confirmSignIn(app: AppContext, sc: ServiceContext, token: string) {
  return app.db.transaction(async (tx) => {
    const t = await consumeLink(tx, token, ['sign_in_confirmation']);
    const u = await userByEmail(tx, t.email);
    if (!u?.passwordHash) throw linkExpired();
    await tx.delete(signInThrottles).where(eq(signInThrottles.key, `account:${t.email}`));
    await audit(tx, sc, { action: 'sign-in.confirmed', userId: u.id, actorEmail: u.email, entity: 'user', entityId: u.id, after: { address: addressKey(sc.ip) } });
    await rememberAddress(tx as unknown as Db, u.id, addressKey(sc.ip));
    return { id: u.id, email: u.email, displayName: u.displayName };
  });
}
