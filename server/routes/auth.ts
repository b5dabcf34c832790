import { Router, type Request } from 'express';
import { rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import type { Authenticator } from 'passport';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { SESSION_COOKIE } from '../auth/session';
import { MAX_PASSWORD_LENGTH } from '../../constants/passwords';
import { audit } from '../services/audit';
import { contextOf } from '../services/context';
import { acceptInvitation, afterAnswer, changePassword, confirmSignIn, emailKey, linkInfo, me, redeemLink, requestPasswordReset } from '../services/accounts';
import { CONFIRMATION_NEEDED, SIGN_IN_FAILED, type SignInResult } from '../services/signIn';
import { singleLine } from '../fields';

const SignInBody = z.object({ email: z.string().trim().min(1, 'is required').max(254, 'is too long'), password: z.string().min(1, 'is required').max(1024, 'is too long') });
const NewPassword = z.string('must be text').max(MAX_PASSWORD_LENGTH, `must be at most ${MAX_PASSWORD_LENGTH} characters`);
const ChangePasswordBody = z.object({ currentPassword: z.string().min(1, 'is required').max(1024), newPassword: NewPassword });
const RedeemBody = z.object({ password: NewPassword, displayName: singleLine(120).optional() });
const ForgotBody = z.object({ email: z.string().trim().email('is not an e-mail address').max(254) });
const Token = z.string().max(200, 'is not a link code');

const limiter = (limit: number, message: string) =>
  rateLimit({ windowMs: 15 * 60_000, limit, standardHeaders: 'draft-8', legacyHeaders: false, handler: (_req, res) => res.status(429).json({ error: 'rate_limited', message }) });

/** Signs the request's session in as `user`: a fresh session id (no fixation) stamped with the sign-in time. */
function startSession(req: Request, user: Express.User): Promise<void> {
  return new Promise((resolve, reject) =>
    req.session.regenerate((e1) => {
      if (e1) return reject(e1);
      req.login(user, (e2) => {
        if (e2) return reject(e2);
        req.session.signedInAt = Date.now();
        resolve();
      });
    }),
  );
}

export function authRouter(ctx: AppContext): Router {
  const r = Router();
  const M = '/auth';
  const signInLimiter = limiter(ctx.config.SIGN_IN_RATE_LIMIT, 'Too many sign-in attempts from here. Wait a few minutes and try again.');
  const forgotLimiter = limiter(ctx.config.FORGOT_PASSWORD_RATE_LIMIT, 'Too many reset requests from here. Wait a few minutes and try again.');

  defineRoute(r, M, { method: 'post', path: '/sign-in', access: 'public' }, signInLimiter, async (req, res, next) => {
    const body = SignInBody.parse(req.body);
    const pp = req.app.locals.passport as Authenticator;
    pp.authenticate('local', (err: unknown, user: Express.User | false, info?: SignInResult) => {
      if (err) return next(err);
      if (user) {
        startSession(req, user)
          .then(() => audit(ctx.db, contextOf(req), { action: 'sign-in', userId: user.id, actorEmail: user.email }))
          .then(() => me(ctx.db, user.id))
          .then((m) => res.json(m))
          .catch(next);
        return;
      }
      if (info?.kind === 'wait') {
        res.setHeader('Retry-After', String(info.retryAfterSeconds));
        res.status(429).json({ error: 'slow_down', message: `Too many failed sign-ins from your network. Wait ${info.retryAfterSeconds} s and try again.`, retryAfterSeconds: info.retryAfterSeconds });
        return;
      }
      const confirm = info?.kind === 'confirm';
      audit(ctx.db, contextOf(req), { action: confirm ? 'sign-in.needs-confirmation' : 'sign-in.failed', userId: null, actorEmail: emailKey(body.email) })
        .then(() =>
          confirm
            ? res.status(202).json({ error: 'confirmation_needed', message: CONFIRMATION_NEEDED })
            : res.status(401).json({ error: 'sign_in_failed', message: SIGN_IN_FAILED }),
        )
        .catch(next);
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
    res.json(await me(ctx.db, req.user!.id));
  });

  defineRoute(r, M, { method: 'post', path: '/password', access: 'signed-in' }, async (req, res) => {
    const body = ChangePasswordBody.parse(req.body);
    res.json(await changePassword(ctx, contextOf(req), body, req.sessionID));
  });

  defineRoute(r, M, { method: 'post', path: '/forgot-password', access: 'public' }, forgotLimiter, async (req, res) => {
    const body = ForgotBody.parse(req.body);
    // Answer first and identically; the look-up and the mail happen after, so neither the
    // answer nor its timing tells whether the address has an account.
    res.json({ ok: true, message: 'If that address has an account, a reset link is on its way. Your scheme administrator can also send you one.' });
    const sc = contextOf(req);
    afterAnswer(() => requestPasswordReset(ctx, sc, body.email));
  });

  defineRoute(r, M, { method: 'get', path: '/links/:token', access: 'public' }, async (req, res) => {
    res.json(await linkInfo(ctx.db, Token.parse(req.params.token)));
  });

  defineRoute(r, M, { method: 'post', path: '/links/:token', access: 'public' }, async (req, res) => {
    const body = RedeemBody.parse(req.body);
    res.json(await redeemLink(ctx, contextOf(req), Token.parse(req.params.token), body));
  });

  defineRoute(r, M, { method: 'post', path: '/links/:token/accept', access: 'signed-in' }, async (req, res) => {
    res.json(await acceptInvitation(ctx, contextOf(req), Token.parse(req.params.token)));
  });

  defineRoute(r, M, { method: 'post', path: '/links/:token/confirm-sign-in', access: 'public' }, async (req, res) => {
    const user = await confirmSignIn(ctx, contextOf(req), Token.parse(req.params.token));
    await startSession(req, user);
    await audit(ctx.db, contextOf(req), { action: 'sign-in', userId: user.id, actorEmail: user.email });
    res.json(await me(ctx.db, user.id));
  });

  return r;
}
