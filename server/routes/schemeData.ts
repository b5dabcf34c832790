import { Router } from 'express';
import type { AppContext } from '../context';
import { assumptionsRouter } from './assumptions';
import { fundsRouter } from './funds';
import { membersRouter } from './members';
import { optionsRouter } from './options';

/** Funds, assumption sets, default options and members: everything the engine reads from a scheme. */
export function schemeDataRouters(ctx: AppContext): Router {
  const r = Router();
  r.use(fundsRouter(ctx), assumptionsRouter(ctx), optionsRouter(ctx), membersRouter(ctx));
  return r;
}
