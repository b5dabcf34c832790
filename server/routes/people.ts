import { Router } from 'express';
import { contextOf } from '../services/context';
import { and, desc, eq, gt, isNull, lt, or, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { conflict, notFound } from '../errors';
import { accessTokens, auditEvents, schemeRoles, users } from '../../db/schema';
import { ROLES } from '../../constants/permissions';
import { audit } from '../services/audit';
import { createToken, emailKey } from '../services/accounts';
import { schemeOverview } from '../services/overview';
import { describeActivity } from '../services/activity';
import { linkUrl } from './auth';

const InviteBody = z.object({ email: z.string().trim().email('is not an e-mail address').max(254, 'is too long'), role: z.enum(ROLES) });
const RoleBody = z.object({ role: z.enum(ROLES) });
const Uuid = z.string().uuid('is not a valid id');
const ActivityQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50), before: z.coerce.number().int().positive().optional() });

export function peopleRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '', access: 'scheme:read' }, async (req, res) => {
    res.json(req.scheme);
  });

  defineRoute(r, M, { method: 'get', path: '/overview', access: 'scheme:read' }, async (req, res) => {
    res.json(await schemeOverview(ctx.db, req.scheme!));
  });

  defineRoute(r, M, { method: 'get', path: '/people', access: 'people:manage' }, async (req, res) => {
    const people = await ctx.db
      .select({ id: users.id, email: users.email, displayName: users.displayName, role: schemeRoles.role, since: schemeRoles.createdAt, active: sql<boolean>`${users.passwordHash} is not null` })
      .from(schemeRoles)
      .innerJoin(users, eq(users.id, schemeRoles.userId))
      .where(eq(schemeRoles.schemeId, req.scheme!.id))
      .orderBy(users.displayName);
    const pending = await ctx.db
      .select({ id: accessTokens.id, email: accessTokens.email, role: accessTokens.role, expiresAt: accessTokens.expiresAt, createdAt: accessTokens.createdAt })
      .from(accessTokens)
      .where(and(eq(accessTokens.schemeId, req.scheme!.id), eq(accessTokens.kind, 'invitation'), isNull(accessTokens.usedAt), gt(accessTokens.expiresAt, new Date())))
      .orderBy(desc(accessTokens.createdAt));
    res.json({ people, pending });
  });

  defineRoute(
    r,
    M,
    { method: 'post', path: '/invitations', access: 'people:manage' },
    async (req, res) => {
      const body = InviteBody.parse(req.body);
      const schemeId = req.scheme!.id;
      const already = await ctx.db
        .select({ id: users.id })
        .from(users)
        .innerJoin(schemeRoles, and(eq(schemeRoles.userId, users.id), eq(schemeRoles.schemeId, schemeId)))
        .where(sql`lower(${users.email}) = ${emailKey(body.email)}`);
      if (already.length) throw conflict('That person already has a role on this scheme; change their role instead.');
      const { token, expiresAt } = await ctx.db.transaction(async (tx) => {
        const t = await createToken(tx as never, { kind: 'invitation', email: body.email, schemeId, role: body.role, createdBy: req.user!.id });
        await audit(tx, contextOf(req), { action: 'invitation.created', entity: 'invitation', entityId: emailKey(body.email), after: { email: emailKey(body.email), role: body.role } });
        return t;
      });
      const link = linkUrl(ctx, req, token);
      const send = req.app.locals.sendMail as ((m: { to: string; subject: string; text: string }) => Promise<void>) | undefined;
      if (send) await send({ to: body.email, subject: `You are invited to ${req.scheme!.name} on Keelson`, text: `Accept within 7 days and set your password:\n${link}` });
      // Until e-mail delivery lands, the administrator passes the link on.
      res.status(201).json({ email: emailKey(body.email), role: body.role, link, expiresAt });
    },
  );

  defineRoute(
    r,
    M,
    { method: 'patch', path: '/people/:userId', access: 'people:manage' },
    async (req, res) => {
      const userId = Uuid.parse(req.params.userId);
      const body = RoleBody.parse(req.body);
      if (userId === req.user!.id) throw conflict('You cannot change your own role; ask another administrator.');
      const out = await ctx.db.transaction(async (tx) => {
        const [before] = await tx.select().from(schemeRoles).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, req.scheme!.id)));
        if (!before) throw notFound('No such person on this scheme.');
        await tx.update(schemeRoles).set({ role: body.role }).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, req.scheme!.id)));
        await audit(tx, contextOf(req), { action: 'role.changed', entity: 'user', entityId: userId, before: { role: before.role }, after: { role: body.role } });
        return { userId, role: body.role };
      });
      res.json(out);
    },
  );

  defineRoute(
    r,
    M,
    { method: 'delete', path: '/people/:userId', access: 'people:manage' },
    async (req, res) => {
      const userId = Uuid.parse(req.params.userId);
      if (userId === req.user!.id) throw conflict('You cannot remove yourself; ask another administrator.');
      await ctx.db.transaction(async (tx) => {
        const [before] = await tx.delete(schemeRoles).where(and(eq(schemeRoles.userId, userId), eq(schemeRoles.schemeId, req.scheme!.id))).returning();
        if (!before) throw notFound('No such person on this scheme.');
        await audit(tx, contextOf(req), { action: 'role.removed', entity: 'user', entityId: userId, before: { role: before.role } });
      });
      res.json({ ok: true });
    },
  );

  defineRoute(
    r,
    M,
    { method: 'post', path: '/people/:userId/reset-link', access: 'people:manage' },
    async (req, res) => {
      const userId = Uuid.parse(req.params.userId);
      const [u] = await ctx.db
        .select({ id: users.id, email: users.email })
        .from(users)
        .innerJoin(schemeRoles, and(eq(schemeRoles.userId, users.id), eq(schemeRoles.schemeId, req.scheme!.id)))
        .where(eq(users.id, userId));
      if (!u) throw notFound('No such person on this scheme.');
      const { token, expiresAt } = await createToken(ctx.db, { kind: 'password_reset', email: u.email, createdBy: req.user!.id });
      await audit(ctx.db, contextOf(req), { action: 'password-reset.issued', entity: 'user', entityId: u.id });
      res.status(201).json({ link: linkUrl(ctx, req, token), expiresAt });
    },
  );

  defineRoute(r, M, { method: 'get', path: '/activity', access: 'audit:read' }, async (req, res) => {
    const q = ActivityQuery.parse(req.query);
    const rows = await ctx.db
      .select()
      .from(auditEvents)
      // This scheme's events, plus sign-ins (which belong to no scheme) of the people on it.
      .where(
        and(
          or(
            eq(auditEvents.schemeId, req.scheme!.id),
            and(
              isNull(auditEvents.schemeId),
              sql`lower(${auditEvents.actorEmail}) in (select lower(u.email) from users u join scheme_roles sr on sr.user_id = u.id where sr.scheme_id = ${req.scheme!.id})`,
            ),
          ),
          q.before ? lt(auditEvents.id, q.before) : undefined,
        ),
      )
      .orderBy(desc(auditEvents.id))
      .limit(q.limit);
    res.json({ events: await describeActivity(ctx.db, rows), next: rows.length === q.limit ? rows[rows.length - 1].id : null });
  });

  return r;
}
