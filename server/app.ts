import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { AppContext } from './context';
import { errorHandler, notFound, rejectNulCharacters, requestId } from './errors';
import { healthRouter } from './routes/health';
import { authRouter } from './routes/auth';
import { peopleRouter } from './routes/people';
import { schemeDataRouters } from './routes/schemeData';
import { runsRouter } from './routes/runs';
import { reportsRouter } from './routes/reports';
import { statementsRouter } from './routes/statements';
import { outboxRouter } from './routes/outbox';
import { reviewsRouter } from './routes/reviews';
import { mailSender } from './email/outbox';
import { installSessions, requireSameSiteWrite } from './auth/session';

/**
 * Builds the Express app: API under /api, the web export at / with a
 * single-page fallback. Tests import this and listen on port 0.
 */
export function createApp(ctx: AppContext): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(requestId);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // react-native-web writes its styles into <style> elements at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          upgradeInsecureRequests: ctx.config.COOKIE_SECURE ? [] : null,
        },
      },
      hsts: ctx.config.COOKIE_SECURE,
    }),
  );

  app.locals.db = ctx.db;
  // Invitations, password resets and reports all go through the outbox and its delivery job.
  app.locals.sendMail = mailSender(ctx.db, ctx.pool);
  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use(rejectNulCharacters);
  api.use(healthRouter(ctx));
  installSessions(api, app, ctx);
  api.use(requireSameSiteWrite);
  api.use(authRouter(ctx));
  api.use(peopleRouter(ctx));
  api.use(schemeDataRouters(ctx));
  api.use(runsRouter(ctx));
  api.use(reportsRouter(ctx), statementsRouter(ctx), outboxRouter(ctx), reviewsRouter(ctx));
  api.use((_req, _res, next) => next(notFound('No such API route.')));
  app.use('/api', api);

  const dist = path.resolve(ctx.config.WEB_DIST);
  const indexHtml = path.join(dist, 'index.html');
  app.use(express.static(dist, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (_req, res, next) => {
    if (!fs.existsSync(indexHtml)) {
      next(notFound('The web app has not been built. Run `npm start` (or `npm run build:web`).'));
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });

  app.use(errorHandler({ exposeStack: ctx.config.NODE_ENV === 'development' }));
  return app;
}
