import type { Db } from '../../../db/client';
import type { Role } from '../../../constants/permissions';

/** What an example may use to build a request that the route answers with 2xx. */
export type Fixtures = {
  db: Db;
  /** The scheme the request is about. Create any objects the request names in THIS scheme. */
  schemeId: string;
  /** Unique per call, for names and e-mail addresses. */
  nonce: string;
  /** The demo users of the main scheme, by role. */
  users: Record<Role, { id: string; email: string }>;
  /** A new user with the given role on fx.schemeId (no password). */
  makeUser: (role: Role) => Promise<{ id: string; email: string }>;
};

export type Example = {
  params?: Record<string, string>;
  body?: unknown;
  query?: Record<string, string>;
  /** For multipart uploads. */
  form?: () => FormData;
};

/**
 * Keyed 'METHOD /path' exactly as in ROUTES (e.g. 'GET /schemes/:schemeId/people').
 * `{ skip }` is only for routes whose own tests exercise them (sign-in, sign-out, one-use links); say which test.
 */
export type ExampleEntry = ((fx: Fixtures) => Example | Promise<Example>) | { skip: string };
export type Examples = Record<string, ExampleEntry>;
