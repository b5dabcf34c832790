import { Router } from 'express';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { schemeOverview } from '../services/overview';

/** A scheme itself and its overview (anyone with a role on it). */
export function schemesRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '', access: 'scheme:read' }, async (req, res) => {
    res.json(req.scheme);
  });

  defineRoute(r, M, { method: 'get', path: '/overview', access: 'scheme:read' }, async (req, res) => {
    res.json(await schemeOverview(ctx.db, req.scheme!));
  });

  return r;
}
