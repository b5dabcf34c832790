import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import type { Permission } from '../constants/permissions';
import { requirePermission, requireSignedIn } from './auth/guards';

/**
 * Every API route is declared through `defineRoute`, which puts the guard in
 * front of the handler and records the route in ROUTES. The route × role
 * matrix test (tests/api/route-matrix.test.ts) walks ROUTES and needs an
 * example request for each one (tests/api/route-examples/*.ts), so a new
 * route cannot land without being called as every role.
 */
export type Access = Permission | 'public' | 'signed-in';
export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export type RouteSpec = {
  method: Method;
  /** Path as mounted under /api, e.g. /schemes/:schemeId/people. */
  path: string;
  access: Access;
};

export const ROUTES: RouteSpec[] = [];

type Handler = (req: Request, res: Response, next: NextFunction) => unknown;

export function defineRoute(router: Router, mountPath: string, spec: Omit<RouteSpec, 'path'> & { path: string }, ...handlers: (Handler | RequestHandler)[]) {
  const full = `${mountPath}${spec.path === '/' ? '' : spec.path}` || '/';
  if (!ROUTES.some((r) => r.method === spec.method && r.path === full)) ROUTES.push({ ...spec, path: full });
  const guard: RequestHandler[] =
    spec.access === 'public' ? [] : spec.access === 'signed-in' ? [requireSignedIn] : [requireSignedIn, requirePermission(spec.access)];
  router[spec.method](full, ...guard, ...handlers.map(wrap));
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
