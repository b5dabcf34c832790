import type { Request } from 'express';
import type { Role } from '../../constants/permissions';

/** Who acts: a signed-in person, or null for the system (jobs, the worker, the seed). */
export type Actor = { id: string; email: string; displayName?: string };

/**
 * What a service needs to know about the caller, without Express: the scheme it acts on
 * (null for account-level actions), who acts, and where from (for the audit trail).
 * Routes build one with {@link contextOf}; jobs and tests build one by hand.
 */
export type ServiceContext = {
  schemeId: string | null;
  actor: Actor | null;
  /** The caller's role on the scheme, when the route checked one. */
  role?: Role | null;
  /** Client address, for the audit trail. */
  ip?: string | null;
  /** Request id, for logs. */
  requestId?: string | null;
};

/** The system acting on a scheme (background jobs). */
export function systemContext(schemeId: string | null): ServiceContext {
  return { schemeId, actor: null, role: null, ip: null };
}

/** The service context of an Express request (after the scheme guard, when it has one). */
export function contextOf(req: Request): ServiceContext {
  return {
    schemeId: req.scheme?.id ?? null,
    actor: req.user ? { id: req.user.id, email: req.user.email, displayName: req.user.displayName } : null,
    role: req.scheme?.role ?? null,
    ip: req.ip ?? null,
    requestId: (req as Request & { id?: string }).id ?? null,
  };
}

/**
 * The scheme a scheme-level service acts on. Routes under /schemes/:schemeId always set it;
 * calling such a service without one is a programming error, not a user's mistake.
 */
export function schemeOf(ctx: ServiceContext): string {
  if (!ctx.schemeId) throw new Error('this service acts on a scheme, but its context names none');
  return ctx.schemeId;
}
