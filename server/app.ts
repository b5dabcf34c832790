import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { AppContext } from './context';
import { errorHandler, noStore, notFound, refuseDeepJson, rejectNulCharacters, requestId } from './errors';
import { log } from './log';
import { healthRouter } from './routes/health';
import { authRouter } from './routes/auth';
import { peopleRouter } from './routes/people';
import { schemesRouter } from './routes/schemes';
import { activityRouter } from './routes/activity';
import { schemeDataRouters } from './routes/schemeData';
import { runsRouter } from './routes/runs';
import { reportsRouter } from './routes/reports';
import { statementsRouter } from './routes/statements';
import { outboxRouter } from './routes/outbox';
import { reviewsRouter } from './routes/reviews';
import { installSessions, requireSameSiteWrite } from './auth/session';

/**
 * Builds the Express app: API under /api, the web export at / with a
 * single-page fallback. Tests import this and listen on port 0.
 */
export function createApp(ctx: AppContext): Express {
  const app = express();
  app.disable('x-powered-by');
  // Whose X-Forwarded-For to believe (TRUST_PROXY): sign-in delays and rate limits key on req.ip.
  app.set('trust proxy', ctx.config.TRUST_PROXY);
  app.use(requestId);
  app.use(
    pinoHttp({
      logger: log,
      genReqId: (_req, res) => res.locals.requestId as string,
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : 'info'),
      // Who asked and about which scheme, without cookies or bodies.
      customProps: (req) => ({ userId: req.user?.id, schemeId: req.scheme?.id }),
      serializers: {
        req: (req: { method: string; url: string }) => ({ method: req.method, url: req.url.replace(/([?&]token=)[^&]+/, '$1…').replace(/(\/links\/)[^/?]+/, '$1…') }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
    }),
  );
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
  const api = express.Router();
  api.use(noStore);
  api.use(express.json({ limit: '1mb', verify: refuseDeepJson }));
  api.use(rejectNulCharacters);
  api.use(healthRouter(ctx));
  installSessions(api, app, ctx);
  api.use(requireSameSiteWrite(ctx.config.PUBLIC_URL));
  api.use(authRouter(ctx));
  api.use(schemesRouter(ctx), peopleRouter(ctx), activityRouter(ctx));
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
