import { Router, type Request } from 'express';
import { contextOf } from '../services/context';
import { rateLimit } from 'express-rate-limit';
import { sql, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { HttpError } from '../errors';
import { users } from '../../db/schema';
import { SESSION_COOKIE } from '../auth/session';
import { hashPassword, verifyPassword } from '../auth/password';
import { audit } from '../services/audit';
import { SIGN_IN_FAILED, createToken, emailKey, findLiveToken, redeemToken, schemesOf, getUser } from '../services/accounts';
import type { Authenticator } from 'passport';

export const PasswordSchema = z.string().min(10, 'must be at least 10 characters').max(200, 'must be at most 200 characters');
const SignInBody = z.object({ email: z.string().trim().min(1, 'is required').max(254, 'is too long'), password: z.string().min(1, 'is required').max(1024, 'is too long') });
const ChangePasswordBody = z.object({ currentPassword: z.string().min(1, 'is required').max(1024), newPassword: PasswordSchema });
const RedeemBody = z.object({ password: PasswordSchema, displayName: z.string().trim().min(1).max(120).optional() });
const ForgotBody = z.object({ email: z.string().trim().email('is not an e-mail address').max(254) });

export function linkUrl(ctx: AppContext, req: Request, token: string): string {
  const base = ctx.config.PUBLIC_URL ?? `${req.protocol}://${req.get('host')}`;
  return `${base.replace(/\/$/, '')}/link?token=${encodeURIComponent(token)}`;
}

async function meOf(ctx: AppContext, userId: string) {
  const user = await getUser(ctx.db, userId);
  return { user, schemes: await schemesOf(ctx.db, userId) };
}

export function authRouter(ctx: AppContext): Router {
  const r = Router();
  const M = '/auth';
  const signInLimiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: ctx.config.SIGN_IN_RATE_LIMIT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => res.status(429).json({ error: 'rate_limited', message: 'Too many sign-in attempts from here. Wait a few minutes and try again.' }),
  });

  defineRoute(r, M, { method: 'post', path: '/sign-in', access: 'public' }, signInLimiter, async (req, res, next) => {
    const body = SignInBody.parse(req.body);
    const pp = req.app.locals.passport as Authenticator;
    pp.authenticate('local', (err: unknown, user: Express.User | false) => {
      if (err) return next(err);
      if (!user) {
        audit(ctx.db, contextOf(req), { action: 'sign-in.failed', userId: null, actorEmail: emailKey(body.email) })
          .then(() => res.status(401).json({ error: 'sign_in_failed', message: SIGN_IN_FAILED }))
          .catch(next);
        return;
      }
      // A fresh session id at sign-in (no fixation).
      req.session.regenerate((e1) => {
        if (e1) return next(e1);
        req.login(user, (e2) => {
          if (e2) return next(e2);
          audit(ctx.db, contextOf(req), { action: 'sign-in', userId: user.id, actorEmail: user.email })
            .then(() => meOf(ctx, user.id))
            .then((me) => res.json(me))
            .catch(next);
        });
      });
    })(req, res, next);
  });

  defineRoute(r, M, { method: 'post', path: '/sign-out', access: 'signed-in' }, async (req, res, next) => {
    await audit(ctx.db, contextOf(req), { action: 'sign-out' });
    req.logout((e) => {
      if (e) return next(e);
      req.session.destroy((e2) => {
        if (e2) return next(e2);
        res.clearCookie(SESSION_COOKIE);
        res.json({ ok: true });
      });
    });
  });

  defineRoute(r, M, { method: 'get', path: '/me', access: 'signed-in' }, async (req, res) => {
    res.json(await meOf(ctx, req.user!.id));
  });

  defineRoute(r, M, { method: 'post', path: '/password', access: 'signed-in' }, async (req, res) => {
    const body = ChangePasswordBody.parse(req.body);
    const [u] = await ctx.db.select().from(users).where(eq(users.id, req.user!.id));
    if (!u?.passwordHash || !(await verifyPassword(body.currentPassword, u.passwordHash))) {
      throw new HttpError(400, 'The current password is not right.', [{ path: 'currentPassword', message: 'is not right' }], 'invalid_input');
    }
    const passwordHash = await hashPassword(body.newPassword);
    await ctx.db.transaction(async (tx) => {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, u.id));
      await audit(tx, contextOf(req), { action: 'password.changed', entity: 'user', entityId: u.id });
    });
    res.json({ ok: true });
  });

  defineRoute(r, M, { method: 'post', path: '/forgot-password', access: 'public' }, async (req, res) => {
    const body = ForgotBody.parse(req.body);
    const [u] = await ctx.db.select().from(users).where(sql`lower(${users.email}) = ${emailKey(body.email)}`);
    if (u) {
      const { token } = await createToken(ctx.db, { kind: 'password_reset', email: u.email });
      await audit(ctx.db, contextOf(req), { action: 'password-reset.requested', userId: u.id, actorEmail: u.email });
      const send = req.app.locals.sendMail as ((m: { to: string; subject: string; text: string }) => Promise<void>) | undefined;
      const link = linkUrl(ctx, req, token);
      if (send) await send({ to: u.email, subject: 'Reset your Keelson password', text: `Use this link within 2 hours to set a new password:\n${link}` });
      else if (ctx.config.NODE_ENV === 'development') console.log(`keelson: password reset link for ${u.email}: ${link}`);
    }
    // Same answer whether or not the address exists.
    res.json({ ok: true, message: 'If that address has an account, a reset link is on its way. Your scheme administrator can also issue one.' });
  });

  defineRoute(r, M, { method: 'get', path: '/links/:token', access: 'public' }, async (req, res) => {
    const row = await findLiveToken(ctx.db, String(req.params.token));
    if (!row) throw new HttpError(410, 'This link has expired or has already been used. Ask for a new one.', undefined, 'link_expired');
    const existing = await ctx.db.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = ${row.t.email}`);
    res.json({ kind: row.t.kind, email: row.t.email, schemeName: row.schemeName, role: row.t.role, newAccount: existing.length === 0, expiresAt: row.t.expiresAt });
  });

  defineRoute(r, M, { method: 'post', path: '/links/:token', access: 'public' }, async (req, res) => {
    const body = RedeemBody.parse(req.body);
    const out = await redeemToken(ctx.db, String(req.params.token), body.password, body.displayName, async (tx, user, t) => {
      await audit(tx, contextOf(req), {
        action: t.kind === 'invitation' ? 'invitation.accepted' : 'password.reset',
        schemeId: t.schemeId,
        entity: 'user',
        entityId: user.id,
        userId: user.id,
        actorEmail: user.email,
        after: t.kind === 'invitation' ? { role: t.role } : undefined,
      });
    });
    res.json({ ok: true, kind: out.kind, email: out.user.email });
  });

  return r;
}
