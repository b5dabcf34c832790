import type { Express, RequestHandler, Router } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../context';
import { getUser } from '../services/accounts';
import { checkSignIn, type SignInResult } from '../services/signIn';
import { contextOf } from '../services/context';
import { HttpError } from '../errors';
import { log } from '../log';

export const SESSION_COOKIE = 'keelson.sid';

declare module 'express-session' {
  interface SessionData {
    /** Epoch ms of the sign-in that started this session (for the absolute lifetime). */
    signedInAt?: number;
  }
}

/**
 * Sessions live in PostgreSQL (table `session`, created by migration), so they survive a
 * restart. Cookie: httpOnly, SameSite=Lax, Secure when COOKIE_SECURE, rolling idle timeout of
 * SESSION_IDLE_MINUTES; a session also ends SESSION_ABSOLUTE_HOURS after its sign-in, however
 * active.
 */
export function installSessions(router: Router, app: Express, ctx: AppContext): void {
  const PgStore = connectPgSimple(session);
  /**
   * The rolling idle timeout would write the session row on every request; once a minute per
   * session is enough (the idle timeout is then exact to within that minute) and spares the
   * database a write per read under load.
   */
  class TouchOncePerMinute extends PgStore {
    private touched = new Map<string, number>();
    touch(sid: string, sess: session.SessionData, done?: () => void) {
      const now = Date.now();
      if (now - (this.touched.get(sid) ?? 0) < 60_000) return done?.();
      if (this.touched.size > 100_000) this.touched.clear();
      this.touched.set(sid, now);
      super.touch(sid, sess, done);
    }
  }
  router.use(
    session({
      name: SESSION_COOKIE,
      store: new TouchOncePerMinute({
        pool: ctx.pool,
        tableName: 'session',
        createTableIfMissing: false,
        pruneSessionInterval: 15 * 60,
        errorLog: (...args: unknown[]) => log.warn({ detail: args.map(String).join(' ') }, 'session store'),
      }),
      secret: ctx.config.SESSION_SECRET,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      proxy: ctx.config.COOKIE_SECURE,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: ctx.config.COOKIE_SECURE,
        maxAge: ctx.config.SESSION_IDLE_MINUTES * 60_000,
      },
    }),
  );

  const pp = new passport.Passport();
  // The strategy hands the whole throttling outcome on as `info` (wait, confirm, failed).
  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true, passReqToCallback: true }, (req, email, password, done) => {
      checkSignIn(ctx, contextOf(req), email, password)
        .then((r: SignInResult) => (r.kind === 'ok' ? done(null, r.user) : done(null, false, { message: r.kind, ...r })))
        .catch(done);
    }),
  );
  pp.serializeUser((user, done) => done(null, user.id));
  pp.deserializeUser((id: string, done) => {
    getUser(ctx.db, id)
      .then((u) => done(null, u ?? false))
      .catch(done);
  });
  router.use(pp.initialize());
  router.use(pp.session());
  router.use(absoluteLifetime(ctx.config.SESSION_ABSOLUTE_HOURS * 3_600_000));
  app.locals.passport = pp;
}

/** Ends a signed-in session older than `maxMs` since its sign-in (or with no sign-in time). */
function absoluteLifetime(maxMs: number): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) return next();
    const at = req.session.signedInAt;
    if (typeof at === 'number' && Date.now() - at <= maxMs) return next();
    req.logout(() => req.session.destroy(() => next()));
  };
}

/**
 * Cross-site write protection for cookie-authenticated requests: every write must carry the
 * X-Keelson-Client header (a cross-site form cannot set it, and a cross-site script would
 * need a CORS preflight we never grant), and an Origin header, when present, must be this
 * server's own (its Host, or PUBLIC_URL's host behind a proxy).
 */
export function requireSameSiteWrite(publicUrl: string): RequestHandler {
  const publicHost = new URL(publicUrl).host;
  return (req, _res, next) => {
    if (['GET', 'HEAD', 'OPTIONS'].includes(req.method)) return next();
    if (req.get('X-Keelson-Client') !== '1') return next(new HttpError(403, 'Cross-site request refused.', undefined, 'csrf'));
    const origin = req.get('Origin');
    if (origin) {
      let host: string | null = null;
      try {
        host = new URL(origin).host;
      } catch {
        host = null;
      }
      if (host !== req.get('Host') && host !== publicHost) return next(new HttpError(403, 'Cross-site request refused.', undefined, 'csrf'));
    }
    next();
  };
}
