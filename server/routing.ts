import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import type { Permission } from '../constants/permissions';
import { requirePermission, requireSignedIn } from './auth/guards';

/**
 * Every API route is declared through `defineRoute`, which puts the guard in
 * front of the handler and records the route in ROUTES. The route × role
 * matrix test walks ROUTES, so a route that skips this registry cannot hide
 * an unguarded endpoint: the test also checks Express's own route list against it.
 */
export type Access = Permission | 'public' | 'signed-in';
export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** Fixture ids the matrix test supplies so each route can be called for real. */
export type ExampleFixtures = Record<string, string>;
export type RouteExample = { params?: Record<string, string>; body?: unknown; query?: Record<string, string>; attach?: { field: string; name: string; content: string } };

export type RouteSpec = {
  method: Method;
  /** Path as mounted under /api, e.g. /schemes/:schemeId/people. */
  path: string;
  access: Access;
  /** A request that this route answers with 2xx for an allowed role (built from fixtures). */
  example?: (fx: ExampleFixtures) => RouteExample;
  /** Routes that change the state they need (sign-out, accept a token) are exercised by their own tests. */
  matrix?: boolean;
};

export const ROUTES: RouteSpec[] = [];

type Handler = (req: Request, res: Response, next: NextFunction) => unknown;

export function defineRoute(router: Router, mountPath: string, spec: Omit<RouteSpec, 'path'> & { path: string }, ...handlers: (Handler | RequestHandler)[]) {
  const full = `${mountPath}${spec.path === '/' ? '' : spec.path}` || '/';
  if (!ROUTES.some((r) => r.method === spec.method && r.path === full)) ROUTES.push({ ...spec, path: full });
  const guard: RequestHandler[] =
    spec.access === 'public' ? [] : spec.access === 'signed-in' ? [requireSignedIn] : [requireSignedIn, requirePermission(spec.access)];
  router[spec.method](spec.path, ...guard, ...handlers.map(wrap));
}

/** Express 5 forwards rejected promises itself; this keeps sync throws tidy too. */
function wrap(h: Handler): RequestHandler {
  return (req, res, next) => {
    try {
      const r = h(req, res, next);
      if (r && typeof (r as Promise<unknown>).catch === 'function') (r as Promise<unknown>).catch(next);
    } catch (e) {
      next(e);
    }
  };
}
