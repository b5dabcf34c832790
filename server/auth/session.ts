import type { Express, RequestHandler, Router } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../context';
import { checkSignIn, getUser } from '../services/accounts';
import { HttpError } from '../errors';

export const SESSION_COOKIE = 'keelson.sid';

/**
 * Sessions live in PostgreSQL (table `session`, created by migration), so they
 * survive a restart. Cookie: httpOnly, SameSite=Lax, Secure when COOKIE_SECURE,
 * rolling idle timeout of SESSION_IDLE_MINUTES.
 */
export function installSessions(router: Router, app: Express, ctx: AppContext): void {
  const PgStore = connectPgSimple(session);
  router.use(
    session({
      name: SESSION_COOKIE,
      store: new PgStore({ pool: ctx.pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
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
  pp.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      checkSignIn(ctx.db, email, password)
        .then((r) => done(null, r.ok ? r.user : false))
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
  app.locals.passport = pp;
}

/**
 * Cross-site write protection for cookie-authenticated requests: every write
 * must carry the X-Keelson-Client header (a cross-site form cannot set it, and
 * a cross-site script would need a CORS preflight we never grant), and an
 * Origin header, when present, must be this server's own.
 */
export const requireSameSiteWrite: RequestHandler = (req, _res, next) => {
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
    if (host !== req.get('Host')) return next(new HttpError(403, 'Cross-site request refused.', undefined, 'csrf'));
  }
  next();
};
