import type { RequestHandler } from 'express';
import { and, eq } from 'drizzle-orm';
import { can, type Permission, type Role } from '../../constants/permissions';
import { schemeRoles, schemes } from '../../db/schema';
import type { Db } from '../../db/client';
import { HttpError, notFound } from '../errors';

export type SessionUser = { id: string; email: string; displayName: string };

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by requirePermission for routes under /schemes/:schemeId. */
    scheme?: { id: string; name: string; currency: string; role: Role };
  }
}

declare global {
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/** A UUID as PostgreSQL accepts it (anything else would make the query fail rather than find nothing). */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const requireSignedIn: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(new HttpError(401, 'Please sign in.', undefined, 'unauthenticated'));
  next();
};

/**
 * Loads the caller's role on :schemeId. No role ⇒ 404 (the scheme's existence
 * is not revealed); a role without the permission ⇒ 403.
 */
export function requirePermission(permission: Permission): RequestHandler {
  return async (req, _res, next) => {
    try {
      const schemeId = req.params.schemeId as string | undefined;
      const db = req.app.locals.db as Db;
      if (!schemeId) return next(new Error(`route guarded by ${permission} has no :schemeId`));
      if (!UUID.test(schemeId)) return next(notFound('No such scheme.'));
      const [row] = await db
        .select({ id: schemes.id, name: schemes.name, currency: schemes.currency, role: schemeRoles.role })
        .from(schemeRoles)
        .innerJoin(schemes, eq(schemes.id, schemeRoles.schemeId))
        .where(and(eq(schemeRoles.userId, req.user!.id), eq(schemeRoles.schemeId, schemeId)));
      if (!row) return next(notFound('No such scheme.'));
      if (!can(row.role, permission)) return next(new HttpError(403, 'Your role on this scheme does not allow that.', undefined, 'forbidden'));
      req.scheme = row;
      next();
    } catch (e) {
      next(e);
    }
  };
}
