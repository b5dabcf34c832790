import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import { accessTokens, schemeRoles, schemes, users } from '../../db/schema';
import { ROLE_LABELS, type Role } from '../../constants/permissions';
import { linkSettings, LINK_PLACEHOLDER } from '../auth/links';
import { endSessions } from '../auth/sessions';
import type { AppContext } from '../context';
import { queueMail, sendMail } from '../email/outbox';
import { backgroundProducer } from '../jobs/background';
import { conflict, notFound } from '../errors';
import { audit } from './audit';
import { schemeOf, type ServiceContext } from './context';
import { emailKey, INVITATION_DAYS, issueLink, RESET_HOURS, revokeLinks } from './tokens';

/**
 * People and roles on one scheme, for its administrator. Invitation and reset links go only to
 * the person, by e-mail through the outbox; they are never handed back to the administrator.
 */

export async function listPeople(app: AppContext, sc: ServiceContext) {
  const schemeId = schemeOf(sc);
  const people = await app.db
    .select({ id: users.id, email: users.email, displayName: users.displayName, role: schemeRoles.role, since: schemeRoles.createdAt, active: sql<boolean>`${users.passwordHash} is not null` })
    .from(schemeRoles)
    .innerJoin(users, eq(users.id, schemeRoles.userId))
    .where(eq(schemeRoles.schemeId, schemeId))
    .orderBy(users.displayName);
  const pending = await app.db
    .select({ id: accessTokens.id, email: accessTokens.email, role: accessTokens.role, expiresAt: accessTokens.expiresAt, createdAt: accessTokens.createdAt })
    .from(accessTokens)
    .where(and(eq(accessTokens.schemeId, schemeId), eq(accessTokens.kind, 'invitation'), isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt), gt(accessTokens.expiresAt, new Date())))
    .orderBy(desc(accessTokens.createdAt));
  return { people, pending: pending.map((p) => ({ ...p, role: p.role as Role })) };
}

async function schemeName(app: AppContext, schemeId: string) {
  const [s] = await app.db.select({ name: schemes.name }).from(schemes).where(eq(schemes.id, schemeId));
  return s?.name ?? 'a scheme';
}

/** The invitation mail: the same words whether or not the address has an account, so the outbox tells nobody which. */
function invitationText(schemeName: string, role: Role, inviter: string) {
  return [
    `${inviter} invites you to ${schemeName} on Keelson, as ${ROLE_LABELS[role].toLowerCase()}.`,
    '',
    `Open this link within ${INVITATION_DAYS} days to accept:`,
    LINK_PLACEHOLDER,
    '',
    'If you already use Keelson with this address, sign in there with your own password and accept. Otherwise you will choose a password for a new account.',
  ].join('\n');
}

/**
 * Invites an address to the scheme with a role: one live invitation per address (a second is
 * refused: re-send or cancel the first). Row, audit event and mail in one transaction.
 */
export async function invite(app: AppContext, sc: ServiceContext, body: { email: string; role: Role }) {
  const schemeId = schemeOf(sc);
  const email = emailKey(body.email);
  const already = await app.db
    .select({ id: users.id })
    .from(users)
    .innerJoin(schemeRoles, and(eq(schemeRoles.userId, users.id), eq(schemeRoles.schemeId, schemeId)))
    .where(sql`lower(${users.email}) = ${email}`);
  if (already.length) throw conflict('That person already has a role on this scheme; change their role instead.');
  const [pending] = await app.db
    .select({ id: accessTokens.id })
    .from(accessTokens)
    .where(and(eq(accessTokens.schemeId, schemeId), eq(accessTokens.email, email), eq(accessTokens.kind, 'invitation'), isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt), gt(accessTokens.expiresAt, new Date())));
  if (pending) throw conflict('That address already has an invitation waiting. Send it again or cancel it from the list below.');
  return sendInvitation(app, sc, email, body.role, 'invitation.created');
}

async function sendInvitation(app: AppContext, sc: ServiceContext, email: string, role: Role, action: string) {
  const schemeId = schemeOf(sc);
  const links = linkSettings(app.config);
  const name = await schemeName(app, schemeId);
  await backgroundProducer(app.pool);
  return app.db.transaction(async (tx) => {
    const t = await issueLink(tx, links, { kind: 'invitation', email, schemeId, role, createdBy: sc.actor?.id ?? null });
    await audit(tx, sc, { action, entity: 'invitation', entityId: t.id, after: { email, role } });
    await queueMail(app.pool, tx, sc, {
      to: email,
      schemeId,
      kind: 'invitation',
      linkTokenId: t.id,
      subject: `You are invited to ${name} on Keelson`,
      text: invitationText(name, role, sc.actor?.displayName ?? sc.actor?.email ?? 'The scheme administrator'),
    });
    return { id: t.id, email, role, expiresAt: t.expiresAt, emailedTo: email };
  });
}

async function pendingInvitation(app: AppContext, sc: ServiceContext, invitationId: string) {
  const [t] = await app.db
    .select()
    .from(accessTokens)
    .where(and(eq(accessTokens.id, invitationId), eq(accessTokens.schemeId, schemeOf(sc)), eq(accessTokens.kind, 'invitation'), isNull(accessTokens.usedAt), isNull(accessTokens.revokedAt)));
  if (!t) throw notFound('No such invitation waiting on this scheme.');
  return t;
}

/** Sends a waiting (or expired) invitation again with a new link; the old link stops working. */
export async function resendInvitation(app: AppContext, sc: ServiceContext, invitationId: string) {
  const t = await pendingInvitation(app, sc, invitationId);
  return sendInvitation(app, sc, t.email, t.role as Role, 'invitation.resent');
}

/** Withdraws a waiting invitation: its link stops working. */
export async function cancelInvitation(app: AppContext, sc: ServiceContext, invitationId: string) {
  const t = await pendingInvitation(app, sc, invitationId);
  await app.db.transaction(async (tx) => {
    await revokeLinks(tx, 'invitation', t.email, t.schemeId);
    await audit(tx, sc, { action: 'invitation.cancelled', entity: 'invitation', entityId: t.id, before: { email: t.email, role: t.role } });
  });
  return { ok: true as const };
}

export async function changeRole(app: AppContext, sc: ServiceContext, userId: string, role: Role) {
  const schemeId = schemeOf(sc);
  if (userId === sc.actor?.id) throw conflict('You cannot change your own role; ask another administrator.');
  return app.db.transaction(async (tx) => {
    const [before] = await tx.select().from(schemeRoles).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, schemeId)));
    if (!before) throw notFound('No such person on this scheme.');
    await tx.update(schemeRoles).set({ role }).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, schemeId)));
    await audit(tx, sc, { action: 'role.changed', entity: 'user', entityId: userId, before: { role: before.role }, after: { role } });
    return { userId, role };
  });
}

export async function removePerson(app: AppContext, sc: ServiceContext, userId: string) {
  const schemeId = schemeOf(sc);
  if (userId === sc.actor?.id) throw conflict('You cannot remove yourself; ask another administrator.');
  await app.db.transaction(async (tx) => {
    const [before] = await tx.delete(schemeRoles).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, schemeId))).returning();
    if (!before) throw notFound('No such person on this scheme.');
    await audit(tx, sc, { action: 'role.removed', entity: 'user', entityId: userId, before: { role: before.role } });
  });
  return { ok: true as const };
}

/**
 * An administrator's password reset for someone on the scheme: the link goes to that person
 * (never to the administrator), the mail tells them who asked, and their sessions end at once.
 */
export async function issueReset(app: AppContext, sc: ServiceContext, userId: string) {
  const schemeId = schemeOf(sc);
  const [u] = await app.db
    .select({ id: users.id, email: users.email, displayName: users.displayName })
    .from(users)
    .innerJoin(schemeRoles, and(eq(schemeRoles.userId, users.id), eq(schemeRoles.schemeId, schemeId)))
    .where(eq(users.id, userId));
  if (!u) throw notFound('No such person on this scheme.');
  const links = linkSettings(app.config);
  const name = await schemeName(app, schemeId);
  const out = await app.db.transaction(async (tx) => {
    const t = await issueLink(tx, links, { kind: 'password_reset', email: u.email, createdBy: sc.actor?.id ?? null });
    const ended = await endSessions(tx, u.id);
    await audit(tx, sc, { action: 'password-reset.issued', entity: 'user', entityId: u.id, after: { sessionsEnded: ended } });
    return { t, ended };
  });
  await sendMail(app, sc, {
    to: u.email,
    kind: 'password-reset',
    linkTokenId: out.t.id,
    subject: 'Your Keelson administrator sent you a password reset',
    text: [
      `Hello ${u.displayName},`,
      '',
      `${sc.actor?.displayName ?? 'Your scheme administrator'}, administrator of ${name}, asked Keelson to send you a password-reset link. Every Keelson session of yours has been signed out.`,
      `Use this link within ${RESET_HOURS} hours to set a new password (it works once):`,
      LINK_PLACEHOLDER,
      '',
      'If you did not expect this, tell your scheme administrator.',
    ].join('\n'),
  });
  return { emailedTo: u.email, expiresAt: out.t.expiresAt, sessionsEnded: out.ended };
}
