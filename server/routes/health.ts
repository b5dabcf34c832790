import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';

export function healthRouter(ctx: AppContext): Router {
  const r = Router();
  defineRoute(r, '/health', { method: 'get', path: '/', access: 'public' }, async (_req, res) => {
    const started = Date.now();
    try {
      await ctx.db.execute(sql`select 1`);
      res.json({ status: 'ok', database: 'connected', latencyMs: Date.now() - started });
    } catch {
      res.status(503).json({ status: 'degraded', database: 'unreachable' });
    }
  });
  return r;
}
