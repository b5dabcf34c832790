import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { activity } from '../services/activity';

const ActivityQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50), before: z.coerce.number().int().positive().optional() });

/** The scheme's audit trail (the administrator). */
export function activityRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  defineRoute(r, '/schemes/:schemeId', { method: 'get', path: '/activity', access: 'audit:read' }, async (req, res) => {
    res.json(await activity(ctx, contextOf(req), ActivityQuery.parse(req.query)));
  });
  return r;
}
